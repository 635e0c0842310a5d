import { apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForWatcher } from '@/lib/live/board';
import { findingsCsv, findingsOfClosed } from '@/lib/live/findings';
import { findingsQuerySchema } from '@/lib/schemas/live';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';

type Ctx = { params: Promise<{ id: string }> };

/**
 * What the cohort found on a closed assignment (faults found and missed, time to diagnosis,
 * grades, rules failed) as JSON, or `?format=csv` to download beside the gradebook. 409 while
 * the assignment is still open: the figures would change under the trainer.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment, drill } = await assignmentForWatcher(user, id);
  const { format } = parseQuery(req, findingsQuerySchema);
  const findings = await findingsOfClosed(assignment, drill);
  if (format === 'csv') {
    const file = `findings-${drill.title.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '').toLowerCase() || 'drill'}.csv`;
    return new Response(findingsCsv(findings), { headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${file}"`, 'cache-control': 'no-store' } });
  }
  return Response.json(findings, { headers: { 'cache-control': 'no-store' } });
});
