import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { appendBatch, runForBatch } from '@/lib/runs/service';
import { batchSchema, runIdParamSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * One batch of the run's event log (owner only; anyone else's run is 404). Stored once per
 * idempotency key: a retry gets 200 with `duplicate: true` and the first answer; a new batch
 * gets 201. seq gap → 409 naming the expected seq; a submitted run → 409; a bad event → 422;
 * a body over BODY_LIMITS.batch → 413 (counted as it streams). A student's client sends one every second or so,
 * so the usual batch reads the database twice only: the session's user and the insert.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const run = await runForBatch(user, id);
  const body = await parseJsonBody(req, batchSchema, 'batch');
  const answer = await appendBatch(run, body);
  return Response.json(answer, { status: answer.duplicate ? 200 : 201 });
});
