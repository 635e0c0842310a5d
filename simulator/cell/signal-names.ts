/**
 * The names of every signal a cell exposes, worked out from its validated document alone:
 * the scope, rule pickers and trace options learn them without building a cell.
 */
import type { Problem, Result } from '@/simulator/shared/result';
import { formatAddress } from '@/simulator/address/address';
import type { CellDocument } from '@/simulator/schema/cell-document';
import type { RowPlan } from '@/simulator/schema/wiring-plan';
import { validateCellDocument } from '@/simulator/schema/validate';
import { resolvePointMap } from '@/simulator/controller/point-map';
import { HANDSHAKE_OUTPUT_ROLES } from '@/simulator/schema/cell-document';
import { deviceSignalProperties } from './devices';

/** What the names depend on: the document, its wiring plans, the sheet's block outputs and the live points. */
export type SignalSources = {
  doc: CellDocument;
  plans: readonly RowPlan[];
  outputSlots: readonly { block: string; port: string }[];
  pointRefs: Iterable<string>;
};

/**
 * Signal names, in a fixed order: `time`; the controller's `ctl.*` facts and `arm.*`;
 * `link.healthy`; `hs.<role>`; per wiring row `wire.<row>`, `in.<row>` and the PLC addresses
 * it touches; `plc.<block>.<port>`; `ctl.<point>` of the live point map; `dev.<id>.<property>`;
 * `plc.fault.<module>`.
 */
export function signalNamesFrom(s: SignalSources): string[] {
  const names = ['time', 'ctl.state', 'ctl.servo', 'ctl.pc', 'ctl.alarms', 'ctl.cycles', 'arm.speed', 'arm.moving', 'link.healthy'];
  for (let a = 0; a < s.doc.controller.axes; a++) names.push(`arm.${a}`);
  for (const r of HANDSHAKE_OUTPUT_ROLES) names.push(`hs.${r}`);
  for (const p of s.plans) {
    names.push(`wire.${p.row.id}`, `in.${p.row.id}`);
    if (p.sink.kind !== 'device' && p.sink.kind !== 'controller') names.push(`plc.${formatAddress(p.sink.address)}`);
    if (p.source.kind === 'plc-bit' || p.source.kind === 'plc-word') names.push(`plc.${formatAddress(p.source.address)}`);
  }
  for (const o of s.outputSlots) names.push(`plc.${o.block}.${o.port}`);
  for (const pt of s.pointRefs) names.push(`ctl.${pt}`);
  for (const d of [...s.doc.panel, ...s.doc.field]) for (const prop of deviceSignalProperties(d)) names.push(`dev.${d.id}.${prop}`);
  for (const m of s.doc.plc.modules) names.push(`plc.fault.${m.id}`);
  return [...new Set(names)];
}

/**
 * The names of every signal a cell made from `document` exposes at its start (for `--trace`,
 * rules, scope and trigger pickers), or the document's problems. A download or a controller
 * restart can change them later; a running cell's `signalNames()` follows those.
 */
export function signalNamesOf(document: unknown): Result<string[], Problem> {
  const v = validateCellDocument(document);
  if (!v.ok) return v;
  const { document: doc, sheet, plans } = v.value;
  return { ok: true, value: signalNamesFrom({ doc, plans, outputSlots: sheet.outputSlots, pointRefs: resolvePointMap(doc.controller.pointMap).byRef.keys() }) };
}
