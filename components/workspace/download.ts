/**
 * "Send to cell": the edited parts of a document sent to a running cell as one `download`
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

/** The parts a download event carries. */
export function downloadParts(event: DownloadEvent): DownloadArea[] {
  return DOWNLOAD_AREAS.filter((a) => (a === 'logic' ? event.logic : a === 'wiring' ? event.wiring : event.routine) !== undefined);
}

/** `target` with the given parts taken from `source` (everything else kept as in `target`). */
export function withParts(target: CellDocument, source: CellDocument, parts: readonly DownloadArea[]): CellDocument {
  if (parts.length === 0) return target;
  return {
    ...target,
    plc: parts.includes('logic') ? { ...target.plc, sheet: source.plc.sheet } : target.plc,
    wiring: parts.includes('wiring') ? source.wiring : target.wiring,
    controller: parts.includes('routine') ? { ...target.controller, routine: source.controller.routine, poses: source.controller.poses } : target.controller,
  };
}

/** A download sent to the engine whose answer has not come back yet, and what the engine ran before it. */
export type DownloadInFlight = { event: DownloadEvent; key: string; before: CellDocument };

/**
 * What the engine runs once the download `refused` (sent while `inFlight` were out, in send
 * order) is refused: the parts it carried go back to what ran before it, unless a later
 * download in flight carries that part (then that one decides). Later downloads' `before`
 * are corrected the same way, so a second refusal restores what the engine really had.
 * Returns the corrected engine document and the downloads still in flight.
 */
export function revertRefused(engineDocument: CellDocument, inFlight: readonly DownloadInFlight[], refused: number): { engineDocument: CellDocument; inFlight: DownloadInFlight[] } {
  const gone = inFlight[refused];
  if (!gone) return { engineDocument, inFlight: [...inFlight] };
  let open = downloadParts(gone.event);
  const rest: DownloadInFlight[] = inFlight.slice(0, refused);
  for (const later of inFlight.slice(refused + 1)) {
    rest.push(open.length > 0 ? { ...later, before: withParts(later.before, gone.before, open) } : later);
    const carried = downloadParts(later.event);
    open = open.filter((p) => !carried.includes(p));
  }
  return { engineDocument: withParts(engineDocument, gone.before, open), inFlight: rest };
}
