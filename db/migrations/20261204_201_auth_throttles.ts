import type { Knex } from 'knex';

/**
 * Throttles for the public auth endpoints (hardening issue #9):
 * - sign_in_failures holds every attempt from before its password is checked: `status` is
 *   `pending` during the check and `failed` after a wrong password (rows from before this
 *   migration were all failures). `address` may be null: when the client's address cannot be
 *   known (no stamped peer, lib/auth/client-address.ts) the attempt still counts against its
 *   account;
 * - password_reset_requests: one row per reset request let through the address limit, by
 *   e-mail and client address, and whether it was mailed (the e-mail limit counts only
 *   those), so both limits hold across app processes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sign_in_failures', (t) => {
    t.text('address').nullable().alter();
    t.text('status').notNullable().defaultTo('failed');
  });
  await knex.raw(`alter table sign_in_failures add constraint sign_in_failures_status check (status in ('pending', 'failed'))`);
  await knex.schema.createTable('password_reset_requests', (t) => {
    t.bigIncrements('id');
    t.text('email').notNullable();
    t.text('address');
    t.boolean('mailed').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['email', 'created_at']);
    t.index(['address', 'created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('password_reset_requests');
  // Rows without an address cannot satisfy NOT NULL again: they are dropped with it.
  await knex('sign_in_failures').whereNull('address').delete();
  // Attempts still being checked were no failures.
  await knex('sign_in_failures').where({ status: 'pending' }).delete();
  await knex.schema.alterTable('sign_in_failures', (t) => {
    t.dropColumn('status');
    t.text('address').notNullable().alter();
  });
}
