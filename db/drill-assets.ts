import 'server-only';
import { randomUUID } from 'node:crypto';
import type { AssetType } from './types/drills';
import { drillAssetKey } from '@/lib/storage/keys';
import { objectStore, sha256Hex } from '@/lib/storage/object-store';
import { db } from './knex';
import { isUuid } from './users';

/**
 * Brief images. The bytes live in the bucket (lib/storage, one object per image under
 * `drill-assets/<drill>/<asset>`); the row keeps the name, the sniffed type, the size, the key and
 * the SHA-256, which every read checks, so a changed or swapped object is never served.
 */
export interface DrillAssetMeta {
  id: string;
  drillId: string;
  name: string;
  mediaType: AssetType;
  sizeBytes: number;
  createdAt: string;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toMeta(r: any): DrillAssetMeta {
  return { id: r.id, drillId: r.drill_id, name: r.name, mediaType: r.media_type, sizeBytes: r.size_bytes, createdAt: new Date(r.created_at).toISOString() };
}

const META = ['id', 'drill_id', 'name', 'media_type', 'size_bytes', 'created_at'];

/**
 * Stores one brief image; the caller has already checked size and sniffed the type. The object
 * is written first and the row second: a row never names a missing object, and an object whose
 * row could not be written is removed again.
 */
export async function insertAsset(input: { drillId: string; name: string; mediaType: AssetType; bytes: Buffer; uploadedBy: string }): Promise<DrillAssetMeta> {
  const id = randomUUID();
  const stored = await objectStore().put(drillAssetKey(input.drillId, id), input.bytes, input.mediaType);
  try {
    const [row] = await db()('drill_assets')
      .insert({
        id,
        drill_id: input.drillId,
        name: input.name,
        media_type: input.mediaType,
        size_bytes: stored.sizeBytes,
        object_key: stored.key,
        sha256: stored.sha256,
        uploaded_by: input.uploadedBy,
      })
      .returning(META);
    return toMeta(row);
  } catch (err) {
    await objectStore()
      .remove(stored.key)
      .catch(() => undefined);
    throw err;
  }
}

export async function listAssets(drillId: string): Promise<DrillAssetMeta[]> {
  return (await db()('drill_assets').where({ drill_id: drillId }).select(META).orderBy('created_at')).map(toMeta);
}

export async function countAssets(drillId: string): Promise<number> {
  const row = await db()('drill_assets').where({ drill_id: drillId }).count<{ n: string }[]>({ n: '*' }).first();
  return Number(row?.n ?? 0);
}

/**
 * One image with its bytes, read from the bucket (at most 1 MiB, MAX_ASSET_BYTES, so it is
 * read whole and its SHA-256 checked before anything is sent). Null when there is no such row;
 * throws when the row's object is missing or does not match (a server fault, never the reader's).
 */
export async function getAsset(drillId: string, assetId: string): Promise<(DrillAssetMeta & { bytes: Buffer }) | null> {
  if (!isUuid(assetId)) return null;
  const row = await db()('drill_assets').where({ drill_id: drillId, id: assetId }).first([...META, 'object_key', 'sha256']);
  if (!row) return null;
  const bytes = await objectStore().read(row.object_key);
  if (!bytes) throw new Error(`drill image ${row.id}: its object ${row.object_key} is missing from the bucket`);
  if (sha256Hex(bytes) !== row.sha256) throw new Error(`drill image ${row.id}: its object ${row.object_key} does not match the stored SHA-256`);
  return { ...toMeta(row), bytes };
}
