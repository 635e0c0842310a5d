import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cohorts', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.text('name').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.uuid('trainer_id').notNullable().references('users.id').onDelete('restrict');
    t.timestamps(true, true);
    t.unique(['trainer_id', 'name']);
  });
  await knex.schema.createTable('memberships', (t) => {
    t.uuid('cohort_id').notNullable().references('cohorts.id').onDelete('cascade');
    t.uuid('user_id').notNullable().references('users.id').onDelete('cascade');
    t.timestamp('joined_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['cohort_id', 'user_id']);
  });
  await knex.schema.createTable('invitations', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('cohort_id').notNullable().references('cohorts.id').onDelete('cascade');
    t.text('email').notNullable();
    // Only the SHA-256 of the token is stored; the token itself travels in the e-mail.
    t.text('token_hash').notNullable().unique();
    t.uuid('invited_by').notNullable().references('users.id');
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('accepted_at', { useTz: true });
    t.timestamp('revoked_at', { useTz: true });
    t.uuid('accepted_user_id').references('users.id');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  // One open invitation per address and cohort: a second invite is reported, not duplicated.
  await knex.raw(
    'create unique index invitations_open_unique on invitations (cohort_id, email) where accepted_at is null and revoked_at is null',
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invitations');
  await knex.schema.dropTable('memberships');
  await knex.schema.dropTable('cohorts');
}
