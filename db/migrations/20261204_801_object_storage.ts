import type { Knex } from 'knex';
import { createObjectStore } from '../../lib/storage/object-store';
import { moveDrillAssetBytes, restoreDrillAssetBytes } from '../../lib/storage/move-drill-assets';

/**
 * Files in object storage (issue #13, part 4). Brief images leave PostgreSQL for the bucket
 * (lib/storage): each `drill_assets` row keeps its object's key and SHA-256, and its bytes move
 * to the bucket here, then the `bytes` column goes. Two new tables say which files were made
 * from a record: `changeover_reports` (the printed report of a signed-off changeover, one each)
 * and `run_archives` (an exported run, one per distinct content). The bucket must be reachable
 * while rows move (start.sh and the tests start the local fake before migrating); with no
 * image rows it is not contacted. Every step checks first, and the move writes objects under
 * keys made from ids, so a migration that failed half-way (its transaction rolled back) runs
 * again cleanly.
 */
export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('drill_assets', 'object_key'))) {
    await knex.schema.alterTable('drill_assets', (t) => {
      t.text('object_key');
      t.text('sha256');
    });
  }
  if (await knex.schema.hasColumn('drill_assets', 'bytes')) {
    await knex.raw('alter table drill_assets alter column bytes drop not null');
    await moveDrillAssetBytes(knex, () => createObjectStore());
    await knex.schema.alterTable('drill_assets', (t) => t.dropColumn('bytes'));
  }
  await knex.raw('alter table drill_assets alter column object_key set not null, alter column sha256 set not null');
  await knex.raw("alter table drill_assets add constraint drill_assets_sha256 check (sha256 ~ '^[0-9a-f]{64}$')");
  await knex.raw('alter table drill_assets add constraint drill_assets_object_key unique (object_key)');

  await knex.schema.createTable('changeover_reports', (t) => {
    t.uuid('changeover_id').primary().references('changeovers.id').onDelete('cascade');
    t.text('object_key').notNullable().unique();
    t.integer('size_bytes').notNullable();
    t.text('sha256').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw("alter table changeover_reports add constraint changeover_reports_sha256 check (sha256 ~ '^[0-9a-f]{64}$')");

  await knex.schema.createTable('run_archives', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('run_id').notNullable().references('runs.id').onDelete('cascade');
    t.text('object_key').notNullable().unique();
    t.integer('size_bytes').notNullable();
    t.text('sha256').notNullable();
    // Whether the archive holds the drill's hidden parts (fault cards, rule marks, the seed):
    // only readers who may see them may download such an archive.
    t.boolean('hidden_included').notNullable();
    t.uuid('created_by').notNullable().references('users.id').onDelete('restrict');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['run_id', 'sha256']);
  });
  await knex.raw("alter table run_archives add constraint run_archives_sha256 check (sha256 ~ '^[0-9a-f]{64}$')");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('run_archives');
  await knex.schema.dropTableIfExists('changeover_reports');
  await knex.raw('alter table drill_assets drop constraint if exists drill_assets_object_key, drop constraint if exists drill_assets_sha256');
  if (!(await knex.schema.hasColumn('drill_assets', 'bytes'))) {
    await knex.schema.alterTable('drill_assets', (t) => t.binary('bytes'));
  }
  await restoreDrillAssetBytes(knex, () => createObjectStore());
  await knex.raw('alter table drill_assets alter column bytes set not null');
  await knex.schema.alterTable('drill_assets', (t) => {
    t.dropColumn('object_key');
    t.dropColumn('sha256');
  });
}
