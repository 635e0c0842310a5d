import type { Knex } from 'knex';

/**
 * Drills, their brief images, assignments to cohorts, runs and their event batches.
 * - A drill names a base cell version; hidden fault cards, rules and the diagnosis answer live
 *   only here and are never sent to a student before the drill closes.
 * - Brief images are bytes in PostgreSQL (bytea), with the type sniffed from magic bytes.
 * - A run's event log is the ordered list of its batches; each batch is stored once per
 *   idempotency key (unique per run) and once per sequence number, so a retried POST after a
 *   dropped connection or a server restart cannot store an event twice.
 * - One attempt per student and assignment (unique index), so "start" after a reload resumes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('drills', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('trainer_id').notNullable().references('users.id').onDelete('restrict');
    t.text('title').notNullable();
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('restrict');
    t.integer('cell_version').notNullable();
    t.text('brief').notNullable().defaultTo('');
    t.jsonb('faults').notNullable().defaultTo('[]');
    t.jsonb('objectives').notNullable().defaultTo('[]');
    t.jsonb('rules').notNullable().defaultTo('[]');
    t.text('answer_kind').notNullable();
    t.text('answer_location').notNullable();
    t.integer('diagnosis_weight').notNullable().defaultTo(1);
    t.integer('time_limit_ms').notNullable();
    t.jsonb('permissions').notNullable();
    t.text('library_key');
    t.timestamps(true, true);
    t.timestamp('deleted_at', { useTz: true });
    t.index(['trainer_id']);
  });
  await knex.raw('alter table drills add constraint drills_time_limit check (time_limit_ms between 1000 and 14400000)');
  await knex.raw('alter table drills add constraint drills_weight check (diagnosis_weight between 0 and 1000)');
  // The built-in library is seeded once per trainer: a second seed finds the same rows.
  await knex.raw('create unique index drills_library_once on drills (trainer_id, library_key) where library_key is not null');

  await knex.schema.createTable('drill_assets', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('drill_id').notNullable().references('drills.id').onDelete('cascade');
    t.text('name').notNullable();
    t.text('media_type').notNullable();
    t.integer('size_bytes').notNullable();
    t.binary('bytes').notNullable();
    t.uuid('uploaded_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['drill_id']);
  });
  await knex.raw("alter table drill_assets add constraint drill_assets_type check (media_type in ('image/png','image/jpeg','image/webp','image/gif'))");
  await knex.raw('alter table drill_assets add constraint drill_assets_size check (size_bytes between 1 and 1048576)');

  await knex.schema.createTable('assignments', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('drill_id').notNullable().references('drills.id').onDelete('cascade');
    t.uuid('cohort_id').notNullable().references('cohorts.id').onDelete('cascade');
    t.timestamp('opens_at', { useTz: true }).notNullable();
    t.timestamp('closes_at', { useTz: true }).notNullable();
    t.uuid('assigned_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['cohort_id']);
    t.index(['drill_id']);
  });
  await knex.raw('alter table assignments add constraint assignments_dates check (closes_at > opens_at)');

  await knex.schema.createTable('runs', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('user_id').notNullable().references('users.id').onDelete('cascade');
    t.text('mode').notNullable();
    t.uuid('drill_id').references('drills.id').onDelete('cascade');
    t.uuid('assignment_id').references('assignments.id').onDelete('cascade');
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('restrict');
    t.integer('cell_version').notNullable();
    t.bigInteger('seed').notNullable();
    t.text('status').notNullable().defaultTo('active');
    t.timestamp('started_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('submitted_at', { useTz: true });
    t.integer('ended_ms');
    t.jsonb('diagnosis');
    t.double('grade');
    t.jsonb('breakdown');
    t.text('trace_hash');
    t.double('override_grade');
    t.text('override_reason');
    t.uuid('override_by').references('users.id').onDelete('set null');
    t.timestamp('override_at', { useTz: true });
    t.index(['user_id']);
    t.index(['drill_id']);
  });
  await knex.raw("alter table runs add constraint runs_mode check (mode in ('drill','practice'))");
  await knex.raw("alter table runs add constraint runs_status check (status in ('active','submitted'))");
  await knex.raw("alter table runs add constraint runs_drill_has_assignment check ((mode = 'drill') = (assignment_id is not null and drill_id is not null))");
  await knex.raw('create unique index runs_one_per_assignment on runs (assignment_id, user_id) where assignment_id is not null');

  await knex.schema.createTable('run_batches', (t) => {
    t.bigIncrements('id').primary();
    t.uuid('run_id').notNullable().references('runs.id').onDelete('cascade');
    t.integer('seq').notNullable();
    t.text('idempotency_key').notNullable();
    t.jsonb('events').notNullable();
    t.integer('event_count').notNullable();
    t.integer('until_ms').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['run_id', 'idempotency_key']);
    t.unique(['run_id', 'seq']);
  });
  await knex.raw('alter table run_batches add constraint run_batches_seq check (seq >= 1)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('run_batches');
  await knex.schema.dropTable('runs');
  await knex.schema.dropTable('assignments');
  await knex.schema.dropTable('drill_assets');
  await knex.schema.dropTable('drills');
}
