import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { BODY_LIMITS, readBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { drillForAuthor } from '@/lib/drills/access';
import { sniffImageType } from '@/lib/drills/sniff';
import { assetNameSchema, drillIdParamSchema, MAX_ASSET_BYTES } from '@/lib/schemas/drills';
import { countAssets, insertAsset, listAssets } from '@/db/drill-assets';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/** At most this many images per brief. */
const MAX_ASSETS_PER_DRILL = 30;

/** The brief's images (metadata only). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  return Response.json({ assets: await listAssets(id) });
});

/**
 * Upload one brief image as multipart form data (field `file`). Larger than 1 MiB → 413; not a
 * PNG, JPEG, WebP or GIF by its magic bytes → 415 (the client's content type and file name
 * are not trusted). Nothing is stored on any error.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  let bytesIn: Uint8Array<ArrayBuffer>;
  try {
    bytesIn = await readBody(req, BODY_LIMITS.asset);
  } catch (e) {
    if (e instanceof ApiError && e.status === 413) throw new ApiError(413, 'The image is larger than 1 MiB.', { file: [`At most ${MAX_ASSET_BYTES} bytes.`] });
    throw e;
  }
  let form: FormData;
  try {
    form = await new Response(bytesIn, { headers: { 'content-type': req.headers.get('content-type') ?? '' } }).formData();
  } catch {
    throw new ApiError(400, 'Send the image as multipart form data with a field named "file".');
  }
  const file = form.get('file');
  if (!file || typeof file === 'string') throw new ApiError(422, 'Some fields are not valid.', { file: ['Choose an image file.'] });
  if (file.size > MAX_ASSET_BYTES) throw new ApiError(413, 'The image is larger than 1 MiB.', { file: [`At most ${MAX_ASSET_BYTES} bytes.`] });
  if (file.size === 0) throw new ApiError(422, 'Some fields are not valid.', { file: ['The file is empty.'] });
  const bytes = Buffer.from(await file.arrayBuffer());
  const type = sniffImageType(bytes);
  if (!type) throw new ApiError(415, 'This file is not a PNG, JPEG, WebP or GIF image.', { file: ['Upload a PNG, JPEG, WebP or GIF image.'] });
  const name = assetNameSchema.safeParse(file.name || 'image');
  if (!name.success) throw new ApiError(422, 'Some fields are not valid.', { file: ['A file name without slashes, at most 200 characters.'] });
  if ((await countAssets(id)) >= MAX_ASSETS_PER_DRILL) throw new ApiError(409, `A brief holds at most ${MAX_ASSETS_PER_DRILL} images.`);
  const asset = await insertAsset({ drillId: id, name: name.data, mediaType: type, bytes, uploadedBy: user.id });
  return Response.json({ asset, markdown: `![${name.data}](/api/drills/${id}/assets/${asset.id})` }, { status: 201 });
});
