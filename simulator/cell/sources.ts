/**
 * What a source puts on a terminal-strip row: a contact (closed or open), a three-wire sensor
 * output (PNP or NPN, switched or not), a driven output (a PLC or controller output), an
 * analog signal (V or mA) or a word. The wiring turns these into what the destination reads.
 */
import { inputReading, sensorDrivesInput, type InputType } from '@/simulator/electrical';
import type { RowSink } from '@/simulator/schema/wiring-plan';

/** One source's signal on a row. */
export type Src =
  | { k: 'contact'; closed: boolean }
  | { k: 'sensor'; out: 'PNP' | 'NPN'; on: boolean; leakMa?: number }
  | { k: 'drive'; on: boolean }
  | { k: 'analog'; value: number; unit: 'V' | 'mA' }
  | { k: 'word'; value: number };

/** A reader of what a source puts on its row now (the fast path specialises one per row). */
export type SrcReader = () => Src;

// Shared immutable values, so the hot path allocates nothing per read.
export const OFF: Src = { k: 'drive', on: false };
export const DRIVE_ON: Src = { k: 'drive', on: true };
const CLOSED: Src = { k: 'contact', closed: true };
const OPEN: Src = { k: 'contact', closed: false };
/** A sensor's output, off ([0]) and switched ([1]), by output stage. */
export const SENSOR: Record<'PNP' | 'NPN', readonly [Src, Src]> = {
  PNP: [{ k: 'sensor', out: 'PNP', on: false }, { k: 'sensor', out: 'PNP', on: true }],
  NPN: [{ k: 'sensor', out: 'NPN', on: false }, { k: 'sensor', out: 'NPN', on: true }],
};
export const ZERO_WORD: Src = { k: 'word', value: 0 };

/** A contact's signal. */
export function contact(closed: boolean): Src {
  return closed ? CLOSED : OPEN;
}

/**
 * True when a source drives a digital input (puts the supply across it): a closed contact
 * always (it carries the supply), a switched output into a sinking input (it sources +24 V,
 * as a PNP stage does), a sensor whose output stage suits the input
 * ({@link sensorDrivesInput}).
 */
export function digitalOn(s: Src, sinking: boolean): boolean {
  return s.k === 'contact' ? s.closed : s.k === 'drive' ? s.on && sinking : s.k === 'sensor' ? s.on && sensorDrivesInput(s.out, sinking ? 'sinking' : 'sourcing') : false;
}

/**
 * The IEC 61131-2 type of a digital input: a PLC module's declared type; the controller's own
 * input channels are taken as type 1 (the document does not type them).
 */
export function inputTypeOf(sink: RowSink): InputType {
  return sink.kind === 'plc-bit' ? sink.module.inputType : 1;
}

/** True when the full supply reads ON on an input of this type (then a closed contact is simply ON). */
export function supplyReadsOn(supplyV: number, type: InputType): boolean {
  return inputReading(type, { volts: supplyV }).reading === 'on';
}
