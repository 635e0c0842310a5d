/**
 * The PLC layer's public contract. Implementations live beside this file and are
 * re-exported from ./index.ts; callers import from there (or from simulator/index.ts).
 *
 * Scan model: the caller copies field inputs into the process image's I area, calls
 * `scan(state, image, dtMs)` once per PLC scan, then reads outputs from the Q area.
 * During the solve, contacts read the image directly (so a contact on %Q or %M sees what
 * a coil earlier in the execution order wrote this scan, and a coil later in the order
 * last scan's value — the usual seal-in behaviour), and coils write it directly.
 *
 * Execution order: topological over the connections; among blocks whose inputs are
 * ready, the one earliest in the sheet's `blocks` array runs first. Connections into a
 * PREV_BOOL / PREV_NUM block do not order anything: those blocks output last scan's value.
 *
 * Time: `dtMs` is the time since the previous scan (normally the sheet's scanPeriodMs).
 * A timer's ET is 0 on the scan its start condition appears and grows by dtMs on each
 * later scan, clamped at PT. Use whole milliseconds so sums stay exact.
 *
 * Ownership: `PlcState` and `ProcessImage` are mutable and owned by the caller; `scan`
 * updates both in place, deterministically. Snapshots: `clonePlcState`, or
 * `serializePlcState` for JSON.
 */
import type { ProcessImage } from '@/simulator/address/process-image';
import type { LogicSheet } from './sheet-schema';
import type { PortType } from './catalogue';

export type { Problem, Result } from '@/simulator/shared/result';
export type { ProcessImage } from '@/simulator/address/process-image';
export type { LogicSheet, LogicSheetInput, SheetBlock, SheetConnection } from './sheet-schema';
export type { BlockType, BlockSpec, PortSpec, PortType, BlockGroup } from './catalogue';

/**
 * Run-time state of a compiled sheet: every block output and every internal memory
 * (timer elapsed time, counter value, edge memory, latch, previous-scan value) as one
 * flat array of numbers (BOOLs as 0/1), plus a scan counter. Plain data.
 */
export type PlcState = {
  values: Float64Array;
  scans: number;
};

/** JSON-safe form of a {@link PlcState}; non-finite numbers are written as strings. */
export type SerializedPlcState = {
  values: (number | 'NaN' | 'Infinity' | '-Infinity')[];
  scans: number;
};

/** Live values of every block output, by block id and port name. */
export type BlockOutputs = Record<string, Record<string, boolean | number>>;

/** Where a block output lives in `PlcState.values`, for fast live reads on wires. */
export type OutputSlot = { block: string; port: string; type: PortType; slot: number };

/** A sheet compiled to straight-line code. Reusable: one compiled sheet, many states. */
export interface CompiledSheet {
  /** The validated sheet (defaults applied). */
  readonly sheet: LogicSheet;
  /** Block ids in execution order. */
  readonly order: string[];
  /** The sheet's scan period, ms. */
  readonly scanPeriodMs: number;
  /** Every output slot, in execution order. */
  readonly outputSlots: OutputSlot[];
  /** A fresh state: every output and memory at its IEC initial value (FALSE / 0 / PREV initial). */
  createState(): PlcState;
  /**
   * Solves the sheet once: reads and writes `image`, updates `state`, increments
   * `state.scans`. `dtMs` defaults to the scan period; a negative or non-finite dt is
   * treated as 0.
   */
  scan(state: PlcState, image: ProcessImage, dtMs?: number): void;
  /** Every block output's current value (BOOL ports as booleans). */
  readBlockOutputs(state: PlcState): BlockOutputs;
  /** One output's current value, or `undefined` for an unknown block or port. */
  readOutput(state: PlcState, blockId: string, port: string): boolean | number | undefined;
}

/** The slow, graph-walking reference interpreter used to check the compiler in tests. */
export interface InterpretedSheet {
  readonly order: string[];
  /** Solves once, mutating `image` and the interpreter's own state. */
  scan(image: ProcessImage, dtMs?: number): void;
  readBlockOutputs(): BlockOutputs;
}
