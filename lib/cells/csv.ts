/**
 * CSV for the controller's point map and the cell's I/O list (wiring rows), read and written
 * with papaparse. Formats: docs/csv-formats.md. Parsing never stops at the first bad row:
 * every row is checked and every problem comes back with its row number (the header is row 1,
 * as a spreadsheet numbers it), its column and a message. Pure: no database, no Next.js.
 */
import Papa from 'papaparse';
import { csvCellFromFile, csvSafeCell } from '@/lib/csv-cell';
import type { CellDocument, PointMapRow, Problem, WiringRow } from '@/simulator';
import { CELL_LIMITS, cellDocumentSchema, resolvePointMap } from '@/simulator';
import type { CsvKind } from '@/lib/schemas/cells';

/** The schemas of one point-map row and one wiring row, as the cell document holds them. */
const pointMapRowSchema = cellDocumentSchema.shape.controller.shape.pointMap.element;
const wiringRowSchema = cellDocumentSchema.shape.wiring.element;

/** One problem in an uploaded CSV. `column` is '' when the problem is the whole row or file. */
export interface CsvRowError {
  row: number;
  column: string;
  message: string;
}

/**
 * The rows that parsed (with the file row each came from) and the errors of those that did
 * not. Both are returned so the document's cross-checks can still run on the good rows and
 * a file's every problem is reported in one answer.
 */
export interface CsvParse<T> {
  rows: T[];
  rowNumbers: number[];
  errors: CsvRowError[];
}

export const POINT_MAP_COLUMNS = ['row_id', 'family', 'first_point', 'count', 'rack', 'slot', 'first_channel', 'bits', 'encoding', 'labels', 'invert'] as const;
export const IO_LIST_COLUMNS = ['wire_id', 'from', 'to', 'bits', 'description'] as const;
const REQUIRED: Record<CsvKind, readonly string[]> = {
  'point-map': ['family', 'first_point', 'count', 'rack', 'slot', 'first_channel'],
  'io-list': ['from', 'to'],
};
export const CSV_COLUMNS: Record<CsvKind, readonly string[]> = { 'point-map': POINT_MAP_COLUMNS, 'io-list': IO_LIST_COLUMNS };

/** Row number of the i-th data record (0-based): the header is row 1. */
const rowNumber = (i: number) => i + 2;

/** Separator of list cells (labels, invert); a literal bar inside a label is written `\|`. */
const LIST_SEP = /(?<!\\)\|/;
const splitList = (cell: string): string[] => (cell === '' ? [] : cell.split(LIST_SEP).map((s) => s.replace(/\\\|/g, '|').trim()));
const joinList = (items: string[]): string => items.map((s) => s.replace(/\|/g, '\\|')).join('|');

function toCsv(columns: readonly string[], rows: Record<string, string | number>[]): string {
  // CRLF line ends: RFC 4180, and what spreadsheet programs write.
  const cell = (v: string | number | undefined) => (typeof v === 'string' ? csvSafeCell(v) : (v ?? ''));
  return Papa.unparse({ fields: [...columns], data: rows.map((r) => columns.map((c) => cell(r[c]))) }, { newline: '\r\n' }) + '\r\n';
}

/** Most problems an import reports; the rest are counted (MAX_REPORTED_PROBLEMS, route docs). */
export const MAX_REPORTED_PROBLEMS = 100;

/**
 * Reads the CSV text into records keyed by lower-cased header; header problems are row 1.
 * Parsing stops one record past `maxRows`: a file longer than the document allows is refused
 * at that row without reading the rest.
 */
function readRecords(text: string, kind: CsvKind, maxRows: number): { records: Record<string, string>[]; errors: CsvRowError[] } {
  const errors: CsvRowError[] = [];
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    preview: maxRows + 1,
    transformHeader: (h) => h.trim().toLowerCase(),
    transform: (v) => csvCellFromFile(v.trim()),
  });
  if (parsed.data.length > maxRows) {
    errors.push({ row: rowNumber(maxRows), column: '', message: `at most ${maxRows} rows; the file has more, and nothing after row ${rowNumber(maxRows - 1)} was read` });
    parsed.data.length = maxRows;
  }
  const fields = (parsed.meta.fields ?? []).filter((f) => f !== '');
  const known = new Set(CSV_COLUMNS[kind]);
  for (const f of fields) if (!known.has(f)) errors.push({ row: 1, column: f, message: `unknown column "${f}"; the columns are ${CSV_COLUMNS[kind].join(', ')}` });
  for (const r of REQUIRED[kind]) if (!fields.includes(r)) errors.push({ row: 1, column: r, message: `the column "${r}" is missing` });
  for (const e of parsed.errors) {
    // Field-count mismatches are reported per row; papaparse's row index counts data records from 0.
    errors.push({ row: e.row !== undefined ? rowNumber(e.row) : 1, column: '', message: e.message });
  }
  if (parsed.data.length === 0 && errors.length === 0) errors.push({ row: 2, column: '', message: 'the file has a header but no rows' });
  return { records: parsed.data, errors };
}

function intCell(rec: Record<string, string>, column: string, row: number, errors: CsvRowError[], opts: { optional?: boolean } = {}): number | undefined {
  const raw = rec[column] ?? '';
  if (raw === '') {
    if (!opts.optional) errors.push({ row, column, message: 'a whole number is required' });
    return undefined;
  }
  if (!/^-?\d+$/.test(raw)) {
    errors.push({ row, column, message: `"${raw}" is not a whole number` });
    return undefined;
  }
  return Number(raw);
}

/** Column of the CSV that a path inside a point-map row points at. */
const POINT_MAP_FIELD_COLUMN: Record<string, string> = {
  id: 'row_id',
  family: 'family',
  first: 'first_point',
  count: 'count',
  rack: 'rack',
  slot: 'slot',
  firstChannel: 'first_channel',
  bits: 'bits',
  encoding: 'encoding',
  points: 'labels',
};
const IO_FIELD_COLUMN: Record<string, string> = { id: 'wire_id', from: 'from', to: 'to', bits: 'bits', label: 'description' };

/** Parses a point-map CSV into rows the document schema accepts (shape only; cross-checks come later). */
export function parsePointMapCsv(text: string): CsvParse<PointMapRow> {
  const { records, errors } = readRecords(text, 'point-map', CELL_LIMITS.pointMapRows);
  const rows: PointMapRow[] = [];
  const rowNumbers: number[] = [];
  const usedIds = new Set<string>();
  records.forEach((rec, i) => {
    const row = rowNumber(i);
    const before = errors.length;
    const family = (rec.family ?? '').toUpperCase();
    const first = intCell(rec, 'first_point', row, errors);
    const count = intCell(rec, 'count', row, errors);
    const rack = intCell(rec, 'rack', row, errors);
    const slot = intCell(rec, 'slot', row, errors);
    const firstChannel = intCell(rec, 'first_channel', row, errors);
    const bits = intCell(rec, 'bits', row, errors, { optional: true });
    const encoding = (rec.encoding ?? '').toLowerCase();
    const labels = splitList(rec.labels ?? '');
    const invertRaw = splitList(rec.invert ?? '');
    const inverted = new Set<number>();
    for (const v of invertRaw) {
      if (!/^\d+$/.test(v)) errors.push({ row, column: 'invert', message: `"${v}" is not a point number` });
      else if (first !== undefined && count !== undefined && (Number(v) < first || Number(v) >= first + count)) {
        errors.push({ row, column: 'invert', message: `point ${v} is not among points ${first}..${first + count - 1} of this row` });
      } else inverted.add(Number(v));
    }
    if (count !== undefined && labels.length > count) errors.push({ row, column: 'labels', message: `${labels.length} labels for ${count} points` });
    if (errors.length > before) return;

    const id = rec.row_id || `pm-${family.toLowerCase()}-${first}`;
    let points: PointMapRow['points'];
    const span = Math.max(labels.length, ...[...inverted].map((p) => p - first! + 1), 0);
    if (span > 0) {
      points = Array.from({ length: span }, (_, k) => {
        const p: { label?: string; invert?: boolean } = {};
        if (labels[k]) p.label = labels[k];
        if (inverted.has(first! + k)) p.invert = true;
        return p;
      });
    }
    const candidate = {
      id,
      family,
      first,
      count,
      rack,
      slot,
      firstChannel,
      ...(bits !== undefined ? { bits } : {}),
      ...(encoding !== '' ? { encoding } : {}),
      ...(points ? { points } : {}),
    };
    const parsed = pointMapRowSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const key = String(issue.path[0] ?? '');
        errors.push({ row, column: POINT_MAP_FIELD_COLUMN[key] ?? '', message: issue.message });
      }
      return;
    }
    if (usedIds.has(parsed.data.id)) errors.push({ row, column: 'row_id', message: `row id "${parsed.data.id}" appears twice in the file` });
    usedIds.add(parsed.data.id);
    rows.push(parsed.data);
    rowNumbers.push(row);
  });
  return { rows, rowNumbers, errors: sortErrors(errors) };
}

type Endpoint = WiringRow['from'];

const CHANNEL_TEXT = /^r(\d+)\/s(\d+)\/c(\d+)$/i;
const POINT_TEXT = /^(DI|DO|AI|AO|WI|WO|TI|TO)[1-9]\d{0,3}$/i;

/** Text form of a wiring endpoint: `device:terminal`, a PLC address, or `R<rack>/S<slot>/C<channel>`. */
export function endpointText(e: Endpoint): string {
  if ('device' in e) return `${e.device}:${e.terminal}`;
  if ('plc' in e) return e.plc;
  return `R${e.controller.rack}/S${e.controller.slot}/C${e.controller.channel}`;
}

/**
 * Reads an endpoint cell. A controller point (`DI5`) is accepted too and resolved through
 * the cell's live point map to its channel, because an I/O list usually names points.
 */
function parseEndpoint(text: string, doc: CellDocument): { ok: true; value: Endpoint } | { ok: false; message: string } {
  if (text === '') return { ok: false, message: 'an endpoint is required (device:terminal, a PLC address, R<rack>/S<slot>/C<channel> or a controller point)' };
  let candidate: unknown;
  const ch = CHANNEL_TEXT.exec(text);
  if (text.startsWith('%')) candidate = { plc: text.toUpperCase() };
  else if (ch) candidate = { controller: { rack: Number(ch[1]), slot: Number(ch[2]), channel: Number(ch[3]) } };
  else if (POINT_TEXT.test(text)) {
    const p = resolvePointMap(doc.controller.pointMap).byRef.get(text.toUpperCase());
    if (!p) return { ok: false, message: `${text.toUpperCase()} is not mapped by the cell's live point map` };
    candidate = { controller: { rack: p.rack, slot: p.slot, channel: p.channel } };
  } else if (text.includes(':')) {
    const at = text.indexOf(':');
    candidate = { device: text.slice(0, at), terminal: text.slice(at + 1) };
  } else return { ok: false, message: `"${text}" is not an endpoint (device:terminal, a PLC address such as %IX0.0, R1/S2/C4 or a point such as DI5)` };
  const parsed = wiringRowSchema.shape.from.safeParse(candidate);
  if (!parsed.success) return { ok: false, message: `"${text}": ${parsed.error.issues.map((i) => i.message).join('; ')}` };
  return { ok: true, value: parsed.data };
}

/** Parses an I/O-list CSV into wiring rows (shape only; the document's cross-checks come later). */
export function parseIoListCsv(text: string, doc: CellDocument): CsvParse<WiringRow> {
  const { records, errors } = readRecords(text, 'io-list', CELL_LIMITS.wiringRows);
  const rows: WiringRow[] = [];
  const rowNumbers: number[] = [];
  const usedIds = new Set<string>();
  records.forEach((rec, i) => {
    const row = rowNumber(i);
    const before = errors.length;
    const from = parseEndpoint(rec.from ?? '', doc);
    if (!from.ok) errors.push({ row, column: 'from', message: from.message });
    const to = parseEndpoint(rec.to ?? '', doc);
    if (!to.ok) errors.push({ row, column: 'to', message: to.message });
    const bits = intCell(rec, 'bits', row, errors, { optional: true });
    if (errors.length > before || !from.ok || !to.ok) return;
    const candidate = {
      id: rec.wire_id || `w-${i + 1}`,
      from: from.value,
      to: to.value,
      ...(bits !== undefined ? { bits } : {}),
      ...(rec.description ? { label: rec.description } : {}),
    };
    const parsed = wiringRowSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) errors.push({ row, column: IO_FIELD_COLUMN[String(issue.path[0] ?? '')] ?? '', message: issue.message });
      return;
    }
    if (usedIds.has(parsed.data.id)) errors.push({ row, column: 'wire_id', message: `wire id "${parsed.data.id}" appears twice in the file` });
    usedIds.add(parsed.data.id);
    rows.push(parsed.data);
    rowNumbers.push(row);
  });
  return { rows, rowNumbers, errors: sortErrors(errors) };
}

/**
 * Turns the document's own problems about imported rows (paths under `prefix`, e.g.
 * `['controller', 'staged']` or `['wiring']`) into row errors, `rowNumbers[i]` being the file
 * row of the i-th imported row; problems elsewhere are ignored.
 */
export function problemsToRowErrors(problems: readonly Problem[], prefix: readonly (string | number)[], kind: CsvKind, rowNumbers: readonly number[]): CsvRowError[] {
  const columns = kind === 'point-map' ? POINT_MAP_FIELD_COLUMN : IO_FIELD_COLUMN;
  const out: CsvRowError[] = [];
  for (const p of problems) {
    if (p.path.length <= prefix.length || !prefix.every((seg, k) => p.path[k] === seg)) continue;
    const index = p.path[prefix.length];
    if (typeof index !== 'number') continue;
    out.push({ row: rowNumbers[index] ?? rowNumber(index), column: columns[String(p.path[prefix.length + 1] ?? '')] ?? '', message: p.message });
  }
  return sortErrors(out);
}

/** Errors in file order (stable within a row: the order they were found). */
export function sortErrors(errors: CsvRowError[]): CsvRowError[] {
  return [...errors].sort((a, b) => a.row - b.row);
}

/** The first MAX_REPORTED_PROBLEMS errors (in file order) and how many there were in all. */
export function firstProblems(errors: readonly CsvRowError[]): { shown: CsvRowError[]; total: number } {
  return { shown: errors.slice(0, MAX_REPORTED_PROBLEMS), total: errors.length };
}

/** Row errors as the API's field errors: key `rows.<row>.<column>` (`_` for the whole row). */
export function rowErrorsToFields(errors: readonly CsvRowError[]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const e of errors) (out[`rows.${e.row}.${e.column || '_'}`] ??= []).push(e.message);
  return out;
}

/** Point-map rows as CSV. `staged` writes the staged rows when there are any (what a restart would make live). */
export function pointMapToCsv(rows: readonly PointMapRow[]): string {
  return toCsv(
    POINT_MAP_COLUMNS,
    rows.map((r) => ({
      row_id: r.id,
      family: r.family,
      first_point: r.first,
      count: r.count,
      rack: r.rack,
      slot: r.slot,
      first_channel: r.firstChannel,
      bits: r.bits ?? '',
      encoding: r.encoding ?? '',
      labels: joinList((r.points ?? []).map((p) => p.label ?? '')).replace(/\|+$/, ''),
      invert: (r.points ?? []).flatMap((p, k) => (p.invert ? [String(r.first + k)] : [])).join('|'),
    })),
  );
}

/** Wiring rows as an I/O-list CSV. */
export function ioListToCsv(rows: readonly WiringRow[]): string {
  return toCsv(
    IO_LIST_COLUMNS,
    rows.map((r) => ({ wire_id: r.id, from: endpointText(r.from), to: endpointText(r.to), bits: r.bits ?? '', description: r.label ?? '' })),
  );
}

/** A template file: the header and example rows that show every column's notation. */
export function csvTemplate(kind: CsvKind): string {
  if (kind === 'point-map') {
    return toCsv(POINT_MAP_COLUMNS, [
      { row_id: 'pm-di', family: 'DI', first_point: 1, count: 4, rack: 1, slot: 2, first_channel: 0, bits: '', encoding: '', labels: 'Start|Stop request|Fault reset|Guard closed', invert: '' },
      { row_id: 'pm-wi', family: 'WI', first_point: 1, count: 1, rack: 1, slot: 2, first_channel: 8, bits: 4, encoding: 'binary', labels: 'Recipe number', invert: '' },
      { row_id: 'pm-do', family: 'DO', first_point: 1, count: 3, rack: 1, slot: 3, first_channel: 0, bits: '', encoding: '', labels: 'Ready|Cycling|Fault', invert: '3' },
    ]);
  }
  return toCsv(IO_LIST_COLUMNS, [
    { wire_id: 'w-start', from: 'start:contact', to: '%IX0.0', bits: '', description: 'Cycle start button to PLC' },
    { wire_id: 'l-start', from: '%QX0.0', to: 'R1/S2/C0', bits: '', description: 'PLC start request to controller' },
    { wire_id: 'l-recipe', from: '%QW2', to: 'R1/S2/C8', bits: 4, description: 'Recipe number, 4 bits' },
    { wire_id: 'l-ready', from: 'DO1', to: '%IX1.0', bits: '', description: 'Controller ready to PLC (point resolved through the live point map)' },
  ]);
}
