import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { fittingDocument } from '@/lib/cells/versions';
import { importCellSchema } from '@/lib/schemas/cells';
import { createCell } from '@/db/cells';

/**
 * Import a cell document (as exported) as a new cell. A document that fails the engine's
 * schema is refused with 422 and every problem keyed by its path; cross-reference problems
 * (wiring, point map ...) are imported and listed, as on a save.
 */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const body = await parseJsonBody(req, importCellSchema, 'cell');
  const { document, problems } = fittingDocument(body.document);
  const name = body.name ?? document.name;
  const cell = await createCell({
    ownerId: user.id,
    name,
    origin: 'import',
    document: { ...document, name },
    message: 'Imported from JSON',
  });
  return Response.json({ cell, problems }, { status: 201 });
});
