import { parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForReader } from '@/lib/runs/access';
import { pageQuerySchema, runIdParamSchema } from '@/lib/schemas/runs';

/**
 * The guard of the paged run read routes (events, trace): a session (401), a run id (400),
 * a run the caller may read, as its owner, the drill's trainer or an admin (404 otherwise),
 * then the page asked for (400). `hiddenVisible` says whether the caller may see the drill's
 * hidden parts.
 */
export async function readRunPage(req: Request, params: Promise<{ id: string }>) {
  const user = await requireApiUser(req);
  const { id } = await parseParams(params, runIdParamSchema);
  const { run, hiddenVisible } = await runForReader(user, id);
  const { page, pageSize } = parseQuery(req, pageQuerySchema);
  return { user, run, hiddenVisible, page, pageSize };
}
