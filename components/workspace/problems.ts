/**
 * One rule for which problems an area shows: the engine's validation problems and warnings of
 * the loaded document (paths into the document), plus the logic sheet checked on its own (so a
 * run whose edits wait to be sent still marks a broken sheet before it reaches the engine).
 * Every path is a path into the document. Pure; `useAreaProblems` (use-area-problems.ts) is the hook.
 */
import { validateSheet, type CellDocument, type Problem } from '@/simulator';
import type { AreaId } from './area-tabs';

export type AreaProblems = {
  /** What stops the cell from loading (or, for the logic sheet, from compiling). */
  errors: Problem[];
  /** What runs but deserves a look (IEC 60204-1 panel colours, the supply's tolerance). */
  warnings: Problem[];
};

const NONE: AreaProblems = { errors: [], warnings: [] };

/** The document parts each area edits, by the first step of a problem's path. */
const OWNED: Record<AreaId, readonly string[]> = {
  panel: ['panel'],
  field: ['field', 'wiring'],
  logic: ['plc'],
  controller: ['controller'],
  monitor: [],
  scope: [],
};

/** The area a document problem belongs to; problems no area edits land in the Field area, beside the terminal strip. */
export function problemArea(problem: Problem): AreaId {
  const head = String(problem.path[0] ?? '');
  for (const [area, heads] of Object.entries(OWNED) as [AreaId, readonly string[]][]) if (heads.includes(head)) return area;
  return 'field';
}

const sheetProblems = new WeakMap<object, Problem[]>();

/** The logic sheet's own problems, with paths into the document (`plc.sheet.blocks.3…`); cached per sheet. */
function problemsOfSheet(sheet: CellDocument['plc']['sheet']): Problem[] {
  let out = sheetProblems.get(sheet);
  if (!out) {
    const r = validateSheet(sheet);
    out = r.ok ? [] : r.errors.map((p) => ({ ...p, path: ['plc', 'sheet', ...p.path] }));
    sheetProblems.set(sheet, out);
  }
  return out;
}

/** The problems `area` shows, from the document and the engine's last load. */
export function areaProblems(area: AreaId, input: { document: CellDocument; problems: readonly Problem[]; warnings: readonly Problem[] }): AreaProblems {
  if (area === 'monitor' || area === 'scope') return NONE;
  const mine = (p: Problem) => problemArea(p) === area;
  let errors = input.problems.filter(mine);
  // The sheet is checked from the document itself; the engine's copy of the same problems is left out.
  if (area === 'logic') errors = [...problemsOfSheet(input.document.plc.sheet), ...errors.filter((p) => p.path[1] !== 'sheet')];
  return { errors, warnings: input.warnings.filter(mine) };
}

