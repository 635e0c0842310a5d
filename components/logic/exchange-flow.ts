/**
 * The pure parts of taking a logic sheet out of the workspace and bringing one back in
 * (the Logic area's "Sheet files" group): file names, the import size cap, the confirmation's
 * words and where each problem sits. The engine calls themselves live in ./sheet-exchange.ts,
 * which the area loads only when a button is used.
 */
import type { Problem } from '@/simulator';
import type { Sheet } from './sheet-graph';

/** Largest file the import reads (2 MiB: a few thousand blocks; the engine itself takes far more). */
export const MAX_IMPORT_BYTES = 2 * 1024 * 1024;

/** The two formats a sheet leaves in. */
export type ExportKind = 'st' | 'xml';

/** A file-name part from a cell's name: lower-case ASCII letters, digits and single hyphens. */
export function cellFileSlug(cellName: string): string {
  const slug = cellName
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return slug || 'cell';
}

/** The download's name, e.g. `kestrel-vale-cell-b-pick-and-place-logic.st`. */
export function exportFileName(cellName: string, kind: ExportKind): string {
  return `${cellFileSlug(cellName)}-logic.${kind}`;
}

/** The media type of a download. */
export function exportMediaType(kind: ExportKind): string {
  return kind === 'st' ? 'text/plain;charset=utf-8' : 'application/xml;charset=utf-8';
}

/** A byte count for people: `812 bytes`, `14.2 KB`, `3.4 MB` (1 KB = 1024 bytes). */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} byte${bytes === 1 ? '' : 's'}`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

/** Why a chosen file is not read at all, or null when it may be read. */
export function importFileRefusal(file: { name: string; size: number }): string | null {
  if (file.size === 0) return `“${file.name}” is empty.`;
  if (file.size > MAX_IMPORT_BYTES) return `“${file.name}” is ${formatBytes(file.size)}; the import reads files up to ${formatBytes(MAX_IMPORT_BYTES)}.`;
  return null;
}

export type SheetCounts = { blocks: number; wires: number; scanPeriodMs: number };

export function sheetCounts(sheet: Pick<Sheet, 'blocks' | 'connections' | 'scanPeriodMs'>): SheetCounts {
  return { blocks: sheet.blocks.length, wires: sheet.connections.length, scanPeriodMs: sheet.scanPeriodMs };
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** `37 blocks and 27 wires`. */
export function countsText(c: SheetCounts): string {
  return `${plural(c.blocks, 'block', 'blocks')} and ${plural(c.wires, 'wire', 'wires')}`;
}

/** The confirmation before an imported sheet replaces the current one. */
export function replaceQuestion(current: SheetCounts, incoming: SheetCounts, fileName: string): { title: string; lines: string[] } {
  const lines = [`The current sheet (${countsText(current)}) will be replaced by the sheet in “${fileName}” (${countsText(incoming)}).`];
  if (current.scanPeriodMs !== incoming.scanPeriodMs) lines.push(`The scan period changes from ${current.scanPeriodMs} ms to ${incoming.scanPeriodMs} ms.`);
  lines.push('Undo brings the current sheet back.');
  return { title: 'Replace the logic sheet?', lines };
}

/** One row of the problem list: where, what, and the engine's code. */
export type ExchangeProblemRow = { where: string; message: string; code: string };

const segment = (s: string | number) => String(s);

/**
 * Where a problem sits, in words. Import problems point into the XML document
 * (`['xml', 'line', 3, 'column', 9]`, `[… 'FBD', 'block', 7, 'inputVariables', 'IN1', …]`);
 * export problems point into the sheet (`['blocks', 4, 'params', 'PT']`), named by block id.
 */
export function problemWhere(path: readonly (string | number)[], sheet?: Pick<Sheet, 'blocks' | 'connections'>): string {
  if (path.length === 0) return 'the file';
  if (path[0] === 'xml') {
    const line = path.indexOf('line');
    const column = path.indexOf('column');
    if (line < 0) return 'the XML document';
    return `XML line ${segment(path[line + 1])}${column >= 0 ? `, column ${segment(path[column + 1])}` : ''}`;
  }
  const fbd = path.indexOf('FBD');
  if (path[0] === 'project' && fbd >= 0) {
    const [kind, localId, ...rest] = path.slice(fbd + 1);
    if (kind === undefined) return 'the FBD body';
    const element = localId === undefined ? String(kind) : `${String(kind)} localId ${segment(localId)}`;
    return [element, ...rest.map(segment)].join(' › ');
  }
  if (path[0] === 'project') return path.map(segment).join(' › ');
  if (path[0] === 'blocks' && typeof path[1] === 'number') {
    const id = sheet?.blocks[path[1]]?.id;
    return [id ? `block ${id}` : `block #${path[1] + 1}`, ...path.slice(2).map(segment)].join(' › ');
  }
  if (path[0] === 'connections' && typeof path[1] === 'number') {
    const id = sheet?.connections[path[1]]?.id;
    return [id ? `wire ${id}` : `wire #${path[1] + 1}`, ...path.slice(2).map(segment)].join(' › ');
  }
  return ['sheet', ...path.map(segment)].join(' › ');
}

/** The rows of the problem list, in the engine's order. */
export function exchangeProblemRows(problems: readonly Problem[], sheet?: Pick<Sheet, 'blocks' | 'connections'>): ExchangeProblemRow[] {
  return problems.map((p) => ({ where: problemWhere(p.path, sheet), message: p.message, code: p.code }));
}
