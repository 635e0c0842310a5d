/**
 * Checking a cell document on its way into the database. Two levels, on purpose:
 * - shape (the engine's zod schema, `cellDocumentSchema`): a document that fails it is
 *   refused with 422 and every problem's path — it could not even be loaded;
 * - cross-references (`validateCellDocument`: wiring, modules, point map, routine, sheet
 *   graph): reported back as `problems` but saved, because a half-wired cell is normal work
 *   in progress and refusing the save would risk losing it.
 */
import { CELL_LIMITS, cellDocumentSchema, upgradeCellDocument, validateCellDocument } from '@/simulator';
import type { CellDocument, Problem } from '@/simulator';

export type CheckedDocument = { ok: true; document: CellDocument; problems: Problem[] } | { ok: false; problems: Problem[] };

/** Shape-checks a document of unknown type and lists its cross-reference problems. */
export function checkDocument(raw: unknown): CheckedDocument {
  // A document exported under an older schema version (say, before a role was renamed) still imports.
  const input = upgradeCellDocument(raw);
  const size = JSON.stringify(input ?? null).length;
  if (size > CELL_LIMITS.documentChars) {
    return { ok: false, problems: [{ path: [], code: 'too_large', message: `the document has ${size} characters; the limit is ${CELL_LIMITS.documentChars}` }] };
  }
  const parsed = cellDocumentSchema.safeParse(input);
  if (!parsed.success) {
    // The engine's validator adds sheet-graph problems next to shape problems; report them all.
    const full = validateCellDocument(input);
    const own = parsed.error.issues.map((i) => ({ path: i.path.map((p) => (typeof p === 'number' ? p : String(p))), code: i.code, message: i.message }));
    return { ok: false, problems: full.ok ? own : full.errors };
  }
  const full = validateCellDocument(parsed.data);
  return { ok: true, document: parsed.data, problems: full.ok ? [] : full.errors };
}

/** Problems as the API's field errors, keyed by dotted path ("controller.pointMap.0.rack"; "_" for the root). */
export function problemsToFields(problems: readonly Problem[]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const p of problems) (out[p.path.length ? p.path.join('.') : '_'] ??= []).push(p.message);
  return out;
}
