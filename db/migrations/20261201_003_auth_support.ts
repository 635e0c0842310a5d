import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('password_resets', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('user_id').notNullable().references('users.id').onDelete('cascade');
    t.text('token_hash').notNullable().unique();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.schema.createTable('sign_in_failures', (t) => {
    t.bigIncrements('id');
    t.text('email').notNullable();
    t.text('address').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['email', 'created_at']);
    t.index(['address', 'created_at']);
  });
  await knex.schema.createTable('audit_log', (t) => {
    t.bigIncrements('id');
    t.uuid('actor_id').references('users.id').onDelete('set null');
    t.text('action').notNullable();
    t.uuid('target_user_id').references('users.id').onDelete('set null');
    t.jsonb('detail').notNullable().defaultTo('{}');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
  await knex.schema.dropTable('sign_in_failures');
  await knex.schema.dropTable('password_resets');
}
