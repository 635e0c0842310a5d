/**
 * Words for a changeover diff on the page: what each side holds for one entry, in the terms a
 * maintenance lead uses (terminals, rack / slot / channel, parameters). Pure, so the page and
 * its tests share it. The engine words each entry's one-line `detail` itself; this adds the
 * side-by-side cells.
 */
import type { DiffEntry, DiffKind, DiffTarget, RoleBinding } from '@/simulator';

/** Each kind in words (shown with an icon, never by colour alone). Wiring changes read as re-terminations. */
export function kindLabel(entry: Pick<DiffEntry, 'kind' | 'target' | 'ends'>): string {
  if (entry.kind === 'changed' && entry.target === 'wire' && entry.ends && entry.ends.length > 0) return 're-terminated';
  if (entry.kind === 'changed' && entry.target === 'role') return 're-pointed';
  if (entry.kind === 'moved') return 'moved on the canvas';
  return KIND_WORDS[entry.kind];
}
const KIND_WORDS: Record<DiffKind, string> = { added: 'added', removed: 'removed', changed: 'changed', moved: 'moved', reordered: 'reordered' };

const TARGET_WORDS: Record<DiffTarget, string> = {
  'cell-field': 'setting',
  'panel-device': 'panel device',
  'field-device': 'field device',
  'plc-module': 'PLC module',
  'controller-module': 'controller module',
  wire: 'wire',
  'point-map-row': 'point-map range',
  'staged-map': 'staged point map',
  block: 'block',
  connection: 'wire on the sheet',
  step: 'step',
  pose: 'pose',
  role: 'role',
};

export function targetLabel(target: DiffTarget): string {
  return TARGET_WORDS[target];
}

type Json = Record<string, unknown>;
const isObj = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v);

/** `rack 0 / slot 1 / ch 3` (channels count from 0). */
export function channelText(c: { rack: number; slot: number; channel: number }): string {
  return `rack ${c.rack} / slot ${c.slot} / ch ${c.channel}`;
}

/** A terminal-strip end: `guard:contact`, `%IX0.4`, `rack 0 / slot 1 / ch 3`. */
export function endpointText(e: unknown): string {
  if (!isObj(e)) return valueText(e);
  if (typeof e.device === 'string') return `${e.device}:${String(e.terminal)}`;
  if (typeof e.plc === 'string') return e.plc;
  if (isObj(e.controller)) return channelText(e.controller as { rack: number; slot: number; channel: number });
  return JSON.stringify(e);
}

/** A value as a person reads it: text quoted, endpoints as terminals, absent as a dash. */
export function valueText(v: unknown): string {
  if (v === undefined || v === null) return '—';
  if (typeof v === 'string') return `“${v}”`;
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (Array.isArray(v)) return v.map(valueText).join(', ');
  if (isObj(v)) {
    if ('device' in v || 'plc' in v || 'controller' in v) return endpointText(v);
    if ('block' in v && 'port' in v) return `${String(v.block)}.${String(v.port)}`;
    if ('x' in v && 'y' in v && Object.keys(v).length === 2) return `(${String(v.x)}, ${String(v.y)})`;
    return JSON.stringify(v);
  }
  return String(v);
}

// Field names a lead would not read as English.
const FIELD_WORDS: Record<string, string> = {
  firstChannel: 'first channel',
  timeoutMs: 'timeout (ms)',
  travelMs: 'travel time (ms)',
  speedPercent: 'speed (%)',
  inputType: 'input type',
  scanPeriodMs: 'scan period (ms)',
  ioRefreshMs: 'I/O refresh (ms)',
  from: 'from',
  to: 'to',
};

/** `params.PT` → `PT`, `points.DI7.label` → `DI7 label`, `firstChannel` → `first channel`. */
export function fieldText(path: string): string {
  const parts = path.split('.').filter((p, i) => !(i === 0 && (p === 'params' || p === 'points')));
  return parts.map((p) => FIELD_WORDS[p] ?? p).join(' ') || 'value';
}

/** The whole thing as added or removed, in one line. */
export function thingText(target: DiffTarget, value: unknown): string {
  if (!isObj(value)) return valueText(value);
  const v = value;
  switch (target) {
    case 'panel-device':
    case 'field-device': {
      const extra = [v.contact, v.output, v.action].filter((x) => typeof x === 'string').join(', ');
      return `${String(v.type)} “${String(v.label ?? v.id)}”${extra ? ` (${extra})` : ''}`;
    }
    case 'wire':
      return `${endpointText(v.from)} → ${endpointText(v.to)}${typeof v.bits === 'number' ? ` (${v.bits} bits)` : ''}`;
    case 'block': {
      const params = isObj(v.params) ? Object.entries(v.params).map(([k, x]) => (k === 'address' ? String(x) : `${k} ${valueText(x)}`)) : [];
      return `${String(v.type)}${params.length ? ` ${params.join(', ')}` : ''}`;
    }
    case 'connection':
      return `${valueText(v.from)} → ${valueText(v.to)}`;
    case 'plc-module':
      return `${String(v.kind)}, address ${String(v.address)}, ${String(v.channels)} channels`;
    case 'controller-module':
      return `${String(v.type)} at rack ${String(v.rack)} / slot ${String(v.slot)}, ${String(v.channels)} channels`;
    case 'point-map-row': {
      const last = Number(v.first) + Number(v.count) - 1;
      return `${String(v.family)}${String(v.first)}–${String(v.family)}${last} at ${channelText({ rack: Number(v.rack), slot: Number(v.slot), channel: Number(v.firstChannel) })}`;
    }
    case 'step':
      return `${String(v.kind)}${v.label ? ` “${String(v.label)}”` : ''}`;
    case 'pose':
      return `“${String(v.label ?? v.id)}” at ${valueText(v.coordinates)}`;
    default:
      return valueText(v);
  }
}

/** A handshake role's binding: `DI4 “Guard closed” · rack 0 / slot 1 / ch 3 · wired to %QX0.3`. */
export function bindingText(b: RoleBinding | undefined): string {
  if (!b) return 'not assigned';
  const parts = [b.label ? `${b.point} “${b.label}”` : b.point];
  if (b.location) parts.push(channelText(b.location));
  if (b.wiredTo && b.wiredTo.length > 0) parts.push(`wired to ${b.wiredTo.join(', ')}`);
  return parts.join(' · ');
}

/** What one side holds for an entry, as lines (empty when the thing does not exist on that side). */
export function sideLines(entry: DiffEntry, side: 'base' | 'proposed'): string[] {
  // A whole thing added or removed carries its value; an added or removed setting only its field change.
  if (entry.kind === 'added' && (entry.value !== undefined || side === 'base')) return side === 'base' ? [] : [thingText(entry.target, entry.value)];
  if (entry.kind === 'removed' && (entry.value !== undefined || side === 'proposed')) return side === 'proposed' ? [] : [thingText(entry.target, entry.value)];
  if (entry.target === 'role') return [bindingText(side === 'base' ? entry.was : entry.now)];
  if (entry.kind === 'reordered') {
    const i = side === 'base' ? entry.baseIndex : entry.proposedIndex;
    return i === undefined ? [] : [`step ${i + 1}`];
  }
  if (entry.ends && entry.ends.length > 0) {
    const lines = entry.ends.map((e) => `${e.end}: ${endpointText(side === 'base' ? e.was : e.now)}`);
    const other = entry.changes.filter((c) => c.path !== 'from' && c.path !== 'to');
    return [...lines, ...other.map((c) => `${fieldText(c.path)}: ${valueText(side === 'base' ? c.from : c.to)}`)];
  }
  return entry.changes.map((c) => {
    const v = side === 'base' ? c.from : c.to;
    const absent = side === 'base' ? !('from' in c) : !('to' in c);
    return `${fieldText(c.path)}: ${absent ? '(none)' : valueText(v)}`;
  });
}
