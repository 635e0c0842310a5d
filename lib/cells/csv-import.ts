/**
 * Applying an uploaded CSV to a cell document. Pure: returns the new document or every
 * row's error; the route handler writes the version.
 */
import type { CellDocument, PointMapRow, Problem, WiringRow } from '@/simulator';
import type { CsvKind } from '@/lib/schemas/cells';
import { checkDocument } from './document';
import { parseIoListCsv, parsePointMapCsv, problemsToRowErrors, sortErrors } from './csv';
import type { CsvRowError } from './csv';

export type CsvImportResult =
  | { ok: true; document: CellDocument; count: number; problems: Problem[] }
  | { ok: false; errors: CsvRowError[] };

/**
 * Builds the document a CSV import would save. Point-map rows replace the STAGED map
 * (`controller.staged`; the live map is untouched until a controller restart, DESIGN.md);
 * I/O-list rows replace the wiring. The cell's own cross-checks (modules in the named
 * rack/slot, overlapping points or channels, unknown devices or terminals, two wires into
 * one input ...) run on the result, and any problem inside the imported rows rejects the
 * whole file with that row's number. Problems elsewhere in the cell are not the file's
 * fault: they come back as `problems`, as on a save.
 */
export function importCsvIntoDocument(kind: CsvKind, text: string, base: CellDocument): CsvImportResult {
  const prefix = kind === 'point-map' ? ['controller', 'staged'] : ['wiring'];
  const parsed = kind === 'point-map' ? parsePointMapCsv(text) : parseIoListCsv(text, base);
  const next: CellDocument =
    kind === 'point-map' ? { ...base, controller: { ...base.controller, staged: parsed.rows as PointMapRow[] } } : { ...base, wiring: parsed.rows as WiringRow[] };
  const count = parsed.rows.length;
  // Cross-checks run on the rows that parsed, so a file's every problem is reported at once.
  const checked = checkDocument(next);
  const errors = sortErrors([...parsed.errors, ...problemsToRowErrors(checked.problems, prefix, kind, parsed.rowNumbers)]);
  if (errors.length > 0) return { ok: false, errors };
  if (!checked.ok) {
    // A shape problem outside the rows would mean the stored base was invalid: report it whole.
    return { ok: false, errors: checked.problems.map((p) => ({ row: 1, column: '', message: `${p.path.join('.')}: ${p.message}` })) };
  }
  const outside = checked.problems.filter((p) => !prefix.every((seg, k) => p.path[k] === seg));
  return { ok: true, document: checked.document, count, problems: outside };
}
