/**
 * Downloading edits into a running cell: a new logic sheet, new wiring rows and/or a new
 * routine, swapped in at the current time like a program downloaded to a PLC. The merged
 * document is validated first; a rejected download changes nothing. docs/engine.md
 * ("Downloading edits") gives the full semantics.
 */
import { rejected, type Problem, type Result } from '@/simulator/shared/result';
import type { CellDocument } from '@/simulator/schema/cell-document';
import { validateCellDocument } from '@/simulator/schema/validate';
import type { RowPlan, RowSink, RowSource } from '@/simulator/schema/wiring-plan';
import { rebase } from './devices';
import type { DownloadEvent } from './events';
import type { CellParts } from './parts';
import type { Signals } from './signals';

/** A row plan from a validated download, pointing at the running devices and modules. */
function adoptPlan(parts: CellParts, p: RowPlan): RowPlan {
  const end = <T extends RowSource | RowSink>(x: T): T => {
    if (x.kind === 'device') return { ...x, device: parts.devices.get(x.device.id)!.dev };
    if (x.kind === 'controller') return { ...x, module: parts.doc.controller.modules.find((m) => m.rack === x.rack && m.slot === x.slot)! };
    return { ...x, module: parts.doc.plc.modules.find((m) => m.id === x.module.id)! };
  };
  return { ...p, source: end(p.source), sink: end(p.sink) };
}

/**
 * Swaps the downloaded parts into the running cell. The clock, the devices, forces, the
 * live/staged point map and the fault cards carry on.
 */
export function download(parts: CellParts, signals: Signals, e: DownloadEvent): Result<true, Problem> {
  if (e.logic === undefined && e.wiring === undefined && e.routine === undefined) {
    return rejected('empty_download', 'a download carries a logic sheet, wiring rows or a routine');
  }
  const doc = parts.doc;
  const merged: CellDocument = {
    ...doc,
    plc: { ...doc.plc, sheet: e.logic ?? doc.plc.sheet },
    wiring: e.wiring ?? doc.wiring,
    controller: { ...doc.controller, routine: e.routine?.steps ?? doc.controller.routine, poses: e.routine?.poses ?? doc.controller.poses },
  };
  const v = validateCellDocument(merged);
  if (!v.ok) return v;
  const next = v.value;
  const routineChanged =
    e.routine !== undefined && JSON.stringify([next.document.controller.routine, next.document.controller.poses]) !== JSON.stringify([doc.controller.routine, doc.controller.poses]);
  // Devices and modules are not downloadable: keep the running objects (the hot path finds
  // device state and controller channels by object identity) and take only the new parts.
  parts.doc = {
    ...doc,
    plc: { ...doc.plc, sheet: next.document.plc.sheet },
    wiring: next.document.wiring,
    controller: { ...doc.controller, routine: next.document.controller.routine, poses: next.document.controller.poses },
  };
  const { controller: ctl, wiring, board, plc } = parts;
  ctl.sync();
  for (const d of parts.devices.values()) rebase(d, parts.clock.now);
  if (e.wiring !== undefined) {
    wiring.plan(next.plans.map((p) => adoptPlan(parts, p)));
    board.detachMissing();
  }
  if (e.logic !== undefined) plc.load(next.sheet);
  if (routineChanged) ctl.reloadRoutine(parts.doc.controller);
  signals.renew();
  board.refire();
  board.rebuild();
  ctl.lastInputs = [];
  ctl.writeOutputs(wiring);
  wiring.updateLoads();
  return { ok: true, value: true };
}

/**
 * A download's shape problems come from the event schema, with paths into the event
 * (`['logic', 'blocks', 3, ...]`). docs/engine.md promises paths into the document, as the
 * merged-document check gives, so the carried parts are re-rooted where they live there.
 */
export function downloadPathsIntoDocument(input: unknown, problems: Problem[]): Problem[] {
  if (typeof input !== 'object' || input === null || (input as { type?: unknown }).type !== 'download') return problems;
  return problems.map((p) => {
    const [head, ...rest] = p.path;
    if (head === 'logic') return { ...p, path: ['plc', 'sheet', ...rest] };
    if (head === 'wiring') return { ...p, path: ['wiring', ...rest] };
    // The routine part is `{ steps, poses }`; the document keeps them as controller.routine / controller.poses.
    if (head === 'routine' && rest[0] === 'steps') return { ...p, path: ['controller', 'routine', ...rest.slice(1)] };
    if (head === 'routine' && rest[0] === 'poses') return { ...p, path: ['controller', 'poses', ...rest.slice(1)] };
    return p;
  });
}
