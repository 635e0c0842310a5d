import { apiRoute, ApiError } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { createCohortSchema } from '@/lib/schemas/cohorts';
import { cohortsManagedBy } from '@/lib/cohorts/access';
import { createCohort } from '@/db/cohorts';

/** Trainers list their own cohorts; admins list all. */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cohorts);
  return Response.json({ cohorts: await cohortsManagedBy(user) });
});

/** Trainers and admins create a cohort they then own. */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cohorts);
  const body = await parseJsonBody(req, createCohortSchema);
  const result = await createCohort(user.id, body);
  if (!result.ok) throw new ApiError(409, 'You already have a cohort with this name.', { name: ['Choose another name.'] });
  return Response.json({ cohort: result.cohort }, { status: 201 });
});
