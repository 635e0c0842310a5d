import { apiRoute, busy, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForStudent } from '@/lib/drills/access';
import { studentMessageStream } from '@/lib/live/messages';
import { liveStreamCapacity } from '@/lib/live/sse';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';

export const dynamic = 'force-dynamic';

type Ctx = { params: Promise<{ id: string }> };

/** A student's messages on the assignment as Server-Sent Events (lib/live/messages.ts). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.attemptDrills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment } = await assignmentForStudent(user, id);
  if (!liveStreamCapacity()) throw busy('Too many live streams are open on this server; try again shortly.', 5);
  return studentMessageStream(req, user, assignment);
});
