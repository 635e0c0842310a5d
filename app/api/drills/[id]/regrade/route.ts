import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { drillForAuthor } from '@/lib/drills/access';
import { enqueueJob, isFinished, listJobs, subjectOf } from '@/lib/jobs';
import type { DrillRegradePayload } from '@/lib/drills/regrade-report';
import { drillIdParamSchema } from '@/lib/schemas/drills';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Queues a regrade check of the drill: every submitted run re-simulated and compared with its
 * stored grade and trace hash (lib/drills/regrade-job.ts); stored grades are never changed.
 * 201 with the new job; 200 with the one already queued or running (one check at a time).
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const subject = subjectOf('drill', drill.id);
  const open = (await listJobs(subject)).find((j) => j.kind === 'drill-regrade' && !isFinished(j.state));
  if (open) return Response.json({ job: open, created: false }, { status: 200 });
  const payload: DrillRegradePayload = { drillId: drill.id };
  const job = await enqueueJob({ kind: 'drill-regrade', payload, ownerId: user.id, subject });
  return Response.json({ job, created: true }, { status: 201 });
});
