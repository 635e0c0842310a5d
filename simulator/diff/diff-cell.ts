/**
 * `diffCells(base, proposed)`: the structural diff of two cell documents for a changeover.
 * Each area has its own small function; this file holds the entry point and the areas that
 * are plain lists of things (devices, modules, wiring) or plain fields (cell).
 */
import type { CellDocument, ControllerModule, FieldDevice, PanelDevice, PlcModule, WiringRow } from '@/simulator/schema/cell-document';
import { collapseToTop, diffFields, diffKeyed } from './delta';
import { keyedEntries, splitPositionMove } from './entries';
import { diffHandshake, diffPointMap } from './diff-controller';
import { diffLogic } from './diff-logic';
import { diffRoutine } from './diff-routine';
import { describeChange, describeChanges, formatEndpoint } from './format';
import { DIFF_FORMAT_VERSION, summarise, type CellDiff, type DiffEntry, type WireEndChange } from './types';

/**
 * The document's own fields and the scalar settings of its parts: everything that is not a
 * list of things with ids (those have their own areas). Paths are real document paths.
 */
function cellFields(d: CellDocument) {
  const c = d.controller;
  return {
    schemaVersion: d.schemaVersion,
    id: d.id,
    name: d.name,
    description: d.description,
    seed: d.seed,
    link: d.link,
    plc: { sheet: { scanPeriodMs: d.plc.sheet.scanPeriodMs } },
    controller: {
      axes: c.axes,
      bootMs: c.bootMs,
      ioRefreshMs: c.ioRefreshMs,
      stopCategory: c.stopCategory,
      homePose: c.homePose,
      positionTolerance: c.positionTolerance,
      cycleDonePulseMs: c.cycleDonePulseMs,
    },
    initial: d.initial,
  };
}

/**
 * The document path of a dotted field path. Device ids may contain dots (`guard.2`), so under
 * `initial.devices` the id is matched against the devices the two documents list there.
 */
function documentPath(path: string, deviceIds: readonly string[]): string[] {
  const prefix = 'initial.devices.';
  if (!path.startsWith(prefix)) return path.split('.');
  const rest = path.slice(prefix.length);
  const id = deviceIds.filter((d) => rest === d || rest.startsWith(`${d}.`)).sort((x, y) => y.length - x.length)[0];
  if (id === undefined) return path.split('.');
  const tail = rest.slice(id.length + 1);
  return ['initial', 'devices', id, ...(tail ? tail.split('.') : [])];
}

function diffCellFields(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const deviceIds = [...Object.keys(base.initial.devices ?? {}), ...Object.keys(proposed.initial.devices ?? {})];
  return diffFields(cellFields(base), cellFields(proposed)).map((c) => ({
    area: 'cell',
    kind: c.from === undefined ? 'added' : c.to === undefined ? 'removed' : 'changed',
    target: 'cell-field',
    id: c.path,
    importance: 'high',
    path: documentPath(c.path, deviceIds),
    changes: [c],
    detail: describeChange(c),
  }));
}

function deviceText(d: PanelDevice | FieldDevice): string {
  const extras = ['contact' in d ? d.contact : '', 'colour' in d ? d.colour : '', 'output' in d ? d.output : ''].filter(Boolean);
  return `${d.type} "${d.label}"${extras.length > 0 ? ` (${extras.join(', ')})` : ''}`;
}

function diffDevices(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const panel = keyedEntries(diffKeyed(base.panel, proposed.panel, (d) => d.id), {
    area: 'devices',
    target: 'panel-device',
    noun: 'panel device',
    id: (d) => d.id,
    path: (i) => ['panel', i],
    text: deviceText,
    changed: (pair, common) => splitPositionMove(pair, common, 'panel device', 'on the front plate', (edits) => `panel device ${common.id}: ${describeChanges(edits)}`),
  });
  const field = keyedEntries(diffKeyed(base.field, proposed.field, (d) => d.id), {
    area: 'devices',
    target: 'field-device',
    noun: 'field device',
    id: (d) => d.id,
    path: (i) => ['field', i],
    text: deviceText,
  });
  return [...panel, ...field];
}

function plcModuleText(m: PlcModule): string {
  return `${m.kind} at byte ${m.address}, ${m.channels} channels`;
}

function controllerModuleText(m: ControllerModule): string {
  return `${m.type} in rack ${m.rack} / slot ${m.slot}, ${m.channels} channels`;
}

function diffModules(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const plc = keyedEntries(diffKeyed(base.plc.modules, proposed.plc.modules, (m) => m.id), {
    area: 'modules',
    target: 'plc-module',
    noun: 'PLC module',
    id: (m) => m.id,
    path: (i) => ['plc', 'modules', i],
    text: plcModuleText,
  });
  const controller = keyedEntries(diffKeyed(base.controller.modules, proposed.controller.modules, (m) => m.id), {
    area: 'modules',
    target: 'controller-module',
    noun: 'controller module',
    id: (m) => m.id,
    path: (i) => ['controller', 'modules', i],
    text: controllerModuleText,
  });
  return [...plc, ...controller];
}

function wireText(r: WiringRow): string {
  return `${formatEndpoint(r.from)} → ${formatEndpoint(r.to)}${r.bits !== undefined ? ` (${r.bits} bits)` : ''}${r.label ? ` "${r.label}"` : ''}`;
}

function diffWiring(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  return keyedEntries(diffKeyed(base.wiring, proposed.wiring, (r) => r.id), {
    area: 'wiring',
    target: 'wire',
    noun: 'wire',
    id: (r) => r.id,
    path: (i) => ['wiring', i],
    text: wireText,
    changed: (pair, common) => {
      // A wire end is one terminal: report it whole, even when it changed kind (PLC → controller).
      const changes = collapseToTop(pair.changes, pair.base.item, pair.proposed.item);
      const ends: WireEndChange[] = changes
        .filter((c) => c.path === 'from' || c.path === 'to')
        .map((c) => ({ end: c.path as 'from' | 'to', was: pair.base.item[c.path as 'from' | 'to'], now: pair.proposed.item[c.path as 'from' | 'to'] }));
      const words = [
        ...ends.map((e) => `${e.end} ${formatEndpoint(e.was)} → ${formatEndpoint(e.now)}`),
        ...changes.filter((c) => c.path !== 'from' && c.path !== 'to').map(describeChange),
      ];
      return [{ ...common, kind: 'changed', changes, ...(ends.length > 0 ? { ends } : {}), detail: `wire ${common.id}${ends.length > 0 ? ' moved' : ''}: ${words.join('; ')}` }];
    },
  });
}

/**
 * The structural diff of two cell documents: entries grouped by area (cell fields, devices,
 * modules, wiring, point map, logic sheet, routine, handshake), each with its kind, a detail
 * line, the changed fields, the thing's id and its path in the document, plus a summary of
 * counts per area. Lists of things with ids are diffed by id with jsondiffpatch, so the order
 * of a list never shows up as a change; the routine is diffed as an ordered list.
 *
 * Pass documents as parsed by `cellDocumentSchema` (defaults applied), so a default written out
 * on one side and omitted on the other is not reported. Pure and deterministic: the same two
 * documents always give the same diff, with entries in a fixed order.
 */
export function diffCells(base: CellDocument, proposed: CellDocument): CellDiff {
  const areas = {
    cell: diffCellFields(base, proposed),
    devices: diffDevices(base, proposed),
    modules: diffModules(base, proposed),
    wiring: diffWiring(base, proposed),
    pointMap: diffPointMap(base, proposed),
    logic: diffLogic(base, proposed),
    routine: diffRoutine(base, proposed),
    handshake: diffHandshake(base, proposed),
  };
  return {
    version: DIFF_FORMAT_VERSION,
    base: { id: base.id, name: base.name },
    proposed: { id: proposed.id, name: proposed.name },
    areas,
    summary: summarise(areas),
  };
}
