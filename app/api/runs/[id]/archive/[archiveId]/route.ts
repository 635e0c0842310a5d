import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForReader } from '@/lib/runs/access';
import { runArchiveParamSchema } from '@/lib/schemas/files';
import { runArchiveDownload } from '@/lib/reports/run-archive';

type Ctx = { params: Promise<{ id: string; archiveId: string }> };

/**
 * One exported archive of a run (JSON), streamed from the bucket through the run's reader
 * check; the owner gets only archives made for the owner's own view (lib/reports/run-archive.ts).
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id, archiveId } = await parseParams(ctx.params, runArchiveParamSchema);
  const { run, reader, hiddenVisible } = await runForReader(user, id);
  return runArchiveDownload(run, reader, hiddenVisible, archiveId);
});
