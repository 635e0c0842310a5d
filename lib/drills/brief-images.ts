import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { assetNameSchema } from '@/lib/schemas/drills';
import { countAssets, insertAsset, type DrillAssetMeta } from '@/db/drill-assets';
import type { Drill } from '@/db/drills';
import type { User } from '@/db/users';
import { sniffImageType } from './sniff';

/** At most this many images per brief. */
export const MAX_ASSETS_PER_DRILL = 30;

/**
 * Stores an uploaded file as one of the brief's images, or refuses it with nothing stored:
 * 415 unless its magic bytes say PNG, JPEG, WebP or GIF (the client's content type and file
 * name are not trusted), 422 for a name with slashes or over 200 characters, 409 when the
 * brief already holds MAX_ASSETS_PER_DRILL images. The size was checked while reading.
 */
export async function addBriefImage(drill: Drill, user: User, file: File): Promise<{ asset: DrillAssetMeta; markdown: string }> {
  const bytes = Buffer.from(await file.arrayBuffer());
  const type = sniffImageType(bytes);
  if (!type) throw new ApiError(415, 'This file is not a PNG, JPEG, WebP or GIF image.', { file: ['Upload a PNG, JPEG, WebP or GIF image.'] });
  const name = assetNameSchema.safeParse(file.name || 'image');
  if (!name.success) throw new ApiError(422, 'Some fields are not valid.', { file: ['A file name without slashes, at most 200 characters.'] });
  if ((await countAssets(drill.id)) >= MAX_ASSETS_PER_DRILL) throw new ApiError(409, `A brief holds at most ${MAX_ASSETS_PER_DRILL} images.`);
  const asset = await insertAsset({ drillId: drill.id, name: name.data, mediaType: type, bytes, uploadedBy: user.id });
  return { asset, markdown: `![${name.data}](/api/drills/${drill.id}/assets/${asset.id})` };
}
