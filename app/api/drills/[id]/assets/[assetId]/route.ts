import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { drillAssetParamSchema } from '@/lib/schemas/drills';
import { findDrill, isDrillOpenedToMember } from '@/db/drills';
import { getAsset } from '@/db/drill-assets';

type Ctx = { params: Promise<{ id: string; assetId: string }> };

/**
 * One brief image, served with the type sniffed at upload and `nosniff`, so the browser never
 * reinterprets it. Readable by the drill's trainer, admins, and students it is assigned to once
 * that assignment has opened (the brief is not theirs before).
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id, assetId } = await parseParams(ctx.params, drillAssetParamSchema);
  const drill = await findDrill(id);
  if (!drill) throw new ApiError(404, 'No such image.');
  const allowed = user.role === 'admin' || drill.trainerId === user.id || (user.role === 'student' && (await isDrillOpenedToMember(id, user.id)));
  if (!allowed) throw new ApiError(404, 'No such image.');
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
