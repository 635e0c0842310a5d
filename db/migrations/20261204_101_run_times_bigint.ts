import type { Knex } from 'knex';

/**
 * Run times in ms as bigint: a batch's `untilMs` and a run's `endedMs` may reach 30 days
 * (BATCH_LIMITS.maxMs, 2,592,000,000 ms), past a 32-bit integer's 2,147,483,647.
 * The data-access layer reads them back with Number() (exact below 2^53).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter table run_batches alter column until_ms type bigint');
  await knex.raw('alter table runs alter column ended_ms type bigint');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter table runs alter column ended_ms type integer');
  await knex.raw('alter table run_batches alter column until_ms type integer');
}
