import type { Knex } from 'knex';

/**
 * A counter per account that every session token carries from its sign-in: raising it (on a
 * password reset) ends every session opened before, since a token whose number differs from
 * the account's is refused. Tokens issued before this column existed carry none and count as 0.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.integer('session_generation').notNullable().defaultTo(0);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('session_generation');
  });
}
