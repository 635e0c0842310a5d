import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    // Stored lower-cased by the data layer; unique regardless of input case.
    t.text('email').notNullable().unique();
    t.text('name').notNullable();
    t.text('password_hash').notNullable();
    t.text('role').notNullable().defaultTo('student');
    t.text('organization');
    t.boolean('disabled').notNullable().defaultTo(false);
    t.timestamp('last_sign_in_at', { useTz: true });
    t.timestamps(true, true);
  });
  await knex.raw(
    "alter table users add constraint users_role_check check (role in ('student','trainer','lead','admin'))",
  );
  await knex.raw('alter table users add constraint users_email_lower check (email = lower(email))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('users');
}
