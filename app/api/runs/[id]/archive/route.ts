import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForReader } from '@/lib/runs/access';
import { runIdParamSchema } from '@/lib/schemas/runs';
import { archiveView, exportRunArchive } from '@/lib/reports/run-archive';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Exports the run (its cell document, event log, grade and trace summary, as the caller may
 * see them) to one JSON file in the bucket and answers where to download it (201). For the
 * run's readers only: its owner, its drill's trainer, admins; anyone else 404.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const { run, reader, hiddenVisible } = await runForReader(user, id);
  const archive = await exportRunArchive(user, run, reader, hiddenVisible);
  return Response.json({ archive: archiveView(archive) }, { status: 201 });
});
