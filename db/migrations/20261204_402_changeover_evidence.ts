import type { Knex } from 'knex';

/**
 * The evidence a changeover is signed off on (issue #10, points 3 and 4).
 *
 * - `interlock_rules`: the interlock rules a plant keeps *with its cell*, not with one
 *   changeover. They state what must stay true of the cell whatever is changed, so every
 *   changeover of the cell proves the same list on its base and its proposal, and the next
 *   changeover starts from them instead of an empty page. A changeover never depends on a
 *   rule's row staying the same: each verdict keeps the copy of the rule it proved, and the
 *   proofs' inputs hash tells readiness when the list changed after they ran.
 * - `cell_scenarios`: named event scripts with trace rules (the headless runner's formats),
 *   kept with the cell and re-run on base and proposal by every changeover's checks. The
 *   fault cards and seed of a drill run travel with the scenario made from it.
 * - `changeover_evidence_runs`: one proofs or checks job over a pair of versions, with its
 *   progress; `changeover_verdicts` (one per rule and side) and `changeover_checks` (one per
 *   scenario, both sides) are its results. Results are never updated after the run ends.
 * - `changeover_acceptances`: a person's written acceptance of a violation (or an undecided
 *   proof) or of a changed check outcome, keyed by a fingerprint of exactly what was
 *   accepted. A re-run that finds the same thing on the same versions meets the same
 *   fingerprint, so the acceptance still holds; anything different needs a new one.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('interlock_rules', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('cascade');
    t.integer('position').notNullable();
    t.text('title').notNullable().defaultTo('');
    // The rule without its id and title (kind and conditions, simulator/prove/rules.ts); the
    // row id is the rule's id when it is proved.
    t.jsonb('body').notNullable();
    t.uuid('created_by').notNullable().references('users.id').onDelete('restrict');
    t.uuid('updated_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamps(true, true);
    t.index(['cell_id', 'position']);
  });

  await knex.schema.createTable('cell_scenarios', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('cell_id').notNullable().references('cells.id').onDelete('cascade');
    t.text('name').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.jsonb('events').notNullable();
    t.jsonb('rules').notNullable().defaultTo('[]');
    t.jsonb('faults').notNullable().defaultTo('[]');
    t.bigInteger('seed');
    t.bigInteger('duration_ms').notNullable();
    t.uuid('source_run_id').references('runs.id').onDelete('set null');
    t.uuid('created_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamps(true, true);
    t.unique(['cell_id', 'name']);
  });
  await knex.raw('alter table cell_scenarios add constraint cell_scenarios_duration check (duration_ms >= 0)');

  await knex.schema.createTable('changeover_evidence_runs', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('changeover_id').notNullable().references('changeovers.id').onDelete('cascade');
    t.text('kind').notNullable();
    t.integer('base_version').notNullable();
    t.integer('proposed_version').notNullable();
    t.specificType('inputs_sha256', 'char(64)').notNullable();
    t.text('status').notNullable().defaultTo('queued');
    t.integer('total').notNullable().defaultTo(0);
    t.integer('done').notNullable().defaultTo(0);
    t.text('current').notNullable().defaultTo('');
    t.text('error');
    t.text('job_id');
    t.uuid('requested_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    // Moved by every progress report: an open run that has not moved for a while lost its
    // worker, and the next request marks it failed instead of waiting on it for ever.
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['changeover_id', 'kind', 'created_at']);
  });
  await knex.raw("alter table changeover_evidence_runs add constraint changeover_evidence_runs_kind check (kind in ('proofs','checks'))");
  await knex.raw("alter table changeover_evidence_runs add constraint changeover_evidence_runs_status check (status in ('queued','running','done','failed'))");
  // One job of each kind at a time per changeover: a second request while one is queued or
  // running gets the running one (the route answers with it) instead of a duplicate.
  await knex.raw(
    "create unique index changeover_evidence_runs_one_open on changeover_evidence_runs (changeover_id, kind) where status in ('queued','running')",
  );

  await knex.schema.createTable('changeover_verdicts', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('run_id').notNullable().references('changeover_evidence_runs.id').onDelete('cascade');
    t.uuid('changeover_id').notNullable().references('changeovers.id').onDelete('cascade');
    // No foreign key: a rule deleted later leaves its verdicts (and their copy of it) intact.
    t.uuid('rule_id').notNullable();
    t.integer('position').notNullable();
    t.text('title').notNullable();
    t.jsonb('rule').notNullable();
    t.text('side').notNullable();
    t.integer('version').notNullable();
    t.text('status').notNullable();
    t.boolean('exact').notNullable();
    t.jsonb('verdict').notNullable();
    t.specificType('fingerprint', 'char(64)').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['run_id', 'rule_id', 'side']);
    t.index(['changeover_id']);
  });
  await knex.raw("alter table changeover_verdicts add constraint changeover_verdicts_side check (side in ('base','proposed'))");
  await knex.raw("alter table changeover_verdicts add constraint changeover_verdicts_status check (status in ('proved','violated','undecided','error'))");

  await knex.schema.createTable('changeover_checks', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('run_id').notNullable().references('changeover_evidence_runs.id').onDelete('cascade');
    t.uuid('changeover_id').notNullable().references('changeovers.id').onDelete('cascade');
    t.uuid('scenario_id').notNullable();
    t.integer('position').notNullable();
    t.text('name').notNullable();
    t.jsonb('scenario').notNullable();
    t.jsonb('base').notNullable();
    t.jsonb('proposed').notNullable();
    t.jsonb('changes').notNullable();
    t.boolean('changed').notNullable();
    // The two traces for the comparison scope; read only by the traces route.
    t.jsonb('base_trace');
    t.jsonb('proposed_trace');
    t.specificType('fingerprint', 'char(64)').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['run_id', 'scenario_id']);
    t.index(['changeover_id']);
  });

  await knex.schema.createTable('changeover_acceptances', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('changeover_id').notNullable().references('changeovers.id').onDelete('cascade');
    t.text('kind').notNullable();
    t.text('subject').notNullable();
    t.specificType('fingerprint', 'char(64)').notNullable();
    t.text('reason').notNullable();
    t.uuid('accepted_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamp('accepted_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['changeover_id', 'kind', 'subject', 'fingerprint']);
  });
  await knex.raw("alter table changeover_acceptances add constraint changeover_acceptances_kind check (kind in ('proof','check'))");
  await knex.raw('alter table changeover_acceptances add constraint changeover_acceptances_reason check (length(btrim(reason)) >= 10)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('changeover_acceptances');
  await knex.schema.dropTable('changeover_checks');
  await knex.schema.dropTable('changeover_verdicts');
  await knex.schema.dropTable('changeover_evidence_runs');
  await knex.schema.dropTable('cell_scenarios');
  await knex.schema.dropTable('interlock_rules');
}
