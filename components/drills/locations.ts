import type { CellDocument } from '@/simulator';

/** A place in the cell a diagnosis (or a fault card) can name. */
export type LocationOption = { id: string; label: string; group: 'device' | 'wire' | 'module' | 'point-map row' };

/**
 * Every place of a cell a student can point at: devices (panel and field), terminal-strip rows
 * (wires), PLC and controller modules, and point-map rows. Ids are what the grader compares.
 */
export function locationOptions(doc: CellDocument): LocationOption[] {
  const out: LocationOption[] = [];
  for (const d of [...doc.panel, ...doc.field]) out.push({ id: d.id, label: `${d.label ?? d.id} (${d.type})`, group: 'device' });
  for (const w of doc.wiring) out.push({ id: w.id, label: w.label ? `${w.id} — ${w.label}` : w.id, group: 'wire' });
  for (const m of doc.plc.modules) out.push({ id: m.id, label: `${m.id} (PLC module)`, group: 'module' });
  for (const m of doc.controller.modules) out.push({ id: m.id, label: `${m.id} (controller module)`, group: 'module' });
  for (const r of doc.controller.pointMap) out.push({ id: r.id, label: `${r.id} (point map)`, group: 'point-map row' });
  return out;
}
