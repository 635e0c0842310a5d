import { z } from 'zod';
import { ApiError, apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { cellForOwner, cellForReader } from '@/lib/cells/access';
import { downloadName } from '@/lib/cells/download';
import { importCsvIntoDocument } from '@/lib/cells/csv-import';
import { firstProblems, ioListToCsv, MAX_REPORTED_PROBLEMS, pointMapToCsv, rowErrorsToFields } from '@/lib/cells/csv';
import { cellCsvParamSchema, csvImportSchema } from '@/lib/schemas/cells';
import { getVersion, saveVersion } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string; kind: string }> };

const exportCsvQuery = z.object({
  version: z.coerce.number().int().min(1).optional(),
  /** Point map only: the live rows (default) or the staged rows waiting for a restart. */
  rows: z.enum(['live', 'staged']).default('live'),
});

/** The point map or the I/O list of a cell version as CSV (docs/csv-formats.md). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id, kind } = await parseParams(ctx.params, cellCsvParamSchema);
  const query = parseQuery(req, exportCsvQuery);
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
 * Import a CSV into my cell as a new version on top of `baseVersion`. The point map lands
 * as STAGED rows (live after a controller restart); the I/O list replaces the wiring.
 * A file with any bad row writes nothing: 422 with the first MAX_REPORTED_PROBLEMS row errors in
 * file order (`rowErrors: [{ row, column, message }]`, and the same as `fields` keyed
 * `rows.<row>.<column>`) and `problemCount`, the number of problems in all. A file longer than
 * the document's row limit is read up to that limit only.
 * 409 `{ error, latestVersion }` when the cell changed since `baseVersion`.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id, kind } = await parseParams(ctx.params, cellCsvParamSchema);
  await cellForOwner(user, id);
  const body = await parseJsonBody(req, csvImportSchema, 'csv');
  const latest = await getVersion(id);
  if (!latest) throw new ApiError(404, 'No such cell.');
  const stale = (latestVersion: number) =>
    new ApiError(409, `The cell was saved as version ${latestVersion} after the version you started from; nothing was imported. Reload and import again.`, undefined, { body: { latestVersion } });
  if (latest.version !== body.baseVersion) throw stale(latest.version);

  const result = importCsvIntoDocument(kind, body.csv, latest.document);
  if (!result.ok) {
    const { shown, total } = firstProblems(result.errors);
    const n = new Set(result.errors.map((e) => e.row)).size;
    const listed = total > MAX_REPORTED_PROBLEMS ? ` The first ${MAX_REPORTED_PROBLEMS} of ${total} problems are listed.` : '';
    throw new ApiError(422, `${n === 1 ? 'One row has' : `${n} rows have`} problems; nothing was imported.${listed}`, rowErrorsToFields(shown), { body: { rowErrors: shown, problemCount: total } });
  }
  const message = body.message || (kind === 'point-map' ? `Imported ${result.count} point-map rows (staged)` : `Imported ${result.count} I/O-list rows`);
  const saved = await saveVersion(id, user.id, body.baseVersion, result.document, message);
  if (!saved.ok && saved.reason === 'missing') throw new ApiError(404, 'No such cell.');
  if (!saved.ok) throw stale(saved.latestVersion);
  return Response.json({ version: saved.version, count: result.count, problems: result.problems }, { status: 201 });
});
