/**
 * The plain, serialisable picture of a cell at one instant: everything a UI needs to draw
 * the panel, the wiring, the logic sheet, the point map, the controller and the arm.
 * A Web Worker can post it as is (no class instances, no typed arrays, no functions).
 */
import type { BlockOutputs } from '@/simulator/plc';
import type { Alarm } from '@/simulator/controller/routine';
import type { FaultCard } from '@/simulator/faults/fault-card';
import type { PointMapRow } from '@/simulator/schema/cell-document';
import type { ControllerStateName } from '@/simulator/controller/controller.machine';

/** One panel or field device's live state; fields apply per device type. */
export type DeviceSnapshot = {
  id: string;
  type: string;
  label: string;
  /** Buttons: held down now (momentary) or pressed in (e-stop, maintained). */
  pressed?: boolean;
  /** E-stop latched in; maintained button in its "on" state. */
  latched?: boolean;
  /** Selector position (0-based). */
  position?: number;
  /** Potentiometer engineering value; numeric display decoded value (−1 when the word is invalid in its encoding). */
  value?: number;
  /** Sensors: target present / part present / guard closed. */
  active?: boolean;
  /** Sensors: the sensor's own indicator LED. */
  led?: boolean;
  /** Lamps by tier (stack light) or single lamp (pilot light, illuminated button). */
  lamps?: boolean[];
  /** Actuators: commanded on (gripper close, vacuum valve, conveyor run). */
  command?: boolean;
  /** Actuators: travel 0 (open / released / stopped) .. 1 (closed / vacuum built / at speed). */
  travel?: number;
  /** Feedback contacts of the device by terminal name (closed = true). */
  feedback?: Record<string, boolean>;
};

/** One terminal-strip row as a meter would read it at the destination. */
export type WireSnapshot = {
  id: string;
  /** Voltage across a digital input or load (V), or the analog signal (V or mA). */
  level: number;
  unit: 'V' | 'mA' | 'word';
  /** Digital reading at the destination: on, off, or undefined (IEC 61131-2 transition band). */
  reading: 'on' | 'off' | 'undefined';
  /** NE 43 status of a 4–20 mA loop. */
  loop?: string;
  /** Fault cards acting on this row. */
  faults: string[];
  isLink: boolean;
};

/** A PLC address's value, with whether it is forced. */
export type PointValue = { value: number; forced: boolean };

/** A controller logical point: value, force, where it lives. */
export type ControllerPointSnapshot = PointValue & {
  ref: string;
  label: string;
  invert: boolean;
  rack: number;
  slot: number;
  channel: number;
  rowId: string;
};

/** Everything about the cell at `timeMs`. */
export type CellSnapshot = {
  timeMs: number;
  seed: number;
  devices: DeviceSnapshot[];
  wires: WireSnapshot[];
  plc: {
    scans: number;
    scanPeriodMs: number;
    /** Bytes of the I, Q and M areas up to the highest byte in use. */
    image: { I: number[]; Q: number[]; M: number[] };
    /** Every address the cell's wiring or forces touch, by canonical text. */
    addresses: Record<string, PointValue>;
    blockOutputs: BlockOutputs;
    moduleFaults: string[];
  };
  link: { kind: 'hardwired' | 'fieldbus'; healthy: boolean; lastUpdateMs: number | null };
  /** The 24 V control supply now (a supply-sag card lowers it) and whether it is within IEC 61131-2's 20.4–28.8 V. */
  supply: { volts: number; withinTolerance: boolean };
  controller: {
    state: ControllerStateName;
    /** Sub-state while e-stopped: braking (category 1) or halted. */
    detail: string | null;
    powered: boolean;
    servoOn: boolean;
    pc: number;
    stepElapsedMs: number;
    holdReason: 'guard' | 'stop' | null;
    cyclesCompleted: number;
    alarms: Alarm[];
    points: ControllerPointSnapshot[];
    handshake: Record<string, boolean>;
    pointMap: PointMapRow[];
    staged: PointMapRow[] | null;
    moduleFaults: string[];
    /** Physical channel values by `rack.slot` (inputs as read at the last refresh, outputs as driven). */
    channels: Record<string, number[]>;
  };
  arm: { pose: number[]; speed: number; moving: boolean; target: string | null };
  faults: { card: FaultCard; status: 'armed' | 'active'; since: number | null }[];
  forces: Record<string, number>;
};
