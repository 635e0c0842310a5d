import type { Knex } from 'knex';

/**
 * Cells, their versions and their shares with cohorts.
 * - A cell's document lives only in cell_versions: every save is a new row, never an update,
 *   so any version can be read back (diff, rollback, replay of old runs).
 * - Deleting a cell is soft (`deleted_at`): runs and grades of later issues may still point
 *   at its versions.
 * - A student's copy of a shared cell names its source (`source_cell_id`, origin
 *   'shared-copy'); the partial unique index makes "open my copy" return the same copy.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cells', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.text('name').notNullable();
    t.uuid('owner_id').notNullable().references('users.id').onDelete('restrict');
    t.text('origin').notNullable().defaultTo('new');
    t.uuid('source_cell_id').references('cells.id').onDelete('set null');
    t.integer('source_version');
    t.timestamps(true, true);
    t.timestamp('deleted_at', { useTz: true });
    t.index(['owner_id']);
  });
  await knex.raw(
    "alter table cells add constraint cells_origin_check check (origin in ('new','template','duplicate','shared-copy','import'))",
  );
  await knex.raw(
    "create unique index cells_one_copy_per_student on cells (owner_id, source_cell_id) where origin = 'shared-copy' and deleted_at is null",
  );

  await knex.schema.createTable('cell_versions', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('cascade');
    t.integer('version').notNullable();
    t.jsonb('document').notNullable();
    t.uuid('author_id').notNullable().references('users.id').onDelete('restrict');
    t.text('message').notNullable().defaultTo('');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    // Two saves racing on the same base version cannot both get the same number: one fails here.
    t.unique(['cell_id', 'version']);
  });
  await knex.raw('alter table cell_versions add constraint cell_versions_positive check (version >= 1)');

  await knex.schema.createTable('cell_shares', (t) => {
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('cascade');
    t.uuid('cohort_id').notNullable().references('cohorts.id').onDelete('cascade');
    t.uuid('shared_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['cell_id', 'cohort_id']);
    t.index(['cohort_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('cell_shares');
  await knex.schema.dropTable('cell_versions');
  await knex.schema.dropTable('cells');
}
