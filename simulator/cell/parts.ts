/**
 * The rooms of a running cell, as the readers of the whole (signals, snapshot, events,
 * downloads) see them. cell.ts builds them and runs the clock over them.
 */
import type { CellDocument } from '@/simulator/schema/cell-document';
import type { Clock } from './clock';
import type { ControllerSide } from './controller-side';
import type { DevState } from './devices';
import type { FaultBoard } from './faults';
import type { FaultState } from './fault-state';
import type { PlcSide } from './plc-side';
import type { Wiring } from './wiring';

export type CellParts = {
  readonly clock: Clock;
  readonly seed: number;
  /** The document as running now (downloads replace its sheet, wiring and routine). */
  doc: CellDocument;
  readonly devices: Map<string, DevState>;
  readonly devOf: Map<object, DevState>;
  readonly faults: FaultState;
  readonly board: FaultBoard;
  readonly wiring: Wiring;
  readonly plc: PlcSide;
  readonly controller: ControllerSide;
  /** Forced PLC addresses (canonical text) and controller points, with their values. */
  readonly forces: Map<string, number>;
};
