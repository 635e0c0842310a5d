import type { Knex } from 'knex';

/**
 * Changeovers (issue #10): a planned change to one cell, its sign-off and its rollback.
 * - `changeovers`: base version (what runs today) and, once pinned, the proposed version. While
 *   `proposed_version` is null the proposal follows the cell's latest version (the lead is still
 *   editing it in the workspace). Both versions are foreign keys into cell_versions, so a
 *   changeover can never name a version that does not exist.
 * - `state`: drafting → checked (proposal pinned, evidence may run) → signed-off → rolled-back,
 *   or withdrawn (abandoned before sign-off). The lead's own signature (`signed_by`, `signed_at`)
 *   waits on the changeover row until someone else countersigns; then the record is written.
 * - `changeover_records`: the signed record, one per changeover. It has no update path in the
 *   app, and the database refuses UPDATE and DELETE on it (trigger), so what two people signed
 *   cannot be changed afterwards — not by the app, not by a stray script.
 * - `changeover_events`: who did what when (opened, pinned, signed, countersigned, rolled back).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('changeovers', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('restrict');
    t.text('title').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.uuid('opened_by').notNullable().references('users.id').onDelete('restrict');
    t.integer('base_version').notNullable();
    t.integer('proposed_version');
    t.timestamp('pinned_at', { useTz: true });
    t.text('state').notNullable().defaultTo('drafting');
    t.uuid('countersigner_id').references('users.id').onDelete('set null');
    t.uuid('signed_by').references('users.id').onDelete('restrict');
    t.timestamp('signed_at', { useTz: true });
    t.uuid('rolled_back_by').references('users.id').onDelete('restrict');
    t.timestamp('rolled_back_at', { useTz: true });
    t.integer('rollback_version');
    t.timestamps(true, true);
    t.index(['cell_id']);
    t.index(['opened_by']);
    t.index(['countersigner_id']);
  });
  await knex.raw(
    "alter table changeovers add constraint changeovers_state_check check (state in ('drafting','checked','signed-off','rolled-back','withdrawn'))",
  );
  await knex.raw('alter table changeovers add constraint changeovers_proposed_after_base check (proposed_version is null or proposed_version > base_version)');
  await knex.raw('alter table changeovers add constraint changeovers_pinned_unless_drafting check (state = \'drafting\' or state = \'withdrawn\' or proposed_version is not null)');
  await knex.raw('alter table changeovers add constraint changeovers_signature_pair check ((signed_by is null) = (signed_at is null))');
  await knex.raw(
    'alter table changeovers add constraint changeovers_base_exists foreign key (cell_id, base_version) references cell_versions (cell_id, version) on delete restrict',
  );
  await knex.raw(
    'alter table changeovers add constraint changeovers_proposed_exists foreign key (cell_id, proposed_version) references cell_versions (cell_id, version) on delete restrict',
  );
  await knex.raw(
    'alter table changeovers add constraint changeovers_rollback_exists foreign key (cell_id, rollback_version) references cell_versions (cell_id, version) on delete restrict',
  );

  await knex.schema.createTable('changeover_records', (t) => {
    t.uuid('changeover_id').primary().references('changeovers.id').onDelete('restrict');
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('restrict');
    t.text('cell_name').notNullable();
    t.text('title').notNullable();
    t.text('description').notNullable();
    t.integer('base_version').notNullable();
    t.integer('proposed_version').notNullable();
    t.specificType('base_sha256', 'char(64)').notNullable();
    t.specificType('proposed_sha256', 'char(64)').notNullable();
    t.jsonb('diff_summary').notNullable();
    t.jsonb('evidence').notNullable();
    t.uuid('signed_by').notNullable().references('users.id').onDelete('restrict');
    t.text('signed_by_name').notNullable();
    t.timestamp('signed_at', { useTz: true }).notNullable();
    t.uuid('countersigned_by').notNullable().references('users.id').onDelete('restrict');
    t.text('countersigned_by_name').notNullable();
    t.text('countersigned_by_role').notNullable();
    t.timestamp('countersigned_at', { useTz: true }).notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('alter table changeover_records add constraint changeover_records_two_people check (signed_by <> countersigned_by)');
  await knex.raw(
    "alter table changeover_records add constraint changeover_records_hashes check (base_sha256 ~ '^[0-9a-f]{64}$' and proposed_sha256 ~ '^[0-9a-f]{64}$')",
  );
  await knex.raw(`
    create function changeover_records_refuse_change() returns trigger language plpgsql as $$
    begin
      raise exception 'a signed changeover record cannot be changed or deleted (% refused)', tg_op
        using errcode = 'integrity_constraint_violation';
    end
    $$`);
  await knex.raw(
    'create trigger changeover_records_immutable before update or delete on changeover_records for each row execute function changeover_records_refuse_change()',
  );

  await knex.schema.createTable('changeover_events', (t) => {
    t.bigIncrements('id');
    t.uuid('changeover_id').notNullable().references('changeovers.id').onDelete('cascade');
    t.text('kind').notNullable();
    t.uuid('actor_id').notNullable().references('users.id').onDelete('restrict');
    t.jsonb('detail').notNullable().defaultTo('{}');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['changeover_id', 'id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('changeover_events');
  await knex.raw('drop trigger changeover_records_immutable on changeover_records');
  await knex.schema.dropTable('changeover_records');
  await knex.raw('drop function changeover_records_refuse_change()');
  await knex.schema.dropTable('changeovers');
}
