import 'server-only';
import type { AssetType } from '@/lib/schemas/drills';
import { db } from './knex';
import { isUuid } from './users';

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

/** Stores one brief image; the caller has already checked size and sniffed the type. */
export async function insertAsset(input: { drillId: string; name: string; mediaType: AssetType; bytes: Buffer; uploadedBy: string }): Promise<DrillAssetMeta> {
  const [row] = await db()('drill_assets')
    .insert({ drill_id: input.drillId, name: input.name, media_type: input.mediaType, size_bytes: input.bytes.length, bytes: input.bytes, uploaded_by: input.uploadedBy })
    .returning(META);
  return toMeta(row);
}

export async function listAssets(drillId: string): Promise<DrillAssetMeta[]> {
  return (await db()('drill_assets').where({ drill_id: drillId }).select(META).orderBy('created_at')).map(toMeta);
}

export async function countAssets(drillId: string): Promise<number> {
  const row = await db()('drill_assets').where({ drill_id: drillId }).count<{ n: string }[]>({ n: '*' }).first();
  return Number(row?.n ?? 0);
}

export async function getAsset(drillId: string, assetId: string): Promise<(DrillAssetMeta & { bytes: Buffer }) | null> {
  if (!isUuid(assetId)) return null;
  const row = await db()('drill_assets').where({ drill_id: drillId, id: assetId }).first([...META, 'bytes']);
  return row ? { ...toMeta(row), bytes: row.bytes as Buffer } : null;
}
