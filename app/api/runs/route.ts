import { ApiError, apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForReader } from '@/lib/cells/access';
import { runView } from '@/lib/runs/access';
import { newSeed, prepareLiveRun } from '@/lib/runs/service';
import { practiceStartSchema } from '@/lib/schemas/runs';
import { getVersion } from '@/db/cells';
import { createRun, listRunsOfUser } from '@/db/runs';

/** The caller's own runs, newest first (drill attempts without their hidden parts, practice runs). */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const runs = await listRunsOfUser(user.id);
  return Response.json({ runs: runs.map((r) => runView(r, r.mode === 'practice')) });
});

/**
 * Start a free-practice run on a cell the caller may open (their own, or one shared with their
 * cohort), at a given version or the latest. The browser runs it with the seed it sends (so the
 * server's replay matches; the server never sends a seed back); its events are streamed to
 * /api/runs/[id]/batches so it is saved and replayable.
 */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const body = await parseJsonBody(req, practiceStartSchema);
  await cellForReader(user, body.cellId);
  const version = await getVersion(body.cellId, body.version);
  if (!version) throw new ApiError(422, 'Some fields are not valid.', { version: ['The cell has no such version.'] });
  const run = await createRun({ userId: user.id, mode: 'practice', cellId: body.cellId, cellVersion: version.version, seed: body.seed ?? newSeed() });
  await prepareLiveRun(run);
  return Response.json({ run: runView(run, true), document: version.document }, { status: 201 });
});
