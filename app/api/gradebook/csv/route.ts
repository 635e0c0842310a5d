import { apiRoute, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { buildGradebook, cohortForGradebook, gradebookCsv } from '@/lib/drills/gradebook';
import { gradebookQuerySchema } from '@/lib/schemas/runs';

/** The gradebook as a CSV download. */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { cohort } = parseQuery(req, gradebookQuerySchema);
  const c = await cohortForGradebook(user, cohort);
  const csv = gradebookCsv(await buildGradebook(c));
  const file = `gradebook-${c.name.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '').toLowerCase() || 'cohort'}.csv`;
  return new Response(csv, { headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${file}"`, 'cache-control': 'no-store' } });
});
