import type { Knex } from 'knex';

/**
 * The job table (lib/jobs): one row per piece of long work — proofs, scenario checks, drill
 * regrades — holding what the app shows and what must survive a restart of any process: the
 * payload, state, progress, result or error, and the attempt count. pg-boss (its own `pgboss`
 * schema, installed by pg-boss itself) only delivers the work to a worker; this row is the
 * truth the pages and the progress stream read.
 *
 * - `version` grows by one on every change (a BEFORE trigger), so a browser that hears about a
 *   row twice — a snapshot and an event, or two app processes' views — keeps the newer one.
 * - Every insert and every change of state or progress sends `pg_notify('cellwright_jobs', …)`
 *   from an AFTER trigger, in the writer's transaction: listeners hear it only once the change
 *   is committed, and every writer (app, any worker, psql) is covered without remembering to.
 *   The payload is small by construction (subject and note are capped), far under NOTIFY's
 *   8000-byte limit.
 * - `attempt_token` names the worker attempt that holds a running row; a worker that lost its
 *   job (it ran past its time and another worker took it over) can no longer write to it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('jobs', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.text('kind').notNullable();
    t.text('subject').notNullable();
    t.uuid('owner_id').notNullable().references('users.id').onDelete('cascade');
    t.jsonb('payload').notNullable().defaultTo('{}');
    t.text('state').notNullable().defaultTo('queued');
    t.jsonb('progress').notNullable().defaultTo(knex.raw(`'{"done":0,"total":0,"note":""}'::jsonb`));
    t.jsonb('result');
    t.text('error');
    t.integer('attempts').notNullable().defaultTo(0);
    t.uuid('attempt_token');
    t.bigInteger('version').notNullable().defaultTo(1);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`alter table jobs add constraint jobs_state check (state in ('queued', 'running', 'done', 'failed'))`);
  await knex.raw(`alter table jobs add constraint jobs_kind check (kind ~ '^[a-z][a-z0-9-]{0,62}$')`);
  await knex.raw(`alter table jobs add constraint jobs_subject check (subject ~ '^[a-z][a-z-]{0,30}:[0-9a-f-]{36}$')`);
  await knex.raw(`alter table jobs add constraint jobs_note check (char_length(progress->>'note') <= 200)`);
  await knex.raw('create index jobs_subject_created on jobs (subject, created_at desc)');
  // The worker's sweep for rows whose delivery ended without them (lib/jobs/worker.ts).
  await knex.raw(`create index jobs_open on jobs (updated_at) where state in ('queued', 'running')`);

  await knex.raw(`
    create function cellwright_jobs_touch() returns trigger language plpgsql as $$
    begin
      new.version := old.version + 1;
      new.updated_at := now();
      return new;
    end $$`);
  await knex.raw('create trigger jobs_touch before update on jobs for each row execute function cellwright_jobs_touch()');

  await knex.raw(`
    create function cellwright_jobs_notify() returns trigger language plpgsql as $$
    begin
      if tg_op = 'UPDATE' and new.state = old.state and new.progress = old.progress and new.attempts = old.attempts then
        return null;
      end if;
      perform pg_notify('cellwright_jobs', json_build_object(
        'id', new.id, 'kind', new.kind, 'subject', new.subject, 'state', new.state,
        'progress', new.progress, 'attempts', new.attempts, 'version', new.version)::text);
      return null;
    end $$`);
  await knex.raw('create trigger jobs_notify after insert or update on jobs for each row execute function cellwright_jobs_notify()');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('jobs');
  await knex.raw('drop function cellwright_jobs_notify()');
  await knex.raw('drop function cellwright_jobs_touch()');
}
