import { apiRoute, parseParams } from '@/lib/api/errors';
import { readFormFile } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { drillForAuthor } from '@/lib/drills/access';
import { addBriefImage } from '@/lib/drills/brief-images';
import { drillIdParamSchema, MAX_ASSET_BYTES } from '@/lib/schemas/drills';
import { listAssets } from '@/db/drill-assets';

type Ctx = { params: Promise<{ id: string }> };

/** The brief's images (metadata only). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  return Response.json({ assets: await listAssets(id) });
});

/**
 * Upload one brief image as multipart form data (field `file`). Larger than 1 MiB → 413; not a
 * PNG, JPEG, WebP or GIF by its magic bytes → 415 (lib/drills/brief-images.ts). Nothing is
 * stored on any error.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const file = await readFormFile(req, {
    field: 'file',
    maxBytes: MAX_ASSET_BYTES,
    limit: 'asset',
    tooLarge: 'The image is larger than 1 MiB.',
    missing: 'Choose an image file.',
    notForm: 'Send the image as multipart form data with a field named "file".',
  });
  return Response.json(await addBriefImage(drill, user, file), { status: 201 });
});
