import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverAbilities, changeoverForEditor, changeoverForReader } from '@/lib/changeovers/access';
import { updateChangeoverFor } from '@/lib/changeovers/service';
import { changeoverIdParamSchema, updateChangeoverSchema } from '@/lib/schemas/changeovers';
import { findSignedRecord, listChangeoverEvents } from '@/db/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/** One changeover with what I may do with it, its history and (once signed off) its record. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const changeover = await changeoverForReader(user, id);
  const [events, record] = await Promise.all([listChangeoverEvents(id), findSignedRecord(id)]);
  return Response.json({ changeover, abilities: changeoverAbilities(user, changeover), events, record });
});

/** Title, description or countersigner (the opener; before sign-off, else 409). */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  const body = await parseJsonBody(req, updateChangeoverSchema);
  return Response.json({ changeover: await updateChangeoverFor(user, co, body) });
});
