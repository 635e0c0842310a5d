import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { drillsAuthoredBy } from '@/lib/drills/access';
import { checkDrillInput } from '@/lib/drills/author';
import { drillInputSchema } from '@/lib/schemas/drills';
import { createDrill } from '@/db/drills';

/** Trainers list their drills (hidden parts included: they wrote them); admins list all. */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  return Response.json({ drills: await drillsAuthoredBy(user) });
});

/** Create a drill on one of the trainer's cell versions; fault cards and rules are checked by the engine. */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const input = await parseJsonBody(req, drillInputSchema, 'drill');
  await checkDrillInput(user, input);
  return Response.json({ drill: await createDrill(user.id, input) }, { status: 201 });
});
