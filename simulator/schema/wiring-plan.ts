/**
 * Resolves each terminal-strip row into a typed source and sink, or the problems that make
 * it unusable. Validation reports the problems; the cell runs the plans.
 */
import { parseAddress, type Address } from '@/simulator/address/address';
import type { Problem } from '@/simulator/shared/result';
import type { CellDocument, ControllerModule, Endpoint, FieldDevice, PanelDevice, PlcModule, WiringRow } from './cell-document';
import { deviceTerminals, type TerminalKind } from './terminals';
import { plcModuleFor } from './plc-io';

/** Where a row's signal comes from. */
export type RowSource =
  | { kind: 'device'; device: PanelDevice | FieldDevice; terminal: string; terminalKind: TerminalKind }
  | { kind: 'plc-bit'; address: Address; text: string; module: PlcModule; channel: number }
  | { kind: 'plc-word'; address: Address; text: string; module: PlcModule; channel: number }
  | { kind: 'controller'; rack: number; slot: number; channel: number; module: ControllerModule };

/** Where a row's signal goes. */
export type RowSink =
  | { kind: 'device'; device: PanelDevice | FieldDevice; terminal: string; terminalKind: TerminalKind }
  | { kind: 'plc-bit'; address: Address; text: string; module: Extract<PlcModule, { kind: 'digital-in' }>; channel: number }
  | { kind: 'plc-word-bits'; address: Address; text: string; module: Extract<PlcModule, { kind: 'digital-in' }>; channel: number }
  | { kind: 'plc-analog'; address: Address; text: string; module: Extract<PlcModule, { kind: 'analog-in' }>; channel: number }
  | { kind: 'controller'; rack: number; slot: number; channel: number; module: ControllerModule };

/** A usable row: what it connects, how many channels it spans, and whether it is part of the PLC–controller link. */
export type RowPlan = { row: WiringRow; index: number; source: RowSource; sink: RowSink; bits: number; isLink: boolean };

type Lookups = {
  devices: Map<string, PanelDevice | FieldDevice>;
  ctlModules: Map<string, ControllerModule>;
};

/** Builds the id and rack/slot lookups a plan needs. */
export function wiringLookups(doc: CellDocument): Lookups {
  const devices = new Map<string, PanelDevice | FieldDevice>();
  for (const d of doc.panel) if (!devices.has(d.id)) devices.set(d.id, d);
  for (const d of doc.field) if (!devices.has(d.id)) devices.set(d.id, d);
  const ctlModules = new Map<string, ControllerModule>();
  for (const m of doc.controller.modules) if (!ctlModules.has(`${m.rack}.${m.slot}`)) ctlModules.set(`${m.rack}.${m.slot}`, m);
  return { devices, ctlModules };
}

const CTL_INPUT_TYPES = new Set<ControllerModule['type']>(['digital-in', 'tool-in', 'analog-in']);

type End =
  | { kind: 'device'; device: PanelDevice | FieldDevice; terminal: string; terminalKind: TerminalKind; direction: 'in' | 'out' }
  | { kind: 'plc'; address: Address; text: string; module: PlcModule; channel: number }
  | { kind: 'controller'; rack: number; slot: number; channel: number; module: ControllerModule };

function resolveEnd(doc: CellDocument, lk: Lookups, e: Endpoint, path: (string | number)[], problems: Problem[]): End | null {
  if ('device' in e) {
    const device = lk.devices.get(e.device);
    if (!device) {
      problems.push({ path: [...path, 'device'], code: 'unknown_device', message: `no device "${e.device}"` });
      return null;
    }
    const t = deviceTerminals(device).find((x) => x.name === e.terminal);
    if (!t) {
      const names = deviceTerminals(device).map((x) => x.name).join(', ');
      problems.push({ path: [...path, 'terminal'], code: 'unknown_terminal', message: `${device.type} "${device.id}" has no terminal "${e.terminal}" (it has ${names})` });
      return null;
    }
    return { kind: 'device', device, terminal: t.name, terminalKind: t.kind, direction: t.direction };
  }
  if ('plc' in e) {
    const r = parseAddress(e.plc);
    if (!r.ok) {
      for (const p of r.errors) problems.push({ ...p, path: [...path, 'plc'] });
      return null;
    }
    const hit = plcModuleFor(doc.plc.modules, r.value);
    if (!hit) {
      problems.push({ path: [...path, 'plc'], code: 'address_not_on_module', message: `${e.plc} is on no PLC I/O module` });
      return null;
    }
    return { kind: 'plc', address: r.value, text: e.plc, module: hit.module, channel: hit.channel };
  }
  const c = e.controller;
  const mod = lk.ctlModules.get(`${c.rack}.${c.slot}`);
  if (!mod) {
    problems.push({ path: [...path, 'controller'], code: 'no_module', message: `no controller module in rack ${c.rack} slot ${c.slot}` });
    return null;
  }
  if (c.channel >= mod.channels) {
    problems.push({ path: [...path, 'controller', 'channel'], code: 'beyond_capacity', message: `module "${mod.id}" has channels 0..${mod.channels - 1}, not ${c.channel}` });
    return null;
  }
  return { kind: 'controller', rack: c.rack, slot: c.slot, channel: c.channel, module: mod };
}

/**
 * Plans one row. Returns the plan, or null after pushing every problem found (unknown
 * device or terminal, an address on no module, wrong direction, incompatible ends).
 */
export function planRow(doc: CellDocument, lk: Lookups, row: WiringRow, index: number, problems: Problem[]): RowPlan | null {
  const path = ['wiring', index];
  const before = problems.length;
  const from = resolveEnd(doc, lk, row.from, [...path, 'from'], problems);
  const to = resolveEnd(doc, lk, row.to, [...path, 'to'], problems);
  if (!from || !to) return null;
  const bad = (message: string, code = 'invalid_connection'): null => {
    problems.push({ path, code, message: `row "${row.id}": ${message}` });
    return null;
  };

  let source: RowSource;
  if (from.kind === 'device') {
    if (from.direction !== 'out') return bad(`${from.device.id}.${from.terminal} is an input terminal and cannot feed a signal`, 'wrong_direction');
    source = { kind: 'device', device: from.device, terminal: from.terminal, terminalKind: from.terminalKind };
  } else if (from.kind === 'plc') {
    if (from.address.area !== 'Q') return bad(`${from.text} is not a PLC output`, 'wrong_direction');
    source = from.address.size === 'X'
      ? { kind: 'plc-bit', address: from.address, text: from.text, module: from.module, channel: from.channel }
      : { kind: 'plc-word', address: from.address, text: from.text, module: from.module, channel: from.channel };
  } else {
    if (CTL_INPUT_TYPES.has(from.module.type)) return bad(`controller module "${from.module.id}" is an input module and cannot feed a signal`, 'wrong_direction');
    source = { kind: 'controller', rack: from.rack, slot: from.slot, channel: from.channel, module: from.module };
  }

  let sink: RowSink;
  if (to.kind === 'device') {
    if (to.direction !== 'in') return bad(`${to.device.id}.${to.terminal} is an output terminal and cannot take a signal`, 'wrong_direction');
    sink = { kind: 'device', device: to.device, terminal: to.terminal, terminalKind: to.terminalKind };
  } else if (to.kind === 'plc') {
    if (to.address.area !== 'I') return bad(`${to.text} is not a PLC input`, 'wrong_direction');
    if (to.module.kind === 'analog-in') sink = { kind: 'plc-analog', address: to.address, text: to.text, module: to.module, channel: to.channel };
    else if (to.module.kind === 'digital-in') {
      sink = to.address.size === 'X'
        ? { kind: 'plc-bit', address: to.address, text: to.text, module: to.module, channel: to.channel }
        : { kind: 'plc-word-bits', address: to.address, text: to.text, module: to.module, channel: to.channel };
    } else return bad(`${to.text} is not on an input module`, 'wrong_direction');
  } else {
    if (!CTL_INPUT_TYPES.has(to.module.type)) return bad(`controller module "${to.module.id}" is an output module and cannot take a signal`, 'wrong_direction');
    sink = { kind: 'controller', rack: to.rack, slot: to.slot, channel: to.channel, module: to.module };
  }

  // Which signal kinds may meet: digital with digital, analog with analog, words with bit groups.
  const srcKind = signalKind(source);
  const dstKind = sinkKind(sink);
  let bits = 1;
  if (srcKind === 'word' || dstKind === 'word') {
    const wordOk =
      (source.kind === 'plc-word' && ((sink.kind === 'controller' && sink.module.type === 'digital-in') || (sink.kind === 'device' && sink.terminalKind === 'word'))) ||
      (source.kind === 'controller' && source.module.type === 'digital-out' && sink.kind === 'plc-word-bits');
    if (!wordOk) return bad(`a word (${describe(source)}) can only go to a group of controller input channels or a numeric display`);
    bits = row.bits ?? (sink.kind === 'device' ? 16 : 8);
    if (source.kind === 'controller' && source.channel + bits > source.module.channels) {
      return bad(`${bits} bits from channel ${source.channel} run beyond module "${source.module.id}" (channels 0..${source.module.channels - 1})`, 'beyond_capacity');
    }
    if (sink.kind === 'controller' && sink.channel + bits > sink.module.channels) {
      return bad(`${bits} bits from channel ${sink.channel} run beyond module "${sink.module.id}" (channels 0..${sink.module.channels - 1})`, 'beyond_capacity');
    }
    if (source.kind === 'plc-word' && source.channel + bits > source.module.channels) {
      return bad(`${bits} bits of ${source.text} run beyond module "${source.module.id}"`, 'beyond_capacity');
    }
    if (sink.kind === 'plc-word-bits' && sink.channel + bits > sink.module.channels) {
      return bad(`${bits} bits of ${sink.text} run beyond module "${sink.module.id}"`, 'beyond_capacity');
    }
  } else if (srcKind !== dstKind) {
    return bad(`cannot wire a ${srcKind} signal (${describe(source)}) to a ${dstKind} input`);
  } else if (row.bits !== undefined && row.bits !== 1) {
    return bad('only word rows take bits', 'bits_not_word');
  }
  if (problems.length > before) return null;
  const isLink = (source.kind === 'controller' && sink.kind.startsWith('plc')) || (source.kind.startsWith('plc') && sink.kind === 'controller');
  return { row, index, source, sink, bits, isLink };
}

function signalKind(s: RowSource): 'digital' | 'analog' | 'word' {
  if (s.kind === 'device') return s.terminalKind === 'analog' ? 'analog' : s.terminalKind === 'word' ? 'word' : 'digital';
  if (s.kind === 'plc-word') return 'word';
  if (s.kind === 'plc-bit') return 'digital';
  return s.module.type === 'analog-out' ? 'analog' : 'digital';
}

function sinkKind(s: RowSink): 'digital' | 'analog' | 'word' {
  if (s.kind === 'device') return s.terminalKind === 'word' ? 'word' : 'digital';
  if (s.kind === 'plc-analog') return 'analog';
  if (s.kind === 'plc-word-bits') return 'word';
  if (s.kind === 'plc-bit') return 'digital';
  return s.module.type === 'analog-in' ? 'analog' : 'digital';
}

function describe(s: RowSource): string {
  if (s.kind === 'device') return `${s.device.id}.${s.terminal}`;
  if (s.kind === 'controller') return `controller ${s.rack}.${s.slot}.${s.channel}`;
  return s.text;
}

/** Key identifying one physical destination, to catch two rows driving the same input. */
export function sinkKeys(p: RowPlan): string[] {
  const s = p.sink;
  if (s.kind === 'device') return [`dev:${s.device.id}.${s.terminal}`];
  if (s.kind === 'controller') return Array.from({ length: p.bits }, (_, i) => `ctl:${s.rack}.${s.slot}.${s.channel + i}`);
  if (s.kind === 'plc-analog') return [`plc:${s.module.id}.${s.channel}`];
  return Array.from({ length: p.bits }, (_, i) => `plc:${s.module.id}.${s.channel + i}`);
}
