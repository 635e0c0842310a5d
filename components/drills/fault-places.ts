/**
 * What a fault card (or a drill's answer) can point at in a cell, as choices with words: the
 * devices a fault kind applies to, the terminal-strip rows with what they join, the PLC and
 * controller modules, the point-map rows. A trainer picks "w-guard — Front guard → %IX0.4"
 * instead of typing `w-guard`.
 */
import { FAULT_DEVICE_TYPES, type CellDocument, type FaultKind } from '@/simulator';
import { endpointText } from '@/components/workspace/endpoint-text';

export type Place = { id: string; label: string; group: 'device' | 'wire' | 'module' | 'point-map row' };

/**
 * Device types each device fault applies to: the engine's own table (its device catalogue),
 * so a card the form offers is one the engine arms.
 */
export { FAULT_DEVICE_TYPES };

/** Devices a fault kind applies to (every device when the kind names none). */
export function devicePlaces(doc: CellDocument, kind?: FaultKind): Place[] {
  const types = kind ? FAULT_DEVICE_TYPES[kind] : undefined;
  return [...doc.panel, ...doc.field]
    .filter((d) => !types || types.includes(d.type))
    .map((d) => ({ id: d.id, label: `${d.label || d.id} (${d.id}, ${d.type})`, group: 'device' as const }));
}

/** Terminal-strip rows, each with what it joins. */
export function wirePlaces(doc: CellDocument): Place[] {
  const names = new Map([...doc.panel, ...doc.field].map((d) => [d.id, d.label]));
  const end = (e: CellDocument['wiring'][number]['from']) => ('device' in e && names.get(e.device) ? `${names.get(e.device)} (${endpointText(e)})` : endpointText(e));
  return doc.wiring.map((w) => ({ id: w.id, label: `${w.id} — ${end(w.from)} → ${end(w.to)}${w.label ? ` · ${w.label}` : ''}`, group: 'wire' as const }));
}

/** PLC and controller modules. */
export function modulePlaces(doc: CellDocument): Place[] {
  return [
    ...doc.plc.modules.map((m) => ({ id: m.id, label: `${m.id} — PLC ${m.kind} at ${m.kind === 'analog-in' ? '%IW' : m.kind === 'digital-out' ? '%QX' : '%IX'}${m.address}, ${m.channels} channels`, group: 'module' as const })),
    ...doc.controller.modules.map((m) => ({ id: m.id, label: `${m.id} — controller ${m.type}, rack ${m.rack} slot ${m.slot}`, group: 'module' as const })),
  ];
}

/** Point-map rows (live and staged). */
export function pointMapPlaces(doc: CellDocument): Place[] {
  const rows = [...doc.controller.pointMap, ...(doc.controller.staged ?? [])];
  const seen = new Set<string>();
  return rows
    .filter((r) => !seen.has(r.id) && seen.add(r.id))
    .map((r) => ({ id: r.id, label: `${r.id} — ${r.family}${r.first}…${r.family}${r.first + r.count - 1} at rack ${r.rack} slot ${r.slot}`, group: 'point-map row' as const }));
}

/** Everything a diagnosis can name. */
export function allPlaces(doc: CellDocument): Place[] {
  return [...devicePlaces(doc), ...wirePlaces(doc), ...modulePlaces(doc), ...pointMapPlaces(doc), { id: 'link', label: 'link — the PLC–controller link', group: 'module' }];
}

/**
 * An answer's location as the grader reads it (lib/runs/grade.ts): equivalent answers
 * separated by `|`, each a set of places separated by commas (two wires for swapped wires).
 */
export function parseAnswer(location: string): string[][] {
  return location
    .split('|')
    .map((alt) => alt.split(/[\s,+;/]+/).filter(Boolean))
    .filter((alt) => alt.length > 0);
}

export function formatAnswer(answers: readonly (readonly string[])[]): string {
  return answers
    .map((a) => a.filter(Boolean).join(','))
    .filter(Boolean)
    .join('|');
}
