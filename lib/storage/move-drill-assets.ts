import type { Knex } from 'knex';
import { drillAssetKey } from './keys';
import { sha256Hex, type ObjectStore } from './object-store';

/**
 * Moving brief images between PostgreSQL and the bucket, for the migration that took them out
 * of the database (db/migrations/20261204_801_object_storage.ts) and its `down`. Rows are
 * handled a few at a time, so a large table never sits in memory; each row's key comes from its
 * ids, so running a move again after a failure writes the same objects again and nothing twice.
 * The store is opened only when there is a row to move: an empty table needs no bucket.
 */

const BATCH = 25;

/** Copies every image still held as bytes into the bucket and empties its `bytes`. Answers how many moved. */
export async function moveDrillAssetBytes(knex: Knex, openStore: () => ObjectStore): Promise<number> {
  let store: ObjectStore | null = null;
  let moved = 0;
  try {
    for (;;) {
      const rows = await knex('drill_assets').whereNotNull('bytes').orderBy('id').limit(BATCH).select('id', 'drill_id', 'media_type', 'bytes');
      if (rows.length === 0) return moved;
      store ??= openStore();
      for (const row of rows) {
        const bytes = row.bytes as Buffer;
        const stored = await store.put(drillAssetKey(row.drill_id, row.id), bytes, row.media_type);
        await knex('drill_assets').where({ id: row.id }).update({ object_key: stored.key, sha256: stored.sha256, size_bytes: stored.sizeBytes, bytes: null });
        moved++;
      }
    }
  } finally {
    store?.close();
  }
}

/** The way back: fills `bytes` from the bucket for every row that has none. Throws, naming the row, when an object is missing. */
export async function restoreDrillAssetBytes(knex: Knex, openStore: () => ObjectStore): Promise<number> {
  let store: ObjectStore | null = null;
  let restored = 0;
  try {
    for (;;) {
      const rows = await knex('drill_assets').whereNull('bytes').orderBy('id').limit(BATCH).select('id', 'object_key', 'sha256');
      if (rows.length === 0) return restored;
      store ??= openStore();
      for (const row of rows) {
        const bytes = await store.read(row.object_key);
        if (!bytes) throw new Error(`drill image ${row.id}: no object ${row.object_key} in bucket ${store.bucket}`);
        if (sha256Hex(bytes) !== row.sha256) throw new Error(`drill image ${row.id}: the object ${row.object_key} does not match its SHA-256`);
        await knex('drill_assets').where({ id: row.id }).update({ bytes });
        restored++;
      }
    }
  } finally {
    store?.close();
  }
}
