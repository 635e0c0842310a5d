/**
 * What a signal picker offers: every signal of a cell with the words a lead or trainer would
 * search for — the device it is wired to, the wire's id, the point-map label, the logic blocks
 * that use it — so nobody has to remember that the front guard is `%IX0.4`. Pure: built from
 * the cell document (and, for trace rules, the engine's list of signal names), memoised by
 * the caller.
 */
import { blockPorts, createCell, formatAddress, parseAddress, type CellDocument } from '@/simulator';
import { signalLabels as wiredLabels } from '@/components/workspace/signal-labels';
import { endpointText } from '@/components/workspace/endpoint-text';
import { humanise } from '@/components/workspace/format';

export type SignalKind = 'input' | 'output' | 'memory' | 'point' | 'handshake' | 'device' | 'wire' | 'arm' | 'controller' | 'block' | 'fault' | 'link';

/** One pickable signal. */
export type SignalOption = {
  /** What the rule stores: `%IX0.4` in an interlock rule, `plc.%IX0.4` or `dev.estop.latched` in a trace rule. */
  value: string;
  /** The short technical name shown in monospace (the address, or the signal name). */
  code: string;
  /** The plain name: the device or point it stands for; `code` again when nothing better is known. */
  label: string;
  /** Where it comes from: what it is wired to, which wire, which blocks use it. */
  detail: string;
  kind: SignalKind;
  /** Reads 0/1 (an on/off toggle suits it). */
  bit: boolean;
  /** The texts it takes, when it is a text signal (`ctl.state`). */
  texts?: readonly string[];
  /** Lower-case text every search word must be found in. */
  haystack: string;
};

/** Controller states as `ctl.state` names them (docs/engine.md, "Controller"). */
export const CONTROLLER_STATES = ['off', 'booting', 'stopped', 'ready', 'cycling', 'holding', 'faulted', 'eStopped'] as const;

const AREA_ORDER: Record<string, number> = { I: 0, Q: 1, M: 2 };
const KIND_OF_AREA: Record<string, SignalKind> = { I: 'input', Q: 'output', M: 'memory' };

function canonical(text: string): string | null {
  const a = parseAddress(text);
  return a.ok ? formatAddress(a.value) : null;
}

/** Sort key for an X address: area, byte, bit. */
function addressKey(address: string): [number, number, number] {
  const m = /^%([IQM])X(\d+)\.(\d+)$/.exec(address);
  return m ? [AREA_ORDER[m[1]], Number(m[2]), Number(m[3])] : [9, 0, 0];
}

function byAddress(a: string, b: string): number {
  const x = addressKey(a);
  const y = addressKey(b);
  return x[0] - y[0] || x[1] - y[1] || x[2] - y[2];
}

type AddressFacts = { wires: string[]; devices: string[]; blocks: string[] };

/** Every PLC address a cell names (modules' channels, wiring ends, blocks), with what touches it. */
function addressFacts(doc: CellDocument): Map<string, AddressFacts> {
  const facts = new Map<string, AddressFacts>();
  const at = (address: string) => {
    let f = facts.get(address);
    if (!f) facts.set(address, (f = { wires: [], devices: [], blocks: [] }));
    return f;
  };
  for (const m of doc.plc.modules) {
    if (m.kind !== 'digital-in' && m.kind !== 'digital-out') continue;
    const area = m.kind === 'digital-in' ? 'I' : 'Q';
    for (let ch = 0; ch < m.channels; ch++) at(`%${area}X${m.address + Math.floor(ch / 8)}.${ch % 8}`);
  }
  for (const row of doc.wiring) {
    for (const [near, far] of [
      [row.from, row.to],
      [row.to, row.from],
    ] as const) {
      if (!('plc' in near)) continue;
      const a = canonical(near.plc);
      if (!a) continue;
      const f = at(a);
      if (!f.wires.includes(row.id)) f.wires.push(row.id);
      if ('device' in far && !f.devices.includes(far.device)) f.devices.push(far.device);
    }
  }
  for (const b of doc.plc.sheet.blocks) {
    const address = (b.params as { address?: unknown }).address;
    if (typeof address !== 'string') continue;
    const a = canonical(address);
    if (!a) continue;
    const f = at(a);
    const name = b.label ? `${b.label} (${b.id})` : b.id;
    if (!f.blocks.includes(name)) f.blocks.push(name);
  }
  return facts;
}

function deviceNames(doc: CellDocument): Map<string, string> {
  return new Map([...doc.panel, ...doc.field].map((d) => [d.id, d.label]));
}

/**
 * The plain name of a wired address: what the terminal strip joins it to, without the
 * terminal in brackets (`Cycle start (start:contact)` → `Cycle start`, `Cell status red tier
 * (stack:tier2)` → `Cell status red tier`, `DI1 Start (R0.S1.C0)` → `DI1 Start`).
 */
export function shortLabel(wired: string): string {
  return wired
    .split(', ')
    .map((part) => part.replace(/\s*\([^()]*\)$/, '').trim() || part)
    .join(', ');
}

function addressOption(address: string, f: AddressFacts, wired: Record<string, string>, devices: Map<string, string>, value: string): SignalOption {
  const area = address[1];
  const isBit = /^%[IQM]X/.test(address);
  const label = wired[address] ? shortLabel(wired[address]) : f.blocks.length ? f.blocks[0].replace(/ \(.*\)$/, '') : address;
  const parts: string[] = [];
  if (wired[address]) parts.push(`${area === 'I' ? 'from' : 'to'} ${wired[address]}`);
  if (f.wires.length) parts.push(`wire ${f.wires.join(', ')}`);
  if (f.blocks.length) parts.push(`used by ${f.blocks.join(', ')}`);
  if (!wired[address] && !f.blocks.length) parts.push('not wired, not used by the logic');
  const deviceWords = f.devices.map((d) => `${d} ${devices.get(d) ?? ''}`);
  return {
    value,
    code: address,
    label,
    detail: parts.join(' · '),
    kind: KIND_OF_AREA[area] ?? 'memory',
    bit: isBit,
    haystack: [address, value, label, wired[address] ?? '', ...f.wires, ...deviceWords, ...f.blocks].join(' ').toLowerCase(),
  };
}

/**
 * The bits an interlock rule can name (%IX, %QX, %MX): every channel of the PLC's digital
 * modules, every address the wiring or the logic sheet uses. Labelled by the device wired to
 * the bit (the same words the proof's verdict uses), detailed by the wire and the blocks.
 */
export function bitSignalOptions(doc: CellDocument): SignalOption[] {
  const facts = addressFacts(doc);
  const wired = wiredLabels(doc);
  const devices = deviceNames(doc);
  return [...facts.keys()]
    .filter((a) => /^%[IQM]X/.test(a))
    .sort(byAddress)
    .map((a) => addressOption(a, facts.get(a)!, wired, devices, a));
}

const CTL_FIXED: Record<string, { label: string; bit: boolean; texts?: readonly string[] }> = {
  state: { label: 'Controller state', bit: false, texts: CONTROLLER_STATES },
  servo: { label: 'Servo power on', bit: true },
  pc: { label: 'Routine step (from 0)', bit: false },
  alarms: { label: 'Number of active alarms', bit: false },
  cycles: { label: 'Cycles completed', bit: false },
};

const DEVICE_BITS = new Set(['pressed', 'latched', 'active', 'led', 'command', 'closed', 'open', 'switch', 'running', 'guardClosed', 'partPresent']);

/**
 * The signals a trace rule can name (drill grading rules, scenario rules): the engine's own
 * list for the cell (`names`, from `cell.signalNames()`), every address the document uses,
 * and `extra` names such as the drill's `fault.<card>` signals. Each is labelled and
 * searchable by label, address and wire.
 */
export function traceSignalOptions(doc: CellDocument, names: readonly string[], extra: readonly string[] = []): SignalOption[] {
  const facts = addressFacts(doc);
  const wired = wiredLabels(doc);
  const devices = deviceNames(doc);
  const rows = new Map(doc.wiring.map((r) => [r.id, r]));
  const blocks = new Map(doc.plc.sheet.blocks.map((b) => [b.id, b]));
  const all = [...new Set([...names, ...[...facts.keys()].map((a) => `plc.${a}`), ...extra])].filter((n) => n !== 'time');
  const out: SignalOption[] = [];
  const add = (o: Omit<SignalOption, 'haystack' | 'code'> & { code?: string; words?: string[] }) => {
    const { words = [], ...rest } = o;
    out.push({ ...rest, code: o.code ?? o.value, haystack: [o.value, o.label, o.detail, ...words].join(' ').toLowerCase() });
  };
  for (const name of all) {
    const dot = name.indexOf('.');
    const head = name.slice(0, dot);
    const rest = name.slice(dot + 1);
    if (head === 'plc' && rest.startsWith('%')) {
      const a = canonical(rest);
      if (!a) continue;
      const o = addressOption(a, facts.get(a) ?? { wires: [], devices: [], blocks: [] }, wired, devices, name);
      out.push({ ...o, code: name });
    } else if (head === 'plc' && rest.startsWith('fault.')) {
      add({ value: name, label: `PLC module ${rest.slice(6)} faulted`, detail: 'dead-module fault on this PLC module', kind: 'fault', bit: true });
    } else if (head === 'plc') {
      const d = rest.lastIndexOf('.');
      const block = blocks.get(rest.slice(0, d));
      const port = rest.slice(d + 1);
      const label = `${block?.label || rest.slice(0, d)} · output ${port}`;
      const type = block ? blockPorts(block.type, block.params as Record<string, unknown>).outputs.find((o) => o.name === port)?.type : undefined;
      add({ value: name, label, detail: block ? `logic block ${block.id} (${block.type})` : 'logic block output', kind: 'block', bit: type === 'BOOL' });
    } else if (head === 'ctl' && rest in CTL_FIXED) {
      const f = CTL_FIXED[rest];
      add({ value: name, label: f.label, detail: 'robot controller', kind: 'controller', bit: f.bit, ...(f.texts ? { texts: f.texts } : {}) });
    } else if (head === 'ctl') {
      const bit = /^(DI|DO|TI|TO)\d/.test(rest);
      add({ value: name, label: wired[rest] ? `${rest} ${shortLabel(wired[rest])}` : rest, detail: wired[rest] ? `controller point · ${wired[rest]}` : 'controller point', kind: 'point', bit, words: [rest] });
    } else if (head === 'hs') {
      add({ value: name, label: `Robot reports: ${humanise(rest)}`, detail: 'handshake output of the controller', kind: 'handshake', bit: true });
    } else if (head === 'arm') {
      const label = rest === 'moving' ? 'Arm moving' : rest === 'speed' ? 'Arm speed' : `Arm axis ${rest} position`;
      add({ value: name, label, detail: 'robot arm', kind: 'arm', bit: rest === 'moving' });
    } else if (head === 'wire' || head === 'in') {
      const row = rows.get(rest);
      const ends = row ? `${endpointText(row.from)} → ${endpointText(row.to)}` : rest;
      const far = row && 'device' in row.from ? devices.get(row.from.device) : row && 'device' in row.to ? devices.get(row.to.device) : undefined;
      const label = head === 'wire' ? `Wire ${rest} level` : `Wire ${rest} reads on`;
      add({ value: name, label: far ? `${label} (${far})` : label, detail: `${ends}${row?.label ? ` · ${row.label}` : ''}`, kind: 'wire', bit: head === 'in', words: [rest] });
    } else if (head === 'dev') {
      const d = rest.lastIndexOf('.');
      const id = rest.slice(0, d);
      const prop = rest.slice(d + 1);
      add({ value: name, label: `${devices.get(id) ?? id} · ${humanise(prop)}`, detail: `device ${id}`, kind: 'device', bit: DEVICE_BITS.has(prop) || prop.startsWith('lamp'), words: [id] });
    } else if (head === 'link') {
      add({ value: name, label: 'PLC–controller link healthy', detail: 'link', kind: 'link', bit: true });
    } else if (head === 'fault') {
      add({ value: name, label: `Fault card ${rest} active`, detail: 'fault card', kind: 'fault', bit: true });
    }
  }
  return out;
}

/**
 * Options matching a search: every word of the query must appear in the option's text
 * (label, address, wire, device, blocks). Exact and leading matches of the code or label
 * come first; otherwise the catalogue's own order (addresses in order) is kept.
 */
export function searchSignals(options: readonly SignalOption[], query: string, limit = 50): SignalOption[] {
  const words = query.toLowerCase().split(/\s+/).filter(Boolean);
  if (words.length === 0) return options.slice(0, limit);
  const q = query.trim().toLowerCase();
  const scored: { o: SignalOption; score: number; i: number }[] = [];
  options.forEach((o, i) => {
    if (!words.every((w) => o.haystack.includes(w))) return;
    const code = o.code.toLowerCase();
    const label = o.label.toLowerCase();
    const score = code === q || o.value.toLowerCase() === q ? 0 : code.startsWith(q) || label.startsWith(q) ? 1 : label.includes(q) ? 2 : 3;
    scored.push({ o, score, i });
  });
  scored.sort((a, b) => a.score - b.score || a.i - b.i);
  return scored.slice(0, limit).map((s) => s.o);
}

/** Labels by option value, for sentences (`%IX0.4` → `Front guard`). */
export function optionLabels(options: readonly SignalOption[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const o of options) if (o.label !== o.code) out[o.value] = o.label;
  return out;
}

/** The values of the bit options (for on/off wording of trace rules). */
export function bitValues(options: readonly SignalOption[]): Set<string> {
  return new Set(options.filter((o) => o.bit).map((o) => o.value));
}

/** Trace options of a document from the engine's own signal list (plus `extra` names, such as a drill's `fault.<card>`). */
export function engineTraceOptions(doc: CellDocument, extra: readonly string[] = []): SignalOption[] {
  const made = createCell(doc);
  if (!made.ok) return traceSignalOptions(doc, [], extra);
  const names = made.value.signalNames();
  made.value.dispose();
  return traceSignalOptions(doc, names, extra);
}
