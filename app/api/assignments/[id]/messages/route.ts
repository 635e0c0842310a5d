import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForStudent, messageRecipient } from '@/lib/drills/access';
import { assignmentForWatcher } from '@/lib/live/board';
import { runMessageSchema } from '@/lib/schemas/live';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';
import { insertRunMessage, listMessagesForStudent } from '@/db/live';

type Ctx = { params: Promise<{ id: string }> };

/** A student's messages on the assignment (to them or to everyone). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.attemptDrills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment } = await assignmentForStudent(user, id);
  return Response.json({ messages: await listMessagesForStudent(assignment.id, user.id) }, { headers: { 'cache-control': 'no-store' } });
});

/** The drill's trainer (or an admin) posts a hint or message to one student of the cohort, or to all. */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment } = await assignmentForWatcher(user, id);
  const input = await parseJsonBody(req, runMessageSchema, 'form');
  const to = await messageRecipient(assignment, input.to);
  const message = await insertRunMessage({ assignmentId: assignment.id, userId: to, authorId: user.id, kind: input.kind, body: input.body });
  return Response.json({ message }, { status: 201 });
});
