import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellsOf } from '@/lib/cells/access';
import { checkDocument } from '@/lib/cells/document';
import { TEMPLATE_LABELS, templateDocument } from '@/lib/cells/templates';
import { createCellSchema } from '@/lib/schemas/cells';
import { createCell } from '@/db/cells';

/** My cells; for students also the cells shared with their cohorts (and their copies). */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  return Response.json(await cellsOf(user));
});

/** Create a cell from a template (pick-and-place demo, panel starter, blank); version 1 is the template. */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const body = await parseJsonBody(req, createCellSchema);
  const checked = checkDocument(templateDocument(body.template, body.name));
  // A template that fails the engine's schema is our bug, not the caller's: 500, logged.
  if (!checked.ok) throw new Error(`template ${body.template} fails the cell schema: ${JSON.stringify(checked.problems)}`);
  const cell = await createCell({
    ownerId: user.id,
    name: body.name,
    origin: 'template',
    document: checked.document,
    message: `Created from the ${TEMPLATE_LABELS[body.template].label.toLowerCase()}`,
  });
  return Response.json({ cell }, { status: 201 });
});
