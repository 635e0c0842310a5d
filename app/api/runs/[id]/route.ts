import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForReader, runView } from '@/lib/runs/access';
import { runIdParamSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/** A run's summary for its owner, its drill's trainer or an admin; the breakdown only where hidden parts may be seen. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const { run, reader, hiddenVisible } = await runForReader(user, id);
  return Response.json({ run: runView(run, hiddenVisible, reader), reader, hiddenVisible });
});
