import type { Knex } from 'knex';

/**
 * The live board (issue 13): trainers' messages to students in a run, and the notifications
 * that feed the board's stream.
 *
 * - `run_messages`: a hint or message from a trainer to one student of an assignment
 *   (`user_id`) or to all of them (`user_id` null).
 * - Every stored batch, every change of a run's status and every new message sends
 *   `pg_notify('cellwright_live', …)` from an AFTER trigger in the writer's transaction, so
 *   each app process's one LISTEN connection hears it once it is committed, whichever process
 *   wrote it. The payload stays small (ids and numbers, far below NOTIFY's 8000 bytes): a
 *   stream reads what it needs from the tables.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('run_messages', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('assignment_id').notNullable().references('id').inTable('assignments').onDelete('CASCADE');
    t.uuid('user_id').nullable().references('id').inTable('users').onDelete('CASCADE');
    t.uuid('author_id').notNullable().references('id').inTable('users');
    t.string('kind', 16).notNullable();
    t.text('body').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['assignment_id', 'created_at']);
  });
  await knex.raw(`alter table run_messages add constraint run_messages_kind check (kind in ('hint', 'message'))`);
  await knex.raw(`alter table run_messages add constraint run_messages_body check (char_length(body) between 1 and 2000)`);

  await knex.raw(`
    create function cellwright_live_batch_notify() returns trigger language plpgsql as $$
    declare r record;
    begin
      select assignment_id, user_id into r from runs where id = new.run_id;
      if r.assignment_id is not null then
        perform pg_notify('cellwright_live', json_build_object(
          'kind', 'batch', 'assignmentId', r.assignment_id, 'runId', new.run_id, 'userId', r.user_id,
          'seq', new.seq, 'untilMs', new.until_ms)::text);
      end if;
      return null;
    end $$`);
  await knex.raw('create trigger run_batches_live_notify after insert on run_batches for each row execute function cellwright_live_batch_notify()');

  await knex.raw(`
    create function cellwright_live_run_notify() returns trigger language plpgsql as $$
    begin
      if new.assignment_id is not null and (tg_op = 'INSERT' or new.status is distinct from old.status
          or new.grade is distinct from old.grade or new.override_grade is distinct from old.override_grade) then
        perform pg_notify('cellwright_live', json_build_object(
          'kind', 'run', 'assignmentId', new.assignment_id, 'runId', new.id, 'userId', new.user_id, 'status', new.status)::text);
      end if;
      return null;
    end $$`);
  await knex.raw('create trigger runs_live_notify after insert or update on runs for each row execute function cellwright_live_run_notify()');

  await knex.raw(`
    create function cellwright_live_message_notify() returns trigger language plpgsql as $$
    begin
      perform pg_notify('cellwright_live', json_build_object(
        'kind', 'message', 'assignmentId', new.assignment_id, 'messageId', new.id, 'userId', new.user_id)::text);
      return null;
    end $$`);
  await knex.raw('create trigger run_messages_live_notify after insert on run_messages for each row execute function cellwright_live_message_notify()');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop trigger run_messages_live_notify on run_messages');
  await knex.raw('drop function cellwright_live_message_notify()');
  await knex.raw('drop trigger runs_live_notify on runs');
  await knex.raw('drop function cellwright_live_run_notify()');
  await knex.raw('drop trigger run_batches_live_notify on run_batches');
  await knex.raw('drop function cellwright_live_batch_notify()');
  await knex.schema.dropTable('run_messages');
}
