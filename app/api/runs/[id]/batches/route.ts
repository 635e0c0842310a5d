import { ApiError, apiRoute, parseJsonText, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { appendBatch, runForBatch } from '@/lib/runs/service';
import { BATCH_LIMITS, batchSchema, runIdParamSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * One batch of the run's event log (owner only; anyone else's run is 404). Stored once per
 * idempotency key: a retry gets 200 with `duplicate: true` and the first answer; a new batch
 * gets 201. seq gap → 409 naming the expected seq; a submitted run → 409; a bad event → 422;
 * a body over BATCH_LIMITS.bodyBytes → 413. A student's client sends one every second or so,
 * so the usual batch reads the database twice only: the session's user and the insert.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const run = await runForBatch(user, id);
  const body = parseJsonText(await limitedText(req), batchSchema);
  const answer = await appendBatch(run, body);
  return Response.json(answer, { status: answer.duplicate ? 200 : 201 });
});

/** The body as text, read once and bounded (downloads make batches larger than plain events). */
async function limitedText(req: Request): Promise<string> {
  const declared = Number(req.headers.get('content-length') ?? '0');
  if (declared > BATCH_LIMITS.bodyBytes) throw new ApiError(413, `A batch may be at most ${BATCH_LIMITS.bodyBytes} bytes.`);
  const text = await req.text();
  // A UTF-8 string is at most 3 bytes per UTF-16 unit, so short bodies need no byte count.
  if (text.length * 3 > BATCH_LIMITS.bodyBytes && Buffer.byteLength(text, 'utf8') > BATCH_LIMITS.bodyBytes) {
    throw new ApiError(413, `A batch may be at most ${BATCH_LIMITS.bodyBytes} bytes.`);
  }
  return text;
}
