import 'server-only';
import type { CellDocument, Problem } from '@/simulator';
import { ApiError } from '@/lib/api/errors';
import type { CsvKind } from '@/lib/schemas/cells';
import { getVersion, saveVersion, type CellVersionMeta } from '@/db/cells';
import { firstProblems, MAX_REPORTED_PROBLEMS, rowErrorsToFields, type CsvRowError } from './csv';
import { importCsvIntoDocument } from './csv-import';
import { checkDocument, problemsToFields } from './document';

/**
 * Writing a new version of a cell: a save from the workspace, a CSV import. Both are made on
 * top of the version the writer started from; when someone saved in between nothing is
 * written and the 409 carries `latestVersion`, so the client can reload or keep its copy.
 */

/** A document that fits the engine's cell schema, or 422 with every problem keyed by its path. */
export function fittingDocument(raw: unknown): { document: CellDocument; problems: Problem[] } {
  const checked = checkDocument(raw);
  if (!checked.ok) throw new ApiError(422, 'The cell document does not fit the cell schema.', problemsToFields(checked.problems));
  return { document: checked.document, problems: checked.problems };
}

/** The 409 of a write started from a version that is no longer the latest. */
export function staleVersion(message: string, latestVersion: number): ApiError {
  return new ApiError(409, message, undefined, { body: { latestVersion } });
}

/** Saves on top of `baseVersion`: 404 for a cell gone meanwhile, 409 `{ latestVersion }` (worded by `stale`) when it is not the latest. */
async function saveOnTop(cellId: string, authorId: string, baseVersion: number, document: CellDocument, message: string, stale: (latest: number) => string): Promise<CellVersionMeta> {
  const saved = await saveVersion(cellId, authorId, baseVersion, document, message);
  if (!saved.ok && saved.reason === 'missing') throw new ApiError(404, 'No such cell.');
  if (!saved.ok) throw staleVersion(stale(saved.latestVersion), saved.latestVersion);
  return saved.version;
}

const staleSave = (latest: number) => `Someone saved version ${latest} after the version you started from. Your changes were not saved; reload or keep a copy.`;
const staleImport = (latest: number) => `The cell was saved as version ${latest} after the version you started from; nothing was imported. Reload and import again.`;

/**
 * A save from the workspace. 422 when the document does not fit the cell schema; cross-reference
 * problems (wiring, point map ...) do not block it and come back as `problems`.
 */
export async function saveCellDocument(
  cellId: string,
  authorId: string,
  input: { baseVersion: number; document: unknown; message: string },
): Promise<{ version: CellVersionMeta; problems: Problem[] }> {
  const { document, problems } = fittingDocument(input.document);
  return { version: await saveOnTop(cellId, authorId, input.baseVersion, document, input.message, staleSave), problems };
}

/**
 * A CSV import as a new version on top of `baseVersion`: the point map lands as STAGED rows
 * (live after a controller restart), the I/O list replaces the wiring. A file with any bad
 * row writes nothing: 422 with the first MAX_REPORTED_PROBLEMS row errors in file order
 * (`rowErrors: [{ row, column, message }]`, the same as `fields` keyed `rows.<row>.<column>`)
 * and `problemCount`, the number of problems in all.
 */
export async function importCsvVersion(
  cellId: string,
  authorId: string,
  kind: CsvKind,
  input: { baseVersion: number; csv: string; message: string },
): Promise<{ version: CellVersionMeta; count: number; problems: Problem[] }> {
  const latest = await getVersion(cellId);
  if (!latest) throw new ApiError(404, 'No such cell.');
  if (latest.version !== input.baseVersion) throw staleVersion(staleImport(latest.version), latest.version);
  const result = importCsvIntoDocument(kind, input.csv, latest.document);
  if (!result.ok) throw csvRowsRefused(result.errors);
  const message = input.message || (kind === 'point-map' ? `Imported ${result.count} point-map rows (staged)` : `Imported ${result.count} I/O-list rows`);
  const version = await saveOnTop(cellId, authorId, input.baseVersion, result.document, message, staleImport);
  return { version, count: result.count, problems: result.problems };
}

function csvRowsRefused(errors: readonly CsvRowError[]): ApiError {
  const { shown, total } = firstProblems(errors);
  const n = new Set(errors.map((e) => e.row)).size;
  const listed = total > MAX_REPORTED_PROBLEMS ? ` The first ${MAX_REPORTED_PROBLEMS} of ${total} problems are listed.` : '';
  return new ApiError(422, `${n === 1 ? 'One row has' : `${n} rows have`} problems; nothing was imported.${listed}`, rowErrorsToFields(shown), { body: { rowErrors: shown, problemCount: total } });
}
