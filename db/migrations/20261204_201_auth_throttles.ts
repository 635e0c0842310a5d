import type { Knex } from 'knex';

/**
 * Throttles for the public auth endpoints (hardening issue #9):
 * - sign_in_failures.address may be null: when the client's address cannot be known (no
 *   stamped peer, lib/auth/client-address.ts) the attempt still counts against its account;
 * - password_reset_requests: one row per accepted reset request, by e-mail and client
 *   address, so the per-address and per-e-mail limits hold across app processes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sign_in_failures', (t) => {
    t.text('address').nullable().alter();
  });
  await knex.schema.createTable('password_reset_requests', (t) => {
    t.bigIncrements('id');
    t.text('email').notNullable();
    t.text('address');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['email', 'created_at']);
    t.index(['address', 'created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('password_reset_requests');
  // Rows without an address cannot satisfy NOT NULL again: they are dropped with it.
  await knex('sign_in_failures').whereNull('address').delete();
  await knex.schema.alterTable('sign_in_failures', (t) => {
    t.text('address').notNullable().alter();
  });
}
