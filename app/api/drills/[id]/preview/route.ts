import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { drillForAuthor } from '@/lib/drills/access';
import { drillIdParamSchema, DIAGNOSIS_KINDS } from '@/lib/schemas/drills';
import { getVersion } from '@/db/cells';
import { listAssets } from '@/db/drill-assets';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Everything the trainer's preview needs to run the drill in the browser worker as a student
 * would: the base cell document, the hidden fault cards (armed in the preview), and the parts
 * a student sees, side by side with the rules and answer.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const version = await getVersion(drill.cellId, drill.cellVersion);
  if (!version) throw new ApiError(404, 'The base cell version is missing.');
  return Response.json({ drill, document: version.document, assets: await listAssets(id), diagnosisKinds: DIAGNOSIS_KINDS });
});
