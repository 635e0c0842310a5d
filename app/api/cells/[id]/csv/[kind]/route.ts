import { ApiError, apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner, cellForReader } from '@/lib/cells/access';
import { downloadName } from '@/lib/cells/download';
import { ioListToCsv, pointMapToCsv } from '@/lib/cells/csv';
import { importCsvVersion } from '@/lib/cells/versions';
import { cellCsvParamSchema, csvExportQuerySchema, csvImportSchema } from '@/lib/schemas/cells';
import { getVersion } from '@/db/cells';

type Ctx = { params: Promise<{ id: string; kind: string }> };

/** The point map or the I/O list of a cell version as CSV (docs/csv-formats.md). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id, kind } = await parseParams(ctx.params, cellCsvParamSchema);
  const query = parseQuery(req, csvExportQuerySchema);
  const { cell } = await cellForReader(user, id);
  const found = await getVersion(id, query.version);
  if (!found) throw new ApiError(404, 'No such version.');
  const c = found.document.controller;
  const text = kind === 'io-list' ? ioListToCsv(found.document.wiring) : pointMapToCsv(query.rows === 'staged' ? (c.staged ?? []) : c.pointMap);
  const suffix = kind === 'point-map' && query.rows === 'staged' ? '-staged' : '';
  return new Response(text, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${downloadName(cell.name)}-v${found.version}-${kind}${suffix}.csv"`,
      'cache-control': 'no-store',
    },
  });
});

/**
 * Import a CSV into my cell as a new version on top of `baseVersion` (lib/cells/versions.ts):
 * the point map lands as STAGED rows, the I/O list replaces the wiring. A file with any bad row
 * writes nothing: 422 with `rowErrors`, `fields` and `problemCount`. A file longer than the
 * document's row limit is read up to that limit only. 409 `{ error, latestVersion }` when the
 * cell changed since `baseVersion`.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id, kind } = await parseParams(ctx.params, cellCsvParamSchema);
  await cellForOwner(user, id);
  const body = await parseJsonBody(req, csvImportSchema, 'csv');
  const { version, count, problems } = await importCsvVersion(id, user.id, kind, body);
  return Response.json({ version, count, problems }, { status: 201 });
});
