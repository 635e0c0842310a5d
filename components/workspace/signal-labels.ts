/**
 * Plain-language names for the signals the scope and the monitor list by raw key: a PLC
 * address is named by what the terminal strip wires it to (`Cycle start (start:contact)`,
 * `DI1 Start (R0.S1.C0)`), a controller point by its point-map label. Pure: derived from the
 * cell document alone, so it can be memoised on the document and tested without an engine.
 */
import { deviceTerminals, parseAddress, formatAddress, resolvePointMap } from '@/simulator';
import type { CellDocument, FieldDevice, PanelDevice, WiringRow } from '@/simulator';

type Endpoint = WiringRow['from'];
type ResolvedPointMap = ReturnType<typeof resolvePointMap>;
import { endpointText } from './endpoint-text';

type Device = PanelDevice | FieldDevice;

/** `%ix0.0` and `%IX0.0` name the same address; the engine's keys use the canonical form. */
function canonicalAddress(text: string): string {
  const a = parseAddress(text);
  return a.ok ? formatAddress(a.value) : text;
}

/**
 * A device terminal as words: the device label, the terminal's meaning where the device has
 * more than one (a stack-light tier by its colour, a selector position by its legend), and the
 * terminal text the wiring table uses, so the two can be matched by eye.
 */
function terminalText(devices: Map<string, Device>, device: string, terminal: string): string {
  const where = `${device}:${terminal}`;
  const d = devices.get(device);
  if (!d || !d.label.trim()) return where;
  let part = '';
  const index = Number(/\d+$/.exec(terminal)?.[0] ?? NaN);
  if (d.type === 'stack-light' && d.tiers[index]) part = ` ${d.tiers[index]} tier`;
  else if (d.type === 'selector-switch' && d.positions[index] !== undefined) part = `: ${d.positions[index]}`;
  else if (deviceTerminals(d).length > 1) part = ` ${terminal}`;
  return `${d.label.trim()}${part} (${where})`;
}

/** Controller points on the channels a wire end covers (a word spans `bits` channels). */
function pointsOnChannels(map: ResolvedPointMap, end: Endpoint, bits: number): string[] {
  if (!('controller' in end)) return [];
  const { rack, slot, channel } = end.controller;
  const refs: string[] = [];
  // Channel by channel, the points (in map order) that use it.
  for (let b = 0; b < bits; b++) {
    const c = channel + b;
    for (const p of map.byRef.values()) if (p.rack === rack && p.slot === slot && p.channel <= c && c < p.channel + p.bits && !refs.includes(p.ref)) refs.push(p.ref);
  }
  return refs;
}

/**
 * Labels by signal key for every wired PLC address (`%IX0.0`) and every mapped controller point
 * (`DI3`) of the document's live point map. An address wired to a device reads as the device
 * (`Cycle start (start:contact)`, `Cell status green tier (stack:tier2)`); one linked to the
 * controller reads as the point(s) on that channel (`DI1 Start (R0.S1.C0)`). A point reads as its
 * point-map label, or, when it has none, as what is wired to its channel. Several wires on one
 * address are joined with `, `. Unwired addresses and unlabelled, unwired points get no entry.
 */
export function signalLabels(document: CellDocument): Record<string, string> {
  const devices = new Map<string, Device>();
  for (const d of [...document.panel, ...document.field]) devices.set(d.id, d);
  const map = resolvePointMap(document.controller.pointMap);
  const pointLabel = (ref: string) => map.byRef.get(ref)?.label.trim() ?? '';

  const parts = new Map<string, string[]>();
  const add = (key: string, text: string) => {
    if (!text) return;
    const list = parts.get(key) ?? [];
    if (!list.includes(text)) list.push(text);
    parts.set(key, list);
  };

  /** What sits at the far end of a wire, as seen from the other end. */
  const describe = (end: Endpoint, bits: number): string => {
    if ('device' in end) return terminalText(devices, end.device, end.terminal);
    if ('plc' in end) return canonicalAddress(end.plc);
    const refs = pointsOnChannels(map, end, bits);
    const named = refs.map((r) => [r, pointLabel(r)].filter(Boolean).join(' ')).join(', ');
    return named ? `${named} (${endpointText(end)})` : endpointText(end);
  };

  // Addresses first: what each one is wired to.
  for (const row of document.wiring) {
    const bits = row.bits ?? 1;
    for (const [near, far] of [
      [row.from, row.to],
      [row.to, row.from],
    ] as const) {
      if (!('plc' in near)) continue;
      const text = describe(far, bits);
      // A bare channel says little; the wire's own label, when it has one, says more.
      const bare = 'controller' in far && text === endpointText(far);
      add(canonicalAddress(near.plc), bare && row.label?.trim() ? `${row.label.trim()} (${text})` : text);
    }
  }

  // Points: the point-map label, else what the terminal strip wires to the point's channels.
  for (const p of map.byRef.values()) {
    const invert = p.invert ? ' (inverted)' : '';
    if (p.label.trim()) {
      add(p.ref, p.label.trim() + invert);
      continue;
    }
    const wired: string[] = [];
    for (const row of document.wiring) {
      for (const [near, far] of [
        [row.from, row.to],
        [row.to, row.from],
      ] as const) {
        if (!('controller' in near) || !pointsOnChannels(map, near, row.bits ?? 1).includes(p.ref)) continue;
        wired.push(describe(far, 1));
      }
    }
    if (wired.length) add(p.ref, wired.join(', ') + invert);
  }

  const out: Record<string, string> = {};
  for (const [key, list] of parts) out[key] = list.join(', ');
  return out;
}
