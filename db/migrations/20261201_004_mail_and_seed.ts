import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mail_messages', (t) => {
    t.bigIncrements('id');
    t.text('envelope_from').notNullable().defaultTo('');
    t.specificType('envelope_to', 'text[]').notNullable().defaultTo('{}');
    t.text('from_header').notNullable().defaultTo('');
    t.text('to_header').notNullable().defaultTo('');
    t.text('subject').notNullable().defaultTo('');
    t.text('text_body').notNullable().defaultTo('');
    t.text('html_body');
    t.integer('size_bytes').notNullable().defaultTo(0);
    t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['received_at']);
  });
  // Marks which seed sets ran, so the demo seed runs once and never overwrites edits.
  await knex.schema.createTable('seed_markers', (t) => {
    t.text('name').primary();
    t.timestamp('applied_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('seed_markers');
  await knex.schema.dropTable('mail_messages');
}
