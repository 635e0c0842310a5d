import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { runForGrader, runView } from '@/lib/runs/access';
import { overrideSchema, runIdParamSchema } from '@/lib/schemas/runs';
import { findRun, overrideGrade } from '@/db/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The drill's trainer (or an admin) overrides a submitted run's grade with a reason; `grade:
 * null` removes the override. Both the grade and the audit entry are written in one transaction.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const { run, reader } = await runForGrader(user, id);
  const body = await parseJsonBody(req, overrideSchema);
  await overrideGrade(run, body.grade, body.reason, user.id);
  return Response.json({ run: runView((await findRun(run.id))!, true, reader) });
});
