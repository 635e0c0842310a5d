/**
 * The I/O-list change sheet of a changeover: what electricians re-terminate, one row per
 * point, wire end or card, as rows and as CSV (papaparse). Derived from a diff and the two
 * documents it was made from.
 *
 * Point rows compare logical points (`DI4`) across whole maps rather than row by row, so a
 * point that moved from one point-map row to another is one `move`, not a remove and an add.
 */
import Papa from 'papaparse';
import { resolvePhysical, resolvePointMap, type ResolvedPoint, type ResolvedPointMap } from '@/simulator/controller/point-map';
import type { CellDocument, ControllerModule, Endpoint, PlcModule, PointFamily, PointMapRow, WiringRow } from '@/simulator/schema/cell-document';
import { byCodeUnits } from './delta';
import { formatEndpoint } from './format';
import type { CellDiff, DiffEntry } from './types';

/** What an electrician does on a row: add / remove a termination, move it, relabel it, change its invert. */
export type IoChangeAction = 'add' | 'remove' | 'move' | 'relabel' | 'invert';

/** One row of the change sheet. Text cells only, ready for a table or CSV. */
export type IoChangeRow = {
  action: IoChangeAction;
  /** Controller point (`DI4`), PLC address or channel of a wire (`%IX0.7`), or a module id. */
  point: string;
  /** The point's label (proposed side, base when removed), a wire's label or device, a module's type. */
  label: string;
  /** Old location: `rack 0 / slot 1 / ch 3`, a terminal, an old label ...; empty when added. */
  was: string;
  /** New location; empty when removed. */
  now: string;
  /** For point rows: `live`, or `staged` (takes effect at the controller restart); else empty. */
  map: 'live' | 'staged' | '';
  /** Wiring row id for wire rows; empty otherwise. */
  wire: string;
  /** The diff entry the row comes from: `pointMap:<row>`, `wiring:<id>`, `modules:<id>`. */
  source: string;
};

/** Column headings of the CSV, in column order. */
export const IO_CHANGE_COLUMNS: readonly { key: keyof IoChangeRow; title: string }[] = [
  { key: 'action', title: 'Action' },
  { key: 'point', title: 'Point / address' },
  { key: 'label', title: 'Label' },
  { key: 'was', title: 'Was' },
  { key: 'now', title: 'Now' },
  { key: 'map', title: 'Map' },
  { key: 'wire', title: 'Wire' },
  { key: 'source', title: 'Source' },
];

/** The change sheet as rows and as CSV text. */
export type IoChangeSheet = { rows: IoChangeRow[]; csv: string };

/**
 * Spreadsheet formula injection (OWASP "CSV injection", common practice): a cell that starts
 * with `=`, `+`, `-`, `@`, a tab or a carriage return is prefixed with `'` so a spreadsheet
 * shows it as text. The same rule as the gradebook export (lib/drills/gradebook.ts); it is
 * written here because the engine may not import lib/ (ESLint boundary: simulator/ also runs
 * in the browser worker and the headless CLI). lib/ may import this one from simulator/.
 */
export function neutraliseCsvCell(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** Rows as CSV (papaparse), every cell neutralised; CRLF after every line, the last one too (RFC 4180). */
export function ioChangeCsv(rows: readonly IoChangeRow[]): string {
  const text = Papa.unparse({
    fields: IO_CHANGE_COLUMNS.map((c) => neutraliseCsvCell(c.title)),
    data: rows.map((r) => IO_CHANGE_COLUMNS.map((c) => neutraliseCsvCell(r[c.key]))),
  });
  // papaparse ends a header-only sheet with a line break but not one with rows: make it one way.
  return text.endsWith('\r\n') ? text : `${text}\r\n`;
}

const FAMILY_ORDER: readonly PointFamily[] = ['DI', 'DO', 'AI', 'AO', 'WI', 'WO', 'TI', 'TO'];

function refOrder(a: ResolvedPoint, b: ResolvedPoint): number {
  return FAMILY_ORDER.indexOf(a.family) - FAMILY_ORDER.indexOf(b.family) || a.index - b.index;
}

function location(p: ResolvedPoint): string {
  const ch = p.bits > 1 ? `ch ${p.channel}–${p.channel + p.bits - 1}` : `ch ${p.channel}`;
  return `rack ${p.rack} / slot ${p.slot} / ${ch}`;
}

function pointRows(base: readonly PointMapRow[], proposed: readonly PointMapRow[], map: 'live' | 'staged'): IoChangeRow[] {
  const a = resolvePointMap(base).byRef;
  const b = resolvePointMap(proposed).byRef;
  const all = [...new Map([...a, ...b].map(([ref]) => [ref, (b.get(ref) ?? a.get(ref))!])).values()].sort(refOrder);
  const rows: IoChangeRow[] = [];
  for (const p of all) {
    const was = a.get(p.ref);
    const now = b.get(p.ref);
    const row = (action: IoChangeAction, from: string, to: string): IoChangeRow => ({ action, point: p.ref, label: (now ?? was)!.label, was: from, now: to, map, wire: '', source: `pointMap:${(now ?? was)!.rowId}` });
    if (!was) rows.push(row('add', '', location(now!)));
    else if (!now) rows.push(row('remove', location(was), ''));
    else {
      if (location(was) !== location(now)) rows.push(row('move', location(was), location(now)));
      if (was.label !== now.label) rows.push(row('relabel', was.label, now.label));
      if (was.invert !== now.invert) rows.push(row('invert', was.invert ? 'inverted' : 'not inverted', now.invert ? 'inverted' : 'not inverted'));
    }
  }
  return rows;
}

/** The address an electrician looks for on a wire: its PLC end, else its controller end, else a terminal. */
function wireAddress(r: WiringRow): string {
  const ends: Endpoint[] = [r.to, r.from];
  const plc = ends.find((e) => 'plc' in e);
  const ctl = ends.find((e) => 'controller' in e);
  return formatEndpoint(plc ?? ctl ?? r.from);
}

/** A wire's own label, else its device's label, else the label of the controller point on its channel. */
function wireLabel(r: WiringRow, doc: CellDocument, map: ResolvedPointMap): string {
  if (r.label) return r.label;
  const dev = [r.from, r.to].find((e): e is Extract<Endpoint, { device: string }> => 'device' in e);
  if (dev) return [...doc.panel, ...doc.field].find((x) => x.id === dev.device)?.label ?? dev.device;
  const ctl = [r.from, r.to].find((e): e is Extract<Endpoint, { controller: unknown }> => 'controller' in e);
  if (!ctl) return '';
  const { rack, slot, channel } = ctl.controller;
  const ref = resolvePhysical(map, rack, slot, channel)[0];
  return ref ? map.byRef.get(ref)!.label : '';
}

function wireText(r: WiringRow): string {
  return `${formatEndpoint(r.from)} → ${formatEndpoint(r.to)}${r.bits !== undefined ? ` (${r.bits} bits)` : ''}`;
}

type Side = { doc: CellDocument; map: ResolvedPointMap };

function wireRows(e: DiffEntry, base: Side, proposed: Side): IoChangeRow[] {
  const common = { map: '' as const, wire: e.id, source: `wiring:${e.id}` };
  if (e.kind === 'added' || e.kind === 'removed') {
    const r = e.value as WiringRow;
    const side = e.kind === 'added' ? proposed : base;
    const text = wireText(r);
    return [{ action: e.kind === 'added' ? 'add' : 'remove', point: wireAddress(r), label: wireLabel(r, side.doc, side.map), was: e.kind === 'added' ? '' : text, now: e.kind === 'added' ? text : '', ...common }];
  }
  const was = base.doc.wiring.find((r) => r.id === e.id);
  const now = proposed.doc.wiring.find((r) => r.id === e.id);
  if (!was || !now) return [];
  const rows: IoChangeRow[] = [];
  const label = wireLabel(now, proposed.doc, proposed.map);
  for (const end of e.ends ?? []) {
    rows.push({ action: 'move', point: wireAddress(now), label, was: `${end.end} ${formatEndpoint(end.was)}`, now: `${end.end} ${formatEndpoint(end.now)}`, ...common });
  }
  if (was.bits !== now.bits) rows.push({ action: 'move', point: wireAddress(now), label, was: wireText(was), now: wireText(now), ...common });
  if ((was.label ?? '') !== (now.label ?? '')) rows.push({ action: 'relabel', point: wireAddress(now), label, was: was.label ?? '', now: now.label ?? '', ...common });
  return rows;
}

type AnyModule = PlcModule | ControllerModule;

function moduleWhere(m: AnyModule): string {
  return 'address' in m ? `byte ${m.address}` : `rack ${m.rack} / slot ${m.slot}`;
}

function moduleKind(m: AnyModule): string {
  return 'kind' in m ? `PLC ${m.kind}` : `controller ${m.type}`;
}

function moduleRows(e: DiffEntry, base: CellDocument, proposed: CellDocument): IoChangeRow[] {
  const common = { map: '' as const, wire: '', source: `modules:${e.id}` };
  if (e.kind === 'added' || e.kind === 'removed') {
    const m = e.value as AnyModule;
    return [{ action: e.kind === 'added' ? 'add' : 'remove', point: e.id, label: moduleKind(m), was: e.kind === 'added' ? '' : moduleWhere(m), now: e.kind === 'added' ? moduleWhere(m) : '', ...common }];
  }
  const lists: [readonly AnyModule[], readonly AnyModule[]] =
    e.target === 'plc-module' ? [base.plc.modules, proposed.plc.modules] : [base.controller.modules, proposed.controller.modules];
  const was = lists[0].find((m) => m.id === e.id);
  const now = lists[1].find((m) => m.id === e.id);
  // Only a card that now sits elsewhere is re-terminated; other card edits are in the diff.
  if (!was || !now || moduleWhere(was) === moduleWhere(now)) return [];
  return [{ action: 'move', point: e.id, label: moduleKind(now), was: moduleWhere(was), now: moduleWhere(now), ...common }];
}

/**
 * The I/O-list change sheet for a diff made by `diffCells(base, proposed)`: controller points
 * added, removed, moved (rack / slot / channel), relabelled or with their invert changed
 * (live map, and the staged map when one is staged); wire ends moved, wires added or removed;
 * cards added, removed or moved. Rows come in that order (points by family and number, wires
 * and cards by id), with the CSV of the same rows.
 */
export function ioChangeSheet(diff: CellDiff, base: CellDocument, proposed: CellDocument): IoChangeSheet {
  const rows: IoChangeRow[] = [];
  const pm = diff.areas.pointMap;
  if (pm.some((e) => e.map === 'live')) rows.push(...pointRows(base.controller.pointMap, proposed.controller.pointMap, 'live'));
  if (pm.some((e) => e.map === 'staged')) {
    // A staged row the live rows already list (the same edit made live and staged) is not repeated.
    const seen = new Set(rows.map((r) => `${r.action}|${r.point}|${r.was}|${r.now}`));
    const staged = pointRows(base.controller.staged ?? base.controller.pointMap, proposed.controller.staged ?? proposed.controller.pointMap, 'staged');
    rows.push(...staged.filter((r) => !seen.has(`${r.action}|${r.point}|${r.was}|${r.now}`)));
  }
  const wires = diff.areas.wiring.filter((e) => e.target === 'wire').sort((x, y) => byCodeUnits(x.id, y.id));
  if (wires.length > 0) {
    const a = { doc: base, map: resolvePointMap(base.controller.pointMap) };
    const b = { doc: proposed, map: resolvePointMap(proposed.controller.pointMap) };
    for (const e of wires) rows.push(...wireRows(e, a, b));
  }
  for (const e of diff.areas.modules) rows.push(...moduleRows(e, base, proposed));
  return { rows, csv: ioChangeCsv(rows) };
}
