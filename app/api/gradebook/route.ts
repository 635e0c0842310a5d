import { apiRoute, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { buildGradebook, cohortForGradebook } from '@/lib/drills/gradebook';
import { gradebookQuerySchema } from '@/lib/schemas/runs';

/** Cohort × drill grades with per-student detail (the cohort's trainer, admins). */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { cohort } = parseQuery(req, gradebookQuerySchema);
  return Response.json({ gradebook: await buildGradebook(await cohortForGradebook(user, cohort)) });
});
