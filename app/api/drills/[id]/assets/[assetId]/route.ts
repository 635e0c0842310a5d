import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { drillForImageReader } from '@/lib/drills/access';
import { drillAssetParamSchema } from '@/lib/schemas/drills';
import { getAsset } from '@/db/drill-assets';

type Ctx = { params: Promise<{ id: string; assetId: string }> };

/**
 * One brief image, served with the type sniffed at upload and `nosniff`, so the browser never
 * reinterprets it. Readable by whoever may read the brief (drillForImageReader); 404 otherwise.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id, assetId } = await parseParams(ctx.params, drillAssetParamSchema);
  await drillForImageReader(user, id);
  const asset = await getAsset(id, assetId);
  if (!asset) throw new ApiError(404, 'No such image.');
  return new Response(new Uint8Array(asset.bytes), {
    status: 200,
    headers: {
      'content-type': asset.mediaType,
      'content-length': String(asset.sizeBytes),
      'x-content-type-options': 'nosniff',
      'cache-control': 'private, max-age=3600',
      'content-security-policy': "default-src 'none'",
    },
  });
});
