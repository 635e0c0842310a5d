import { ApiError, apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { checkDocument, problemsToFields } from '@/lib/cells/document';
import { importCellSchema } from '@/lib/schemas/cells';
import { createCell } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

/**
 * Import a cell document (as exported) as a new cell. A document that fails the engine's
 * schema is refused with 422 and every problem keyed by its path; cross-reference problems
 * (wiring, point map ...) are imported and listed, as on a save.
 */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const body = await parseJsonBody(req, importCellSchema, 'cell');
  const checked = checkDocument(body.document);
  if (!checked.ok) throw new ApiError(422, 'The cell document does not fit the cell schema.', problemsToFields(checked.problems));
  const name = body.name ?? checked.document.name;
  const cell = await createCell({
    ownerId: user.id,
    name,
    origin: 'import',
    document: { ...checked.document, name },
    message: 'Imported from JSON',
  });
  return Response.json({ cell, problems: checked.problems }, { status: 201 });
});
