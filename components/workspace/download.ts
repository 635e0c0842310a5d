/**
 * "Download to PLC": the edited parts of a document sent to a running cell as one `download`
 * event (docs/engine.md), instead of reloading the cell at time 0. Pure functions, shared by
 * the workspace store and its tests.
 */
import type { CellDocument, DownloadEvent } from '@/simulator';

/** The parts of a document a download can carry (the names drills use for editable areas). */
export type DownloadArea = 'logic' | 'wiring' | 'routine';
export const DOWNLOAD_AREAS: readonly DownloadArea[] = ['logic', 'wiring', 'routine'];

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/** The areas of `edited` that differ from what the engine runs (`running`), among `areas`. */
export function changedAreas(running: CellDocument, edited: CellDocument, areas: readonly DownloadArea[] = DOWNLOAD_AREAS): DownloadArea[] {
  return areas.filter((a) => {
    if (a === 'logic') return !same(running.plc.sheet, edited.plc.sheet);
    if (a === 'wiring') return !same(running.wiring, edited.wiring);
    return !same([running.controller.routine, running.controller.poses], [edited.controller.routine, edited.controller.poses]);
  });
}

/** The download event carrying the changed areas, or null when nothing among `areas` changed. */
export function downloadEvent(running: CellDocument, edited: CellDocument, areas: readonly DownloadArea[] = DOWNLOAD_AREAS): DownloadEvent | null {
  const changed = changedAreas(running, edited, areas);
  if (changed.length === 0) return null;
  const e: DownloadEvent = { type: 'download' };
  if (changed.includes('logic')) e.logic = edited.plc.sheet;
  if (changed.includes('wiring')) e.wiring = edited.wiring;
  if (changed.includes('routine')) e.routine = { steps: edited.controller.routine, poses: edited.controller.poses };
  return e;
}

/** What the engine runs once `event` is applied to `running` (the parts it carries replaced). */
export function afterDownload(running: CellDocument, event: DownloadEvent): CellDocument {
  return {
    ...running,
    plc: event.logic ? { ...running.plc, sheet: event.logic } : running.plc,
    wiring: event.wiring ?? running.wiring,
    controller: event.routine ? { ...running.controller, routine: event.routine.steps, poses: event.routine.poses } : running.controller,
  };
}
