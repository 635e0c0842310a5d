/**
 * A cell: panel, field devices, terminal strip, link, PLC and controller on one discrete
 * clock of whole milliseconds. The PLC scans every `scanPeriodMs`, the controller refreshes
 * its I/O every `ioRefreshMs`, a fieldbus exchanges every `updatePeriodMs`; the clock jumps
 * from one due instant to the next (nothing else can change in between), so an hour of cell
 * time costs only the work of its scans and refreshes.
 *
 * Order within one instant: timed fault cards → fieldbus exchange → PLC scan (read inputs,
 * solve, write outputs) → controller refresh (read inputs, step, write outputs) → triggered
 * fault cards → trace sample. Events from outside apply between instants, at the current time.
 *
 * Everything that varies is derived from the document, the event log and the seed, so a
 * replay gives the same trace.
 */
import { createActor, type Actor } from 'xstate';
import {
  createProcessImage,
  readAddress,
  writeAddress,
  setBit,
  setWord,
  parseAddress,
  formatAddress,
  type ProcessImage,
} from '@/simulator/address';
import type { CompiledSheet, PlcState } from '@/simulator/plc';
import {
  classifyDigitalInput,
  contactClosed,
  decodeWord,
  encodeWord,
  engineeringToSignal,
  ne43Status,
  signalToCounts,
  SIGNAL_SPANS,
  type InputReading,
} from '@/simulator/electrical';
import type { Problem, Result } from '@/simulator/shared/result';
import { HANDSHAKE_OUTPUT_ROLES, type CellDocument, type FieldDevice, type PanelDevice } from '@/simulator/schema/cell-document';
import { validateCellDocument, validateStagedRows, zodProblems } from '@/simulator/schema/validate';
import type { RowPlan, RowSink, RowSource } from '@/simulator/schema/wiring-plan';
import { controllerMachine, type ControllerStateName } from '@/simulator/controller/controller.machine';
import { evaluateCondition, initialControllerContext, isAtPose, roleOn, samplePath, type ControllerContext } from '@/simulator/controller/routine';
import { moveTime } from '@/simulator/controller/motion';
import {
  INPUT_FAMILIES,
  parsePointRef,
  resolvePointMap,
  restartPointMap,
  stagePointMap,
  type PointMapState,
  type ResolvedPoint,
  type ResolvedPointMap,
} from '@/simulator/controller/point-map';
import { chatterOpen, faultCardSchema, type FaultCard } from '@/simulator/faults/fault-card';
import { compilePredicate, type SignalValue } from '@/simulator/trace/predicate';
import { createTraceRecorder, type TraceRecorder, type Trace, type TraceSample } from '@/simulator/trace/trace';
import { nextScanMs } from './clock';
import { signalNamesFrom } from './signal-names';
import { cellEventSchema, type CellEvent, type DownloadEvent, type LoggedEvent } from './events';
import type { CellSnapshot, DeviceSnapshot, WireSnapshot } from './snapshot';

/** Options of {@link createCell}. */
export type CellOptions = {
  /** Fault cards armed from the start (a drill's hidden faults). */
  faults?: unknown[];
  /** Signals to record in the compact trace (see `signalNames` of the cell). */
  trace?: string[];
  /** Overrides the document's seed. */
  seed?: number;
};

/** A running cell. Every method returns a typed result instead of throwing. */
export type Cell = {
  /** Current cell time in ms. */
  readonly timeMs: number;
  /** Advances the clock by `ms` whole milliseconds (0 ≤ ms ≤ 30 days). */
  advance(ms: number): Result<{ timeMs: number }>;
  /** Applies an event now; a rejected event changes nothing. */
  apply(event: unknown): Result<{ timeMs: number }>;
  /** The full picture of the cell now. */
  snapshot(): CellSnapshot;
  /** Calls `listener` after every `advance`/`apply`; returns an unsubscribe function. */
  subscribe(listener: (snapshot: CellSnapshot) => void): () => void;
  /** The value of one named signal now, or an error for an unknown name. */
  readSignal(name: string): Result<SignalValue>;
  /** The names of every signal the cell exposes (for scope and rule pickers). */
  signalNames(): string[];
  /**
   * The accepted events with their times (replaying them reproduces the run), from index
   * `from` on (default 0: all of them); a UI reads only what is new since its last read.
   */
  eventLog(from?: number): LoggedEvent[];
  /** How many events have been accepted (the length of the whole log, without copying it). */
  readonly eventCount: number;
  /** The compact trace of the signals chosen in the options. */
  trace(): Trace;
  /**
   * Trace samples recorded from sample index `from` on, and `next`, the index to ask from
   * next time: an incremental read of {@link trace}'s `samples` (same signals, same order).
   */
  traceSince(from: number): { samples: TraceSample[]; next: number };
  /** Stops the controller actor and drops listeners; later calls are rejected. */
  dispose(): void;
};

type DevState = {
  dev: PanelDevice | FieldDevice;
  pressed: boolean;
  latched: boolean;
  position: number;
  value: number;
  active: boolean;
  cmd: boolean;
  pos: number;
  posAtMs: number;
  lamps: boolean[];
  display: number;
};

type Src =
  | { k: 'contact'; closed: boolean }
  | { k: 'sensor'; out: 'PNP' | 'NPN'; on: boolean }
  | { k: 'drive'; on: boolean }
  | { k: 'analog'; value: number; unit: 'V' | 'mA' }
  | { k: 'word'; value: number };

type RowFaults = { open: boolean; short24: boolean; short0: boolean; chatter: { index: number; periodMs: number; probability: number }[]; swapWith: number | null; ids: string[] };
type DevFaults = { stuckOn: boolean; stuckOff: boolean; mismatch: boolean; slow: number; drift: { rate: number; since: number } | null; loss: boolean };
type Reading = { level: number; unit: 'V' | 'mA' | 'word'; reading: InputReading; value: number; loop?: string };
type CardState = { card: FaultCard; status: 'armed' | 'active'; since: number | null; when: ((read: (n: string) => SignalValue) => boolean) | null };

const MAX_ADVANCE_MS = 30 * 86_400_000;
const ACTUATOR_RAMP_MS = 200;
const OFF: Src = { k: 'drive', on: false };
const DRIVE_ON: Src = { k: 'drive', on: true };
// Shared immutable results, so the hot path allocates nothing per read.
const CLOSED: Src = { k: 'contact', closed: true };
const OPEN: Src = { k: 'contact', closed: false };
const SENSOR: Record<'PNP' | 'NPN', [Src, Src]> = {
  PNP: [{ k: 'sensor', out: 'PNP', on: false }, { k: 'sensor', out: 'PNP', on: true }],
  NPN: [{ k: 'sensor', out: 'NPN', on: false }, { k: 'sensor', out: 'NPN', on: true }],
};
function contact(closed: boolean): Src {
  return closed ? CLOSED : OPEN;
}
const NO_WIRE_FAULT = { open: false, short24: false, short0: false };
/** The hardware causes of a healthy cell: one shared, frozen value, so an idle refresh allocates nothing. */
const NO_CAUSES = Object.freeze([]) as unknown as string[];

/** What a fault-free row delivers now (0/1, or the word); see `CellRuntime.buildFastRows`. */
type RowReader = () => number;
/** What a fault-free source puts on its row now. */
type SrcReader = () => Src;

/** True when a digital input sees a source as ON (the supply reaches it, for its wiring). */
function digitalOn(s: Src, sinking: boolean): boolean {
  return s.k === 'contact' ? s.closed : s.k === 'drive' ? s.on && sinking : s.k === 'sensor' ? s.on && (s.out === 'PNP') === sinking : false;
}

function err(code: string, message: string, path: (string | number)[] = []): { ok: false; errors: Problem[] } {
  return { ok: false, errors: [{ path, code, message }] };
}

function same(closed: boolean): boolean {
  return closed;
}
function alwaysClosed(): boolean {
  return true;
}
function alwaysOpen(): boolean {
  return false;
}
/** A stuck-on fault closes a device's contact (or lights its sensor) for good; stuck-off opens it. */
function stuckWith(f: DevFaults): (closed: boolean) => boolean {
  return f.stuckOn ? alwaysClosed : f.stuckOff ? alwaysOpen : same;
}

function zero(): SignalValue {
  return 0;
}


function travelMs(d: PanelDevice | FieldDevice): number {
  if (d.type === 'gripper') return d.travelMs;
  if (d.type === 'conveyor') return ACTUATOR_RAMP_MS;
  return 0;
}

/**
 * Creates a cell from a document of unknown shape. An invalid document, or invalid options,
 * yields every problem with its path and no cell.
 */
export function createCell(document: unknown, options: CellOptions = {}): Result<Cell, Problem> {
  const v = validateCellDocument(document);
  if (!v.ok) return v;
  const { document: doc, sheet, plans } = v.value;
  if (options.seed !== undefined && !(Number.isInteger(options.seed) && options.seed >= 0 && options.seed <= 0xffffffff)) {
    return err('invalid_seed', 'the seed must be an integer 0..4294967295', ['options', 'seed']);
  }
  const rt = new CellRuntime(doc, sheet, plans, options.seed ?? doc.seed);
  const problems: Problem[] = [];
  (options.faults ?? []).forEach((f, i) => {
    const r = rt.addFault(f);
    if (!r.ok) problems.push(...r.errors.map((p) => ({ ...p, path: ['options', 'faults', i, ...p.path] })));
  });
  if (options.trace) {
    const r = rt.setTrace(options.trace);
    if (!r.ok) problems.push(...r.errors.map((p) => ({ ...p, path: ['options', 'trace', ...p.path] })));
  }
  if (problems.length > 0) {
    rt.dispose();
    return { ok: false, errors: problems };
  }
  rt.start();
  return { ok: true, value: rt.api() };
}

class CellRuntime {
  now = 0;
  disposed = false;
  doc: CellDocument;
  sheet: CompiledSheet;
  plans: RowPlan[];
  readonly seed: number;
  readonly devs = new Map<string, DevState>();
  /** Device state by device object (identity lookups on the hot path). */
  readonly devOf = new Map<object, DevState>();
  readonly image: ProcessImage = createProcessImage();
  plcState: PlcState;
  scanMs: number;
  readonly refreshMs: number;
  readonly busMs: number | null;
  actor: Actor<typeof controllerMachine>;
  pointMap: PointMapState;
  resolved!: ResolvedPointMap;
  inPoints: ResolvedPoint[] = [];
  outPoints: ResolvedPoint[] = [];
  /** Channel arrays of `inPoints` / `outPoints` (null when no module sits at the point's rack/slot). */
  inArrs: (Float64Array | null)[] = [];
  outArrs: (Float64Array | null)[] = [];
  /** Channel array of each controller module, by module object (no string keys on the hot path). */
  readonly arrOf = new Map<object, Float64Array>();
  /** Inputs and hardware causes of the last refresh sent to the controller, to skip identical idle refreshes. */
  lastInputs: number[] = [];
  /** The refresh's input buffer, swapped with `lastInputs` when a refresh is sent (no allocation per refresh). */
  inputBuffer: number[] = [];
  /** Last raw word and its decoded value per input point (a WI point's word rarely changes). */
  wordRaw: number[] = [];
  wordValue: number[] = [];
  lastHardware = '';
  lastHardwareList: string[] = [];
  pendingDt = 0;
  readonly ctlIn = new Map<string, Float64Array>();
  readonly ctlOut = new Map<string, Float64Array>();
  plcInRows: number[] = [];
  ctlInRows: number[] = [];
  loadRows: number[] = [];
  /** Per row: a reader specialised to the objects it reads while the row is fault-free, else null. */
  fastRows: (RowReader | null)[] = [];
  /** Byte and bit mask in the I area of each PLC input row (`plcInRows` order; unused for word and analog rows). */
  plcInByte: number[] = [];
  plcInMask: number[] = [];
  /** Driven device of each load row (`loadRows` order). */
  loadDevs: DevState[] = [];
  /** Devices an output can command: the only ones that can be travelling. */
  actuators: DevState[] = [];
  /**
   * Whether what the wiring last delivered still holds, per consumer: the PLC's input bytes
   * (kept in `plcInCache`), the controller's input values (`lastInputs`) and the loads. Set
   * after a reading taken while nothing time-dependent was in play ({@link wiringSettled});
   * cleared by anything that can change a row's source — an event, a fault, the controller
   * writing its outputs, a PLC output byte that feeds a row, a device command.
   */
  plcInValid = false;
  ctlInValid = false;
  loadsValid = false;
  plcInCache: Uint8Array = new Uint8Array(0);
  /**
   * The Q bytes that rows read, as of the latest reading: while any reading is held, Q still
   * equals this copy (forces come as events, which invalidate), so a scan that leaves Q
   * different from it has changed what a row delivers.
   */
  qFedEnd = 0;
  qFed: Uint8Array = new Uint8Array(0);
  /** Every controller input module's channel array, and the one each controller input row feeds. */
  readonly ctlInArrs: Float64Array[] = [];
  ctlRowArrs: Float64Array[] = [];
  rowIndex = new Map<string, number>();
  prevReading: InputReading[];
  /** Bytes of the I area that wiring or forces can set (cleared before each scan). */
  inputBytes = 0;
  rowFaults: (RowFaults | null)[] = [];
  devFaults = new Map<string, DevFaults>();
  deadModules = new Set<string>();
  linkLoss = false;
  cards: CardState[] = [];
  forces = new Map<string, number>();
  busSrc: Src[][];
  lastBusMs: number | null = null;
  logicalIn: Record<string, number> = {};
  logicalOut: Record<string, number> = {};
  log: LoggedEvent[] = [];
  listeners = new Set<(s: CellSnapshot) => void>();
  recorder: TraceRecorder | null = null;
  readers = new Map<string, () => SignalValue>();
  /** Counts downloads; readers re-resolve their signal when it changes (see {@link reader}). */
  generation = 0;

  constructor(doc: CellDocument, sheet: CompiledSheet, plans: RowPlan[], seed: number) {
    this.doc = doc;
    this.sheet = sheet;
    this.plans = plans;
    this.seed = seed;
    this.plcState = sheet.createState();
    this.scanMs = sheet.scanPeriodMs;
    this.refreshMs = doc.controller.ioRefreshMs;
    this.busMs = doc.link.kind === 'fieldbus' ? doc.link.updatePeriodMs : null;
    this.pointMap = { live: doc.controller.pointMap, staged: doc.controller.staged };
    for (const m of doc.controller.modules) {
      const isIn = m.type === 'digital-in' || m.type === 'analog-in' || m.type === 'tool-in';
      const arr = new Float64Array(m.channels);
      (isIn ? this.ctlIn : this.ctlOut).set(`${m.rack}.${m.slot}`, arr);
      this.arrOf.set(m, arr);
    }
    this.setResolved(resolvePointMap(this.pointMap.live));
    const init = doc.initial.devices ?? {};
    for (const d of [...doc.panel, ...doc.field]) {
      const i = init[d.id] ?? {};
      const active = d.type === 'guard-switch' ? (i.guardClosed ?? i.active ?? true) : d.type === 'part-sensor' ? (i.partPresent ?? i.active ?? false) : (i.active ?? false);
      const value = d.type === 'potentiometer' ? Math.min(d.max, Math.max(d.min, i.value ?? d.min)) : (i.value ?? 0);
      const lamps = d.type === 'stack-light' ? d.tiers.map(() => false) : [false];
      const st: DevState = { dev: d, pressed: i.pressed ?? false, latched: i.latched ?? false, position: i.position ?? 0, value, active, cmd: false, pos: 0, posAtMs: 0, lamps, display: 0 };
      this.devs.set(d.id, st);
      this.devOf.set(d, st);
    }
    for (const m of doc.plc.modules) {
      if (m.kind === 'digital-out') continue;
      const last = m.kind === 'analog-in' ? m.address + m.channels * 2 : m.address + Math.ceil(m.channels / 8);
      this.inputBytes = Math.max(this.inputBytes, last);
    }
    this.ctlInArrs.push(...this.ctlIn.values());
    this.prevReading = [];
    this.busSrc = [];
    this.planWiring(plans);
    this.buildFastRows();
    this.actor = createActor(controllerMachine, { input: { config: doc.controller } });
  }

  /**
   * Resolves the wiring plan into the hot-path tables (row kinds, input bytes, loads, the Q
   * bytes rows read). Called once at creation and again when a download replaces the wiring;
   * an input keeps its last reading (transition band) when its row id survives.
   */
  planWiring(plans: RowPlan[]): void {
    const prev = new Map<string, InputReading>();
    const held = new Map<string, Src[]>();
    this.plans.forEach((p, i) => {
      prev.set(p.row.id, this.prevReading[i] ?? 'off');
      if (this.busSrc[i]) held.set(p.row.id, this.busSrc[i]);
    });
    this.plans = plans;
    this.rowIndex = new Map();
    this.plcInRows = [];
    this.ctlInRows = [];
    this.loadRows = [];
    this.plcInByte = [];
    this.plcInMask = [];
    this.loadDevs = [];
    this.actuators = [];
    this.ctlRowArrs = [];
    this.qFedEnd = 0;
    this.rowFaults = plans.map(() => null);
    plans.forEach((p, i) => {
      this.rowIndex.set(p.row.id, i);
      if (p.sink.kind === 'device') this.loadRows.push(i);
      else if (p.sink.kind === 'controller') this.ctlInRows.push(i);
      else this.plcInRows.push(i);
    });
    this.prevReading = plans.map((p) => prev.get(p.row.id) ?? 'off');
    // A link row that survives a download keeps what the fieldbus last exchanged on it.
    this.busSrc = plans.map((p) => {
      const h = held.get(p.row.id);
      return h && h.length === p.bits ? h : Array.from({ length: p.bits }, () => OFF);
    });
    // Hot-path tables, resolved once per wiring plan (at creation and on a download).
    for (const i of this.plcInRows) {
      const sink = plans[i].sink;
      const bit = sink.kind === 'plc-bit' ? (sink.address.bit ?? 0) : 0;
      this.plcInByte.push(sink.kind === 'plc-bit' ? sink.address.byte : 0);
      this.plcInMask.push(1 << bit);
    }
    const LIGHTS = ['numeric-display', 'stack-light', 'pilot-light', 'illuminated-button'];
    for (const i of this.loadRows) {
      const sink = plans[i].sink;
      if (sink.kind !== 'device') continue;
      const d = this.devs.get(sink.device.id)!;
      this.loadDevs.push(d);
      if (!LIGHTS.includes(d.dev.type) && !this.actuators.includes(d)) this.actuators.push(d);
    }
    for (const i of this.ctlInRows) {
      const sink = plans[i].sink;
      this.ctlRowArrs.push(sink.kind === 'controller' ? this.arrOf.get(sink.module)! : new Float64Array(0));
    }
    this.plcInCache = new Uint8Array(this.inputBytes);
    for (const p of plans) {
      const s = p.source;
      if (s.kind === 'plc-bit') this.qFedEnd = Math.max(this.qFedEnd, s.address.byte + 1);
      // A word source may span up to four bytes (a double word).
      if (s.kind === 'plc-word') this.qFedEnd = Math.max(this.qFedEnd, s.address.byte + 4);
    }
    this.qFedEnd = Math.min(this.qFedEnd, this.image.Q.length);
    this.qFed = new Uint8Array(this.qFedEnd);
  }

  /** Records the Q bytes a reading is being taken from (see `qFed`). */
  noteFedQ(): void {
    if (this.qFed.length > 0) this.qFed.set(this.image.Q.subarray(0, this.qFed.length));
  }

  /** Forgets every held wiring reading (see `plcInValid`). */
  invalidateWiring(): void {
    this.plcInValid = false;
    this.ctlInValid = false;
    this.loadsValid = false;
  }

  /**
   * True when no row's reading can change with time alone: no fault card (chatter, drift,
   * timed and triggered cards, link watchdogs), no fieldbus exchange, and every commanded
   * device at the end of its travel now. Readings taken then hold until an invalidation.
   */
  wiringSettled(): boolean {
    if (this.cards.length > 0 || this.busMs !== null) return false;
    const acts = this.actuators;
    for (let k = 0; k < acts.length; k++) {
      const d = acts[k];
      if (this.posAt(d, this.now) !== (d.cmd ? 1 : 0)) return false;
    }
    return true;
  }

  start(): void {
    this.actor.start();
    if (this.doc.initial.controllerPowered) this.actor.send({ type: 'POWER_ON' });
    this.updateLoads();
    this.writeControllerOutputs();
    this.sample();
  }

  setResolved(map: ResolvedPointMap): void {
    this.resolved = map;
    this.inPoints = [...map.byRef.values()].filter((p) => INPUT_FAMILIES.has(p.family));
    this.outPoints = [...map.byRef.values()].filter((p) => !INPUT_FAMILIES.has(p.family));
    this.inArrs = this.inPoints.map((p) => this.ctlIn.get(`${p.rack}.${p.slot}`) ?? null);
    this.outArrs = this.outPoints.map((p) => this.ctlOut.get(`${p.rack}.${p.slot}`) ?? null);
    this.lastInputs = [];
    this.ctlInValid = false;
    this.wordRaw = this.inPoints.map(() => NaN);
    this.wordValue = this.inPoints.map(() => 0);
  }

  // ---------------------------------------------------------------- devices

  /** Travel time (ms, full stroke) of an actuator now, including a slow-actuator fault. */
  strokeMs(d: DevState): number {
    const base = d.dev.type === 'vacuum-cup' ? (d.cmd ? d.dev.buildMs : d.dev.releaseMs) : travelMs(d.dev);
    return base * (this.devFaults.get(d.dev.id)?.slow ?? 1);
  }

  /**
   * An actuator's travel (0..1) at time `t`: a pure function of where it was when last
   * rebased (command change, fault change) — never of when it was read, so reading a
   * snapshot cannot change a run.
   */
  posAt(d: DevState, t: number): number {
    const target = d.cmd ? 1 : 0;
    const T = this.strokeMs(d);
    if (T <= 0) return target;
    const moved = (t - d.posAtMs) / T;
    return d.pos < target ? Math.min(target, d.pos + moved) : Math.max(target, d.pos - moved);
  }

  /** Fixes the actuator's travel at the current time as the new starting point. */
  rebase(d: DevState): void {
    d.pos = this.posAt(d, this.now);
    d.posAtMs = this.now;
  }

  /** When the actuator will reach its end, or null when it is at rest. */
  arrival(d: DevState): number | null {
    const target = d.cmd ? 1 : 0;
    if (d.pos === target) return null;
    const T = this.strokeMs(d);
    const end = d.posAtMs + Math.max(1, Math.ceil(Math.abs(target - d.pos) * T - 1e-9));
    return end > this.now ? end : null;
  }

  setCommand(d: DevState, on: boolean): void {
    if (d.cmd === on) return;
    this.rebase(d);
    d.cmd = on;
    this.invalidateWiring();
  }

  detecting(d: DevState): boolean {
    const f = this.devFaults.get(d.dev.id);
    if (f?.stuckOn) return true;
    if (f?.stuckOff) return false;
    return d.dev.type === 'photo-eye' && d.dev.mode === 'light-on' ? !d.active : d.active;
  }

  deviceSource(d: DevState, terminal: string): Src {
    const dev = d.dev;
    const f = this.devFaults.size > 0 ? this.devFaults.get(dev.id) : undefined;
    const stuck = f ? stuckWith(f) : same;
    switch (dev.type) {
      case 'push-button':
      case 'illuminated-button':
        return contact(stuck(contactClosed(dev.contact, dev.action === 'momentary' ? d.pressed : d.latched)));
      case 'selector-switch':
        return contact(stuck(terminal === `pos${d.position}`));
      case 'e-stop':
        return contact(stuck(contactClosed('NC', d.latched)));
      case 'guard-switch':
        return contact(stuck(contactClosed(dev.contact, !d.active)));
      case 'proximity-sensor':
      case 'photo-eye':
      case 'part-sensor': {
        const out = f?.mismatch ? (dev.output === 'PNP' ? 'NPN' : 'PNP') : dev.output;
        return SENSOR[out][this.detecting(d) ? 1 : 0];
      }
      case 'gripper': {
        const pos = this.posAt(d, this.now);
        return contact(terminal === 'closed' ? stuck(pos >= 1) : pos <= 0);
      }
      case 'vacuum-cup': {
        const pos = this.posAt(d, this.now);
        return contact(stuck(d.cmd ? pos >= 1 : pos > 0));
      }
      case 'conveyor':
        return contact(stuck(this.posAt(d, this.now) >= 1));
      case 'potentiometer': {
        const unit = SIGNAL_SPANS[dev.signal].unit;
        if (f?.loss) return { k: 'analog', value: 0, unit };
        let value = engineeringToSignal(d.value, dev.signal, dev.min, dev.max);
        if (f?.drift) value += (f.drift.rate * (this.now - f.drift.since)) / 1000;
        return { k: 'analog', value, unit };
      }
      default:
        return OFF;
    }
  }

  // ---------------------------------------------------------------- wiring

  moduleDead(id: string): boolean {
    return this.deadModules.size > 0 && this.deadModules.has(id);
  }

  linkHealthy(): boolean {
    if (this.busMs === null) return !this.linkLoss;
    if (!this.linkLoss) return true;
    const w = this.doc.link.kind === 'fieldbus' ? this.doc.link.watchdogMs : 0;
    return this.lastBusMs !== null && this.now - this.lastBusMs < w;
  }

  /** The signal a source puts on a row, bit `bit` for word rows. */
  sourceNow(s: RowSource, bit: number, bits: number): Src {
    switch (s.kind) {
      case 'device':
        return this.deviceSource(this.devOf.get(s.device)!, s.terminal);
      case 'plc-bit':
        return ((this.image.Q[s.address.byte] >> (s.address.bit ?? 0)) & 1) === 1 && !this.moduleDead(s.module.id) ? DRIVE_ON : OFF;
      case 'plc-word': {
        if (this.moduleDead(s.module.id)) return { k: 'word', value: 0 };
        const w = readAddress(this.image, s.address);
        return { k: 'word', value: bits >= 32 ? w : w % 2 ** bits };
      }
      case 'controller': {
        const m = s.module;
        const v = this.moduleDead(m.id) ? 0 : (this.arrOf.get(m)?.[s.channel + bit] ?? 0);
        if (m.type === 'analog-out') return { k: 'analog', value: v, unit: m.signal ? SIGNAL_SPANS[m.signal].unit : 'V' };
        return v !== 0 ? DRIVE_ON : OFF;
      }
    }
  }

  /** Source of row `i` (through a swapped-wires fault), bit `bit`. */
  rowSource(i: number, bit: number): Src {
    const f = this.rowFaults[i];
    const j = f?.swapWith ?? i;
    const p = this.plans[j];
    if (p.isLink) {
      if (!this.linkHealthy()) return p.source.kind === 'plc-word' ? { k: 'word', value: 0 } : OFF;
      if (this.busMs !== null) return this.busSrc[j][Math.min(bit, this.busSrc[j].length - 1)];
    }
    if (p.bits > 1 && p.source.kind === 'controller') return this.sourceNow(p.source, bit, p.bits);
    return this.sourceNow(p.source, 0, p.bits);
  }

  wireState(i: number): { open: boolean; short24: boolean; short0: boolean } {
    const f = this.rowFaults[i];
    if (f === null && !this.linkLoss) return NO_WIRE_FAULT;
    let open = f?.open ?? false;
    if (f && f.chatter.length > 0) {
      for (const c of f.chatter) if (chatterOpen(this.seed, c.index, c.periodMs, c.probability, this.now)) open = true;
    }
    if (this.linkLoss && this.busMs === null && this.plans[i].isLink) open = true;
    return { open, short24: f?.short24 ?? false, short0: f?.short0 ?? false };
  }

  /**
   * Specialises the reading of every fault-free row into a closure over exactly the objects
   * it reads (the device state, the Q byte, the controller channel), so the scan and the
   * refresh skip the generic source → wire → input walk and its lookups. Faults, dead
   * modules and link loss change only in {@link rebuildFaults}, which rebuilds these; a row
   * they touch keeps the generic path. Each reader gives what the generic path gives.
   */
  buildFastRows(): void {
    this.fastRows = this.plans.map((p, i) => (this.linkLoss || this.rowFaults[i] !== null ? null : this.fastRow(p, i)));
  }

  fastRow(p: RowPlan, i: number): RowReader | null {
    const sink = p.sink;
    if (sink.kind === 'plc-analog' || (sink.kind === 'controller' && sink.module.type === 'analog-in')) return null;
    if (p.bits === 1 && sink.kind === 'device' && sink.terminalKind === 'load') {
      const src = this.fastSource(p, i, 0);
      if (!src) return null;
      return () => {
        const s = src();
        return s.k === 'drive' && s.on ? 1 : 0;
      };
    }
    if (p.bits === 1 && (sink.kind === 'plc-bit' || sink.kind === 'controller')) {
      const src = this.fastSource(p, i, 0);
      if (!src) return null;
      const sinking = sink.kind === 'plc-bit' ? sink.module.wiring === 'sinking' : true;
      const prev = this.prevReading;
      return () => {
        const on = digitalOn(src(), sinking);
        prev[i] = on ? 'on' : 'off';
        return on ? 1 : 0;
      };
    }
    if (p.bits > 1 || sink.kind === 'plc-word-bits' || (sink.kind === 'device' && sink.terminalKind === 'word')) {
      if (p.source.kind === 'controller') {
        const bits: SrcReader[] = [];
        for (let b = 0; b < p.bits; b++) {
          const src = this.fastSource(p, i, b);
          if (!src) return null;
          bits.push(src);
        }
        return () => {
          let word = 0;
          for (let b = 0; b < bits.length; b++) {
            const s = bits[b]();
            if (s.k === 'drive' && s.on) word |= 1 << b;
          }
          return word;
        };
      }
      const src = this.fastSource(p, i, 0);
      if (!src) return null;
      return () => {
        const s = src();
        return s.k === 'word' ? s.value : 0;
      };
    }
    return null;
  }

  /**
   * A reader of what row `i`'s fault-free source puts on it (bit `bit` of a controller word
   * source), matching {@link rowSource}; null where only the generic path is worth having.
   */
  fastSource(p: RowPlan, i: number, bit: number): SrcReader | null {
    if (p.isLink && this.busMs !== null) {
      const held = this.busSrc[i];
      const k = Math.min(bit, held.length - 1);
      return () => held[k];
    }
    const s = p.source;
    switch (s.kind) {
      case 'plc-bit': {
        if (this.moduleDead(s.module.id)) return null;
        const img = this.image;
        const byte = s.address.byte;
        const shift = s.address.bit ?? 0;
        return () => (((img.Q[byte] >> shift) & 1) === 1 ? DRIVE_ON : OFF);
      }
      case 'plc-word': {
        if (this.moduleDead(s.module.id)) return null;
        const img = this.image;
        const addr = s.address;
        const bits = p.bits;
        return () => {
          const w = readAddress(img, addr);
          return { k: 'word', value: bits >= 32 ? w : w % 2 ** bits };
        };
      }
      case 'controller': {
        const m = s.module;
        if (this.moduleDead(m.id) || m.type === 'analog-out') return null;
        const arr = this.arrOf.get(m);
        const ch = s.channel + (p.bits > 1 ? bit : 0);
        if (!arr) return () => OFF;
        return () => ((arr[ch] ?? 0) !== 0 ? DRIVE_ON : OFF);
      }
      case 'device':
        return this.fastDeviceSource(this.devOf.get(s.device)!, s.terminal);
    }
  }

  /** {@link deviceSource} for a device without device faults, specialised to its type and terminal. */
  fastDeviceSource(d: DevState, terminal: string): SrcReader | null {
    const dev = d.dev;
    if (this.devFaults.has(dev.id)) return null;
    switch (dev.type) {
      case 'push-button':
      case 'illuminated-button': {
        // contactClosed(kind, actuated): an NO contact is closed when actuated, an NC one when not.
        const no = dev.contact === 'NO';
        return dev.action === 'momentary' ? () => contact(d.pressed === no) : () => contact(d.latched === no);
      }
      case 'selector-switch': {
        // Closed when the terminal is `pos<position>`; a terminal of any other shape never closes.
        const m = /^pos(0|[1-9]\d*)$/.exec(terminal);
        const at = m ? Number(m[1]) : -1;
        return () => contact(d.position === at);
      }
      case 'e-stop':
        return () => contact(!d.latched);
      case 'guard-switch': {
        const no = dev.contact === 'NO';
        return () => contact(!d.active === no);
      }
      case 'proximity-sensor':
      case 'photo-eye':
      case 'part-sensor': {
        const pair = SENSOR[dev.output];
        const inverted = dev.type === 'photo-eye' && dev.mode === 'light-on';
        return inverted ? () => pair[d.active ? 0 : 1] : () => pair[d.active ? 1 : 0];
      }
      case 'gripper':
        return terminal === 'closed' ? () => contact(this.posAt(d, this.now) >= 1) : () => contact(this.posAt(d, this.now) <= 0);
      case 'vacuum-cup':
        return () => {
          const pos = this.posAt(d, this.now);
          return contact(d.cmd ? pos >= 1 : pos > 0);
        };
      case 'conveyor':
        return () => contact(this.posAt(d, this.now) >= 1);
      case 'potentiometer':
        return null;
      default:
        return () => OFF;
    }
  }

  /**
   * The value row `i` delivers (0/1 for digital rows): a fast path for fault-free digital rows,
   * where the input sees either the full supply or nothing (ON or OFF for every input type).
   */
  readValue(i: number): number {
    const fast = this.fastRows[i];
    if (fast !== null) return fast();
    const p = this.plans[i];
    if (p.bits === 1 && this.rowFaults[i] === null && !this.linkLoss) {
      const sink = p.sink;
      if (sink.kind === 'device' && sink.terminalKind === 'load') {
        const src = this.rowSource(i, 0);
        return src.k === 'drive' && src.on ? 1 : 0;
      }
      const digital = sink.kind === 'plc-bit' || (sink.kind === 'controller' && sink.module.type !== 'analog-in');
      if (digital) {
        const src = this.rowSource(i, 0);
        const sinking = sink.kind === 'plc-bit' ? sink.module.wiring === 'sinking' : true;
        const on = src.k === 'contact' ? src.closed : src.k === 'drive' ? src.on && sinking : src.k === 'sensor' ? src.on && (src.out === 'PNP') === sinking : false;
        this.prevReading[i] = on ? 'on' : 'off';
        return on ? 1 : 0;
      }
    }
    return this.readRow(i, true).value;
  }

  /**
   * What the destination of row `i` sees now. Only the scan and the refresh `commit` a
   * reading as the input's last state (used inside the transition band); snapshots and
   * signal reads leave the cell untouched.
   */
  readRow(i: number, commit = false): Reading {
    const p = this.plans[i];
    const sink = p.sink;
    const w = this.wireState(i);
    if (sink.kind === 'plc-analog' || (sink.kind === 'controller' && sink.module.type === 'analog-in')) {
      const src = this.rowSource(i, 0);
      const range = sink.kind === 'plc-analog' ? sink.module.signal : (sink.module.signal ?? '0-10V');
      const unit = SIGNAL_SPANS[range].unit;
      let value = src.k === 'analog' ? src.value : 0;
      if (w.open || w.short0) value = 0;
      else if (w.short24) value = unit === 'V' ? 24 : 22; // a loop shorted to the supply drives the current past NE 43's failure level
      return { level: value, unit, reading: 'off', value, loop: unit === 'mA' ? ne43Status(value) : undefined };
    }
    if (p.bits > 1 || sink.kind === 'plc-word-bits' || (sink.kind === 'device' && sink.terminalKind === 'word')) {
      let word = 0;
      if (!w.open && !w.short0) {
        if (p.source.kind === 'controller') {
          for (let b = 0; b < p.bits; b++) {
            const s = this.rowSource(i, b);
            if (s.k === 'drive' && s.on) word |= 1 << b;
          }
        } else {
          const s = this.rowSource(i, 0);
          word = s.k === 'word' ? s.value : 0;
        }
        if (w.short24) word = 2 ** p.bits - 1;
      }
      return { level: word, unit: 'word', reading: word !== 0 ? 'on' : 'off', value: word };
    }
    const src = this.rowSource(i, 0);
    if (sink.kind === 'device') {
      const on = w.short24 || (!w.open && !w.short0 && src.k === 'drive' && src.on);
      return { level: on ? 24 : 0, unit: 'V', reading: on ? 'on' : 'off', value: on ? 1 : 0 };
    }
    const sinking = sink.kind === 'plc-bit' ? sink.module.wiring === 'sinking' : true;
    const inputType = sink.kind === 'plc-bit' ? sink.module.inputType : 1;
    let volts: number;
    if (w.short24) volts = sinking ? 24 : 0;
    else if (w.short0) volts = sinking ? 0 : 24;
    else if (w.open) volts = 0;
    else if (src.k === 'contact') volts = src.closed ? 24 : 0;
    else if (src.k === 'drive') volts = src.on && sinking ? 24 : 0;
    else if (src.k === 'sensor') volts = src.on && (src.out === 'PNP') === sinking ? 24 : 0;
    else volts = 0;
    const reading = classifyDigitalInput(volts, inputType);
    // In the transition band an input keeps its last state (what a real input most often does).
    const value = reading === 'on' ? 1 : reading === 'off' ? 0 : this.prevReading[i] === 'on' ? 1 : 0;
    if (reading !== 'undefined' && commit) this.prevReading[i] = reading;
    return { level: volts, unit: 'V', reading, value };
  }

  sinkModuleDead(sink: RowSink): boolean {
    if (sink.kind === 'device') return false;
    return this.moduleDead(sink.module.id);
  }

  // ---------------------------------------------------------------- PLC

  scanPlc(): void {
    // Every input bit is rewritten from the wiring each scan; unwired bits read 0.
    const I = this.image.I;
    if (this.plcInValid) I.set(this.plcInCache);
    else this.readPlcInputs(I);
    this.applyPlcForces('I');
    this.sheet.scan(this.plcState, this.image, this.scanMs);
    this.applyPlcForces('Q');
    this.applyPlcForces('M');
    // A row fed by an output byte the scan (or a force) changed reads anew.
    const Q = this.image.Q;
    const fed = this.qFed;
    for (let b = 0; b < fed.length; b++) {
      if (fed[b] !== Q[b]) {
        fed.set(Q.subarray(0, fed.length));
        this.invalidateWiring();
        break;
      }
    }
    this.updateLoads();
  }

  /** Writes the wiring's view of every PLC input into the first `inputBytes` of I, and keeps a copy. */
  readPlcInputs(I: Uint8Array): void {
    I.fill(0, 0, this.inputBytes);
    const rows = this.plcInRows;
    for (let k = 0; k < rows.length; k++) {
      const i = rows[k];
      const p = this.plans[i];
      const sink = p.sink;
      if (this.deadModules.size > 0 && this.sinkModuleDead(sink)) continue;
      if (sink.kind === 'plc-bit') {
        if (this.readValue(i) !== 0) I[this.plcInByte[k]] |= this.plcInMask[k];
        continue;
      }
      const r = this.readRow(i, true);
      if (sink.kind === 'plc-word-bits') {
        for (let b = 0; b < p.bits; b++) {
          const ch = sink.module.address * 8 + sink.channel + b;
          setBit(this.image, 'I', ch >> 3, ch & 7, ((r.value >> b) & 1) === 1);
        }
      } else if (sink.kind === 'plc-analog') {
        const counts = signalToCounts(r.value, { range: sink.module.signal, bits: sink.module.resolutionBits });
        setWord(this.image, 'I', sink.address.byte, counts & 0xffff);
      }
    }
    this.plcInCache.set(I.subarray(0, this.inputBytes));
    this.plcInValid = this.wiringSettled();
    this.noteFedQ();
  }

  applyPlcForces(area: 'I' | 'Q' | 'M'): void {
    if (this.forces.size === 0) return;
    for (const [t, v] of this.forces) if (t.startsWith(`%${area}`)) writeAddress(this.image, t, v);
  }

  updateLoads(): void {
    // Re-applying the same readings would change nothing (same lamps, same display, same commands).
    if (this.loadsValid) return;
    // Valid once applied, unless a command changes below (which invalidates).
    this.loadsValid = this.wiringSettled();
    this.noteFedQ();
    const rows = this.loadRows;
    for (let k = 0; k < rows.length; k++) {
      const i = rows[k];
      const sink = this.plans[i].sink;
      if (sink.kind !== 'device') continue;
      const d = this.loadDevs[k];
      const dev = d.dev;
      const value = this.readValue(i);
      if (dev.type === 'numeric-display') {
        const dec = decodeWord(value & 0xffff, dev.encoding, 16);
        d.display = dec.ok ? dec.value : -1; // a word that is not valid in the display's encoding (e.g. a BCD nibble above 9)
      } else if (dev.type === 'stack-light') {
        d.lamps[Number(sink.terminal.slice(4))] = value !== 0;
      } else if (dev.type === 'pilot-light' || dev.type === 'illuminated-button') {
        d.lamps[0] = value !== 0;
      } else this.setCommand(d, value !== 0);
    }
  }

  // ---------------------------------------------------------------- controller

  refreshController(): void {
    // Held readings are exactly what the last refresh read (`lastInputs` always ends up
    // holding those), and the input channels still show them.
    const values = this.ctlInValid ? this.lastInputs : this.readControllerInputs();
    const hardware = this.hardwareCauses();
    const hwKey = hardware.length === 0 ? '' : hardware.join('\n');
    if (this.canCoast(values, hwKey)) {
      // Nothing the controller reads has changed and the refresh would only let time pass
      // (idle, or mid-move with the move not ending yet): the time is handed over with the
      // next refresh that matters. Exact, because motion is a closed-form function of time.
      this.pendingDt += this.refreshMs;
      return;
    }
    this.sendRefresh(values, hardware, hwKey);
  }

  /** Reads the controller's input rows into its channels, and its logical input values into `inputBuffer`. */
  readControllerInputs(): number[] {
    const ins = this.ctlInArrs;
    for (let k = 0; k < ins.length; k++) ins[k].fill(0);
    const rows = this.ctlInRows;
    for (let k = 0; k < rows.length; k++) {
      const i = rows[k];
      const p = this.plans[i];
      const sink = p.sink;
      if (sink.kind !== 'controller' || (this.deadModules.size > 0 && this.sinkModuleDead(sink))) continue;
      const arr = this.ctlRowArrs[k];
      const v = this.readValue(i);
      if (p.bits > 1) for (let b = 0; b < p.bits; b++) arr[sink.channel + b] = (v >> b) & 1;
      else arr[sink.channel] = v;
    }
    const pts = this.inPoints;
    if (this.inputBuffer.length !== pts.length) this.inputBuffer = new Array<number>(pts.length);
    const values = this.inputBuffer;
    for (let k = 0; k < pts.length; k++) {
      const pt = pts[k];
      const arr = this.inArrs[k];
      let v = 0;
      if (!arr) v = 0;
      else if (pt.family === 'WI') {
        let raw = 0;
        for (let b = 0; b < pt.bits; b++) if (arr[pt.channel + b] !== 0) raw |= 1 << b;
        if (raw === this.wordRaw[k]) v = this.wordValue[k];
        else {
          const dec = decodeWord(raw, pt.encoding, pt.bits);
          v = dec.ok ? dec.value : -1;
          this.wordRaw[k] = raw;
          this.wordValue[k] = v;
        }
      } else if (pt.family === 'AI') v = arr[pt.channel];
      else v = (arr[pt.channel] !== 0) !== pt.invert ? 1 : 0;
      if (this.forces.size > 0) {
        const f = this.forces.get(pt.ref);
        if (f !== undefined) v = f;
      }
      values[k] = v;
    }
    this.ctlInValid = this.wiringSettled();
    this.noteFedQ();
    return values;
  }

  /** Sends one refresh's inputs (and any time held back) to the controller, then writes its outputs. */
  sendRefresh(values: number[], hardware: string[], hwKey: string): void {
    // Time held back in a wait or pause reaches that step first, with the inputs it was held
    // under: a wait that new inputs end hands the rest of its refresh to the next step, which
    // must get this refresh's time only, as it would have without coasting.
    if (this.pendingDt > 0 && this.inTimedStep(this.ctx())) this.syncController();
    const inputs: Record<string, number> = {};
    const pts = this.inPoints;
    for (let k = 0; k < pts.length; k++) inputs[pts[k].ref] = values[k];
    for (const [t, v] of this.forces) {
      if (t.startsWith('%') || inputs[t] !== undefined) continue;
      const p = parsePointRef(t);
      if (p && INPUT_FAMILIES.has(p.family)) inputs[t] = v;
    }
    this.logicalIn = inputs;
    // The buffers swap: this refresh's values become the reference, the old reference the next buffer.
    if (values !== this.lastInputs) {
      this.inputBuffer = this.lastInputs;
      this.lastInputs = values;
    }
    this.lastHardware = hwKey;
    this.lastHardwareList = hardware;
    const dt = this.refreshMs + this.pendingDt;
    this.pendingDt = 0;
    this.actor.send({ type: 'TICK', dt, inputs, hardware });
    this.writeControllerOutputs();
  }

  /** Hands time held back by {@link canCoast} to the controller before anything else reaches it. */
  syncController(): void {
    if (this.pendingDt === 0) return;
    const dt = this.pendingDt;
    this.pendingDt = 0;
    this.actor.send({ type: 'TICK', dt, inputs: this.logicalIn, hardware: this.lastHardwareList });
  }

  /**
   * True when this refresh may be held back: the controller reads exactly what it read at the
   * last refresh sent, and running it would only let time pass — no pulse, cycle-done signal,
   * wait timeout, pause or move would end by the time it covers. Edges are off (the inputs
   * repeat), so no guard can change its mind either. Exact: the held-back time is handed over
   * in one TICK, and every time sum the machine keeps (`timeMs`, `stepElapsedMs`, a move's
   * `elapsedMs`) adds up the same.
   */
  canCoast(values: number[], hwKey: string): boolean {
    if (hwKey !== this.lastHardware || values.length !== this.lastInputs.length) return false;
    for (let k = 0; k < values.length; k++) if (values[k] !== this.lastInputs[k]) return false;
    const snap = this.actor.getSnapshot();
    const ctx = snap.context;
    // The controller's clock once this refresh had run.
    const until = ctx.timeMs + this.pendingDt + this.refreshMs;
    for (let k = 0; k < ctx.pulses.length; k++) if (until >= ctx.pulses[k].untilMs) return false;
    if (ctx.timeMs < ctx.cycleDoneUntilMs && until >= ctx.cycleDoneUntilMs) return false;
    const v = snap.value;
    if (v === 'cycling') {
      const m = ctx.motion;
      const step = ctx.config.routine[ctx.pc];
      if (!step) return false;
      const stepUntil = ctx.stepElapsedMs + this.pendingDt + this.refreshMs;
      if (m === null && step.kind === 'wait') {
        // The condition was false at the last refresh with these inputs and outputs.
        return !evaluateCondition(ctx, step.condition) && (step.timeoutMs === undefined || stepUntil < step.timeoutMs);
      }
      if (m === null && step.kind === 'pause') return stepUntil < step.ms;
      if (!m || m.kind !== 'move') return false;
      if (step.kind !== 'move' || step.pose !== m.poseId) return false;
      return m.elapsedMs + this.pendingDt + this.refreshMs < moveTime(m.length, m.vmax, m.amax) * 1000;
    }
    if (ctx.motion !== null) return false;
    // Holding at rest: the refresh would only confirm speed 0 (resuming needs a start edge).
    if (v === 'holding') return ctx.speed === 0;
    return v === 'ready' || v === 'stopped' || v === 'faulted' || v === 'off' || (typeof v === 'object' && (v as Record<string, string>).eStopped === 'halted');
  }

  /** True when the routine sits in a wait or pause step (the steps that count `stepElapsedMs`). */
  inTimedStep(ctx: ControllerContext): boolean {
    if (ctx.motion !== null || this.actor.getSnapshot().value !== 'cycling') return false;
    const step = ctx.config.routine[ctx.pc];
    return step !== undefined && (step.kind === 'wait' || step.kind === 'pause');
  }

  /** Time spent in the current step, including time held back by {@link canCoast}. */
  stepElapsedNow(ctx: ControllerContext): number {
    return this.pendingDt > 0 && this.inTimedStep(ctx) ? ctx.stepElapsedMs + this.pendingDt : ctx.stepElapsedMs;
  }

  /** Arm pose and speed now, including time held back while coasting through a move. */
  armNow(): { pose: number[]; speed: number; moving: boolean } {
    const ctx = this.ctx();
    if (this.pendingDt > 0 && ctx.motion) {
      const s = samplePath(ctx.motion, ctx.motion.elapsedMs + this.pendingDt);
      return { pose: s.pose, speed: s.speed, moving: true };
    }
    return { pose: ctx.pose, speed: ctx.speed, moving: ctx.motion !== null };
  }

  hardwareCauses(): string[] {
    if (this.deadModules.size === 0 && !this.linkLoss) return NO_CAUSES;
    const causes: string[] = [];
    for (const m of this.doc.controller.modules) if (this.moduleDead(m.id)) causes.push(`module "${m.id}" (rack ${m.rack} slot ${m.slot}) failed`);
    if (this.busMs !== null && !this.linkHealthy()) causes.push('fieldbus link lost');
    return causes;
  }

  ctx(): ControllerContext {
    return this.actor.getSnapshot().context;
  }

  stateName(): { state: ControllerStateName; detail: string | null } {
    const v = this.actor.getSnapshot().value as string | Record<string, string>;
    if (typeof v === 'string') return { state: v as ControllerStateName, detail: null };
    const k = Object.keys(v)[0] as ControllerStateName;
    return { state: k, detail: v[k] ?? null };
  }

  handshakeOutputs(): Record<string, boolean> {
    const ctx = this.ctx();
    const { state } = this.stateName();
    const powered = state !== 'off' && state !== 'booting';
    return {
      ready: state === 'ready',
      atHome: powered && isAtPose(ctx, ctx.config.homePose),
      cycling: state === 'cycling' || state === 'holding',
      atPosition: powered && isAtPose(ctx, ctx.lastTarget),
      partHeld: powered && roleOn(ctx, 'partHeld', false),
      cycleDone: powered && ctx.timeMs < ctx.cycleDoneUntilMs,
      fault: state === 'faulted',
    };
  }

  writeControllerOutputs(): void {
    this.invalidateWiring();
    const ctx = this.ctx();
    const { state } = this.stateName();
    const out: Record<string, number> = {};
    if (state !== 'off') {
      for (const k in ctx.outputs) out[k] = ctx.outputs[k];
      const hs = this.handshakeOutputs();
      const roles = ctx.config.handshake.outputs as Record<string, string | undefined>;
      for (const role in roles) {
        const ref = roles[role];
        if (ref) out[ref] = hs[role] ? 1 : 0;
      }
    }
    for (const [t, v] of this.forces) if (!t.startsWith('%')) {
      const p = parsePointRef(t);
      if (p && !INPUT_FAMILIES.has(p.family)) out[t] = v;
    }
    this.logicalOut = out;
    for (const a of this.ctlOut.values()) a.fill(0);
    for (let k = 0; k < this.outPoints.length; k++) {
      const pt = this.outPoints[k];
      const arr = this.outArrs[k];
      if (!arr) continue;
      const v = out[pt.ref] ?? 0;
      if (pt.family === 'WO') {
        const enc = encodeWord(Math.max(0, Math.trunc(v)), ctx.wordEncodings[pt.ref] ?? pt.encoding, pt.bits);
        const raw = enc.ok ? enc.value : 0;
        for (let b = 0; b < pt.bits; b++) arr[pt.channel + b] = (raw >> b) & 1;
      } else if (pt.family === 'AO') arr[pt.channel] = v;
      else arr[pt.channel] = (v !== 0) !== pt.invert ? 1 : 0;
    }
    this.updateLoads();
  }

  // ---------------------------------------------------------------- fieldbus

  exchangeBus(): void {
    if (this.linkLoss) return;
    for (let i = 0; i < this.plans.length; i++) {
      const p = this.plans[i];
      if (!p.isLink) continue;
      const arr = this.busSrc[i];
      for (let b = 0; b < arr.length; b++) arr[b] = p.source.kind === 'controller' ? this.sourceNow(p.source, b, p.bits) : this.sourceNow(p.source, 0, p.bits);
    }
    this.lastBusMs = this.now;
  }

  // ---------------------------------------------------------------- faults

  addFault(input: unknown): Result<{ timeMs: number }> {
    const parsed = faultCardSchema.safeParse(input);
    if (!parsed.success) return { ok: false, errors: zodProblems(parsed.error.issues) };
    const card = parsed.data;
    const problems: Problem[] = [];
    if (this.cards.some((c) => c.card.id === card.id)) problems.push({ path: ['id'], code: 'duplicate_id', message: `fault card "${card.id}" already exists` });
    const device = (id: string, types: string[] | null, path: string[]) => {
      const d = this.devs.get(id);
      if (!d) problems.push({ path, code: 'unknown_device', message: `no device "${id}"` });
      else if (types && !types.includes(d.dev.type)) problems.push({ path, code: 'wrong_device_type', message: `a ${card.kind} fault needs a ${types.join(' or ')}, "${id}" is a ${d.dev.type}` });
    };
    const row = (id: string, path: (string | number)[]) => {
      if (!this.rowIndex.has(id)) problems.push({ path, code: 'unknown_row', message: `no wiring row "${id}"` });
    };
    const SENSORS = ['proximity-sensor', 'photo-eye', 'part-sensor'];
    switch (card.kind) {
      case 'stuck-on':
      case 'stuck-off':
        device(card.device, ['push-button', 'illuminated-button', 'selector-switch', 'e-stop', 'guard-switch', 'gripper', 'vacuum-cup', 'conveyor', ...SENSORS], ['device']);
        break;
      case 'open-wire':
      case 'short-24v':
      case 'short-0v':
      case 'chatter':
        row(card.row, ['row']);
        break;
      case 'swapped-wires':
        row(card.rows[0], ['rows', 0]);
        row(card.rows[1], ['rows', 1]);
        if (card.rows[0] === card.rows[1]) problems.push({ path: ['rows'], code: 'same_row', message: 'swapped wires need two different rows' });
        else if (problems.length === 0) {
          const a = this.plans[this.rowIndex.get(card.rows[0])!];
          const b = this.plans[this.rowIndex.get(card.rows[1])!];
          if (a.bits !== b.bits || a.sink.kind !== b.sink.kind || a.isLink !== b.isLink) problems.push({ path: ['rows'], code: 'incompatible_rows', message: 'only rows of the same kind can be swapped' });
        }
        break;
      case 'dead-module':
        if (!this.doc.plc.modules.some((m) => m.id === card.module) && !this.doc.controller.modules.some((m) => m.id === card.module)) {
          problems.push({ path: ['module'], code: 'unknown_module', message: `no PLC or controller module "${card.module}"` });
        }
        break;
      case 'link-loss':
        break;
      case 'slow-actuator':
        device(card.device, ['gripper', 'vacuum-cup', 'conveyor'], ['device']);
        break;
      case 'analog-drift':
      case 'analog-loss':
        device(card.device, ['potentiometer'], ['device']);
        break;
      case 'sensor-type-mismatch':
        device(card.device, SENSORS, ['device']);
        break;
    }
    let when: CardState['when'] = null;
    if (card.when) {
      const c = compilePredicate(card.when, (n) => this.reader(n) !== null);
      if (!c.ok) problems.push(...c.errors.map((p) => ({ ...p, path: ['when', ...p.path] })));
      else when = c.value;
    }
    if (problems.length > 0) return { ok: false, errors: problems };
    const st: CardState = { card, status: 'armed', since: null, when };
    this.cards.push(st);
    if (card.at === undefined && !card.when) this.activate(st);
    else if (card.at !== undefined && card.at <= this.now) this.activate(st);
    return { ok: true, value: { timeMs: this.now } };
  }

  /**
   * Whether a card's rows exist in the current wiring (and a swap's rows are still alike). A
   * download can remove a row; its card then stays armed and inactive until a later download
   * brings the row back (see docs/engine.md).
   */
  attached(card: FaultCard): boolean {
    if (card.kind === 'open-wire' || card.kind === 'short-24v' || card.kind === 'short-0v' || card.kind === 'chatter') return this.rowIndex.has(card.row);
    if (card.kind === 'swapped-wires') {
      const i = this.rowIndex.get(card.rows[0]);
      const j = this.rowIndex.get(card.rows[1]);
      if (i === undefined || j === undefined) return false;
      const a = this.plans[i];
      const b = this.plans[j];
      return a.bits === b.bits && a.sink.kind === b.sink.kind && a.isLink === b.isLink;
    }
    return true;
  }

  activate(c: CardState): void {
    if (!this.attached(c.card)) return;
    for (const d of this.devs.values()) this.rebase(d);
    c.status = 'active';
    c.since = this.now;
    this.rebuildFaults();
  }

  clearFault(id: string): Result<{ timeMs: number }> {
    const i = this.cards.findIndex((c) => c.card.id === id);
    if (i < 0) return err('unknown_fault', `no fault card "${id}"`, ['id']);
    for (const d of this.devs.values()) this.rebase(d);
    this.cards.splice(i, 1);
    this.rebuildFaults();
    return { ok: true, value: { timeMs: this.now } };
  }

  rebuildFaults(): void {
    this.rowFaults = this.plans.map(() => null);
    this.devFaults = new Map();
    this.deadModules = new Set();
    const wasLoss = this.linkLoss;
    this.linkLoss = false;
    const rf = (id: string): RowFaults => {
      const i = this.rowIndex.get(id)!;
      return (this.rowFaults[i] ??= { open: false, short24: false, short0: false, chatter: [], swapWith: null, ids: [] });
    };
    const df = (id: string): DevFaults => {
      let f = this.devFaults.get(id);
      if (!f) this.devFaults.set(id, (f = { stuckOn: false, stuckOff: false, mismatch: false, slow: 1, drift: null, loss: false }));
      return f;
    };
    this.cards.forEach((st, index) => {
      if (st.status !== 'active') return;
      const c = st.card;
      switch (c.kind) {
        case 'stuck-on':
          df(c.device).stuckOn = true;
          break;
        case 'stuck-off':
          df(c.device).stuckOff = true;
          break;
        case 'open-wire':
          rf(c.row).open = true;
          rf(c.row).ids.push(c.id);
          break;
        case 'short-24v':
          rf(c.row).short24 = true;
          rf(c.row).ids.push(c.id);
          break;
        case 'short-0v':
          rf(c.row).short0 = true;
          rf(c.row).ids.push(c.id);
          break;
        case 'chatter':
          rf(c.row).chatter.push({ index, periodMs: c.periodMs, probability: c.probability });
          rf(c.row).ids.push(c.id);
          break;
        case 'swapped-wires':
          rf(c.rows[0]).swapWith = this.rowIndex.get(c.rows[1])!;
          rf(c.rows[1]).swapWith = this.rowIndex.get(c.rows[0])!;
          rf(c.rows[0]).ids.push(c.id);
          rf(c.rows[1]).ids.push(c.id);
          break;
        case 'dead-module':
          this.deadModules.add(c.module);
          break;
        case 'link-loss':
          this.linkLoss = true;
          break;
        case 'slow-actuator':
          df(c.device).slow = Math.max(df(c.device).slow, c.factor);
          break;
        case 'analog-drift':
          df(c.device).drift = { rate: c.ratePerS, since: st.since ?? this.now };
          break;
        case 'analog-loss':
          df(c.device).loss = true;
          break;
        case 'sensor-type-mismatch':
          df(c.device).mismatch = true;
          break;
      }
    });
    // A restored fieldbus link resynchronises at its next exchange, not from stale data.
    if (wasLoss && !this.linkLoss && this.busMs !== null) this.lastBusMs = null;
    this.buildFastRows();
    this.invalidateWiring();
  }

  checkTimedFaults(): void {
    // A card with both `at` and `when` is armed from `at` and fires in checkTriggeredFaults.
    for (const c of this.cards) if (c.status === 'armed' && c.card.at !== undefined && c.card.at <= this.now && !c.when) this.activate(c);
  }

  checkTriggeredFaults(): void {
    for (const c of this.cards) {
      if (c.status !== 'armed' || !c.when) continue;
      if (c.card.at !== undefined && c.card.at > this.now) continue;
      if (c.when((n) => this.readSignalValue(n))) this.activate(c);
    }
  }

  // ---------------------------------------------------------------- clock

  nextInstant(limit: number): number {
    const n = this.now;
    let next = limit;
    next = Math.min(next, nextScanMs(n, this.scanMs), nextScanMs(n, this.refreshMs));
    if (this.busMs !== null) next = Math.min(next, nextScanMs(n, this.busMs));
    for (const c of this.cards) if (c.status === 'armed' && c.card.at !== undefined && c.card.at > n) next = Math.min(next, c.card.at);
    // Only a commanded device can be travelling (see `actuators`).
    const acts = this.actuators;
    for (let k = 0; k < acts.length; k++) {
      const a = this.arrival(acts[k]);
      if (a !== null && a > n) next = Math.min(next, a);
    }
    return next;
  }

  runInstant(t: number): void {
    this.now = t;
    this.checkTimedFaults();
    if (this.busMs !== null && t % this.busMs === 0) this.exchangeBus();
    if (t % this.scanMs === 0) this.scanPlc();
    if (t % this.refreshMs === 0) this.refreshController();
    this.checkTriggeredFaults();
    this.sample();
  }

  advance(ms: unknown): Result<{ timeMs: number }> {
    if (this.disposed) return err('disposed', 'the cell has been disposed');
    if (typeof ms !== 'number' || !Number.isInteger(ms)) return err('invalid_time', `advance takes whole milliseconds, not ${String(ms)}`);
    if (ms < 0) return err('negative_time', `time cannot run backwards (${ms} ms)`);
    if (ms > MAX_ADVANCE_MS) return err('time_range', `advance at most ${MAX_ADVANCE_MS} ms at once`);
    const end = this.now + ms;
    // Only due instants run: where advance() stops is not an instant, so how a caller slices
    // time (one call of an hour or 3.6 million calls of 1 ms) never changes the run.
    for (;;) {
      const t = this.nextInstant(end + 1);
      if (t > end) break;
      this.runInstant(t);
    }
    this.now = end;
    this.notify();
    return { ok: true, value: { timeMs: this.now } };
  }

  // ---------------------------------------------------------------- events

  applyEvent(input: unknown): Result<{ timeMs: number }> {
    if (this.disposed) return err('disposed', 'the cell has been disposed');
    const parsed = cellEventSchema.safeParse(input);
    if (!parsed.success) return { ok: false, errors: downloadPathsIntoDocument(input, zodProblems(parsed.error.issues)) };
    const e = parsed.data;
    this.invalidateWiring();
    const r = this.applyParsed(e);
    if (!r.ok) return r;
    this.log.push({ t: this.now, event: e });
    this.checkTriggeredFaults();
    this.sample();
    this.notify();
    return { ok: true, value: { timeMs: this.now } };
  }

  device(id: string, types: readonly string[] | null): Result<DevState> {
    const d = this.devs.get(id);
    if (!d) return err('unknown_device', `no device "${id}"`, ['device']);
    if (types && !types.includes(d.dev.type)) return err('wrong_device_type', `"${id}" is a ${d.dev.type}; this event needs a ${types.join(' or ')}`, ['device']);
    return { ok: true, value: d };
  }

  applyParsed(e: CellEvent): Result<{ timeMs: number }> {
    const done = { ok: true as const, value: { timeMs: this.now } };
    switch (e.type) {
      case 'press':
      case 'release':
      case 'toggle': {
        const r = this.device(e.device, ['push-button', 'illuminated-button', 'e-stop', 'proximity-sensor', 'photo-eye', 'part-sensor', 'guard-switch']);
        if (!r.ok) return r;
        const d = r.value;
        const dev = d.dev;
        if (dev.type === 'e-stop') {
          if (e.type === 'toggle') d.latched = !d.latched;
          else d.latched = e.type === 'press' ? true : false;
        } else if (dev.type === 'push-button' || dev.type === 'illuminated-button') {
          if (dev.action === 'maintained') {
            if (e.type !== 'release') d.latched = !d.latched;
            d.pressed = e.type === 'press';
          } else if (e.type === 'toggle') d.pressed = !d.pressed;
          else d.pressed = e.type === 'press';
        } else {
          if (e.type !== 'toggle') return err('wrong_device_type', `"${dev.id}" is a ${dev.type}: use set-field or toggle`, ['type']);
          d.active = !d.active;
        }
        return done;
      }
      case 'set-selector': {
        const r = this.device(e.device, ['selector-switch']);
        if (!r.ok) return r;
        const dev = r.value.dev as Extract<PanelDevice, { type: 'selector-switch' }>;
        if (e.position >= dev.positions.length) return err('out_of_range', `"${dev.id}" has positions 0..${dev.positions.length - 1}`, ['position']);
        r.value.position = e.position;
        return done;
      }
      case 'set-analog': {
        const r = this.device(e.device, ['potentiometer']);
        if (!r.ok) return r;
        const dev = r.value.dev as Extract<PanelDevice, { type: 'potentiometer' }>;
        if (!(e.value >= dev.min && e.value <= dev.max)) return err('out_of_range', `"${dev.id}" ranges ${dev.min}..${dev.max} ${dev.unit}`, ['value']);
        r.value.value = e.value;
        return done;
      }
      case 'set-field': {
        const r = this.device(e.device, ['proximity-sensor', 'photo-eye', 'part-sensor', 'guard-switch']);
        if (!r.ok) return r;
        r.value.active = e.active;
        return done;
      }
      case 'force':
      case 'unforce': {
        const t = this.forceTarget(e.target);
        if (!t.ok) return t;
        if (e.type === 'force') {
          if (!Number.isFinite(e.value)) return err('invalid_value', 'a forced value must be finite', ['value']);
          this.forces.set(t.value, e.value);
          if (t.value.startsWith('%')) writeAddress(this.image, t.value, e.value);
        } else {
          if (!this.forces.delete(t.value)) return err('not_forced', `${t.value} is not forced`, ['target']);
          // The address returns to 0 until the wiring (inputs) or the logic (outputs, memory) writes it again.
          if (t.value.startsWith('%')) writeAddress(this.image, t.value, 0);
        }
        if (!t.value.startsWith('%')) this.writeControllerOutputs();
        else this.updateLoads();
        return done;
      }
      case 'restart-controller':
        this.pointMap = restartPointMap(this.pointMap);
        this.syncController();
        this.setResolved(resolvePointMap(this.pointMap.live));
        this.actor.send({ type: 'RESTART' });
        this.writeControllerOutputs();
        return done;
      case 'power-controller':
        this.syncController();
        this.actor.send({ type: e.on ? 'POWER_ON' : 'POWER_OFF' });
        this.writeControllerOutputs();
        return done;
      case 'stage-point-map': {
        const v = validateStagedRows(this.doc, e.rows);
        if (!v.ok) return v;
        this.pointMap = stagePointMap(this.pointMap, v.value);
        return done;
      }
      case 'discard-staged':
        this.pointMap = { live: this.pointMap.live, staged: null };
        return done;
      case 'inject-fault':
        return this.addFault(e.fault);
      case 'clear-fault':
        return this.clearFault(e.id);
      case 'download':
        return this.download(e);
    }
  }

  /**
   * Swaps downloaded parts of the document into the running cell at the current time. The
   * merged document is validated first; a rejected download changes nothing. The clock, the
   * devices, forces, the live/staged point map and the fault cards carry on. See
   * docs/engine.md ("Downloading edits") for the full semantics.
   */
  download(e: DownloadEvent): Result<{ timeMs: number }> {
    if (e.logic === undefined && e.wiring === undefined && e.routine === undefined) {
      return err('empty_download', 'a download carries a logic sheet, wiring rows or a routine', []);
    }
    const merged: CellDocument = {
      ...this.doc,
      plc: { ...this.doc.plc, sheet: e.logic ?? this.doc.plc.sheet },
      wiring: e.wiring ?? this.doc.wiring,
      controller: { ...this.doc.controller, routine: e.routine?.steps ?? this.doc.controller.routine, poses: e.routine?.poses ?? this.doc.controller.poses },
    };
    const v = validateCellDocument(merged);
    if (!v.ok) return v;
    const next = v.value;
    const routineChanged =
      e.routine !== undefined &&
      JSON.stringify([next.document.controller.routine, next.document.controller.poses]) !== JSON.stringify([this.doc.controller.routine, this.doc.controller.poses]);
    // Devices and modules are not downloadable: keep the running objects (the hot path finds
    // device state and controller channels by object identity) and take only the new parts.
    this.doc = {
      ...this.doc,
      plc: { ...this.doc.plc, sheet: next.document.plc.sheet },
      wiring: next.document.wiring,
      controller: { ...this.doc.controller, routine: next.document.controller.routine, poses: next.document.controller.poses },
    };
    this.syncController();
    for (const d of this.devs.values()) this.rebase(d);
    if (e.wiring !== undefined) {
      this.planWiring(next.plans.map((p) => this.adoptPlan(p)));
      for (const c of this.cards) {
        if (c.status === 'active' && !this.attached(c.card)) {
          c.status = 'armed';
          c.since = null;
        }
      }
    }
    if (e.logic !== undefined) {
      // Stop → run: the new sheet starts from a fresh state (first scan, timers and counters
      // at zero). Outputs and memory are cleared at once, as a PLC in stop drives its outputs
      // off; the new sheet's first scan, at the next multiple of its scan period, writes them.
      this.sheet = next.sheet;
      this.plcState = next.sheet.createState();
      this.scanMs = next.sheet.scanPeriodMs;
      this.image.Q.fill(0);
      this.image.M.fill(0);
      this.applyPlcForces('Q');
      this.applyPlcForces('M');
    }
    if (routineChanged) this.reloadRoutine();
    this.generation++;
    this.readers.clear();
    // Cards whose rows came back with the new wiring fire again by their own rules.
    for (const c of this.cards) {
      if (c.status === 'armed' && !c.when && (c.card.at === undefined || c.card.at <= this.now)) this.activate(c);
    }
    this.rebuildFaults();
    this.lastInputs = [];
    this.writeControllerOutputs();
    this.updateLoads();
    return { ok: true, value: { timeMs: this.now } };
  }

  /** A row plan from a validated download, pointing at the running devices and modules. */
  adoptPlan(p: RowPlan): RowPlan {
    const end = <T extends RowSource | RowSink>(x: T): T => {
      if (x.kind === 'device') return { ...x, device: this.devs.get(x.device.id)!.dev };
      if (x.kind === 'controller') return { ...x, module: this.doc.controller.modules.find((m) => m.rack === x.rack && m.slot === x.slot)! };
      return { ...x, module: this.doc.plc.modules.find((m) => m.id === x.module.id)! };
    };
    return { ...p, source: end(p.source), sink: end(p.sink) };
  }

  /**
   * A changed routine restarts: the controller keeps its power, clock, pose, alarms and cycle
   * count, drops what the old routine drove (outputs, pulses, word encodings), halts any move
   * where the arm is, and goes to `stopped` with the routine at step 0 (off, booting, faulted
   * and e-stopped stay where they are). From `stopped` the usual rules apply; a new start edge
   * is needed to cycle.
   */
  reloadRoutine(): void {
    const config = this.doc.controller;
    const persisted = this.actor.getPersistedSnapshot() as unknown as { value: unknown; context: ControllerContext } & Record<string, unknown>;
    const old = persisted.context;
    const fresh = initialControllerContext(config);
    const context: ControllerContext = {
      ...old,
      config,
      poses: fresh.poses,
      labels: fresh.labels,
      outputs: {},
      wordEncodings: {},
      pulses: [],
      pc: 0,
      stepElapsedMs: 0,
      motion: null,
      speed: 0,
      cycleComplete: false,
      holdReason: null,
    };
    const v = persisted.value;
    const keep = v === 'off' || v === 'booting' || v === 'faulted';
    const value = keep ? v : typeof v === 'object' && v !== null && 'eStopped' in v ? { eStopped: 'halted' } : 'stopped';
    if (!keep && value !== 'stopped') context.servoOn = false;
    this.actor.stop();
    this.actor = createActor(controllerMachine, { snapshot: { ...persisted, value, context } as never, input: { config } });
    this.actor.start();
  }

  forceTarget(target: string): Result<string> {
    if (target.startsWith('%')) {
      const a = parseAddress(target);
      if (!a.ok) return { ok: false, errors: a.errors.map((p) => ({ ...p, path: ['target'] })) };
      return { ok: true, value: formatAddress(a.value) };
    }
    const p = parsePointRef(target);
    if (!p) return err('unknown_target', `"${target}" is neither a PLC address nor a controller point`, ['target']);
    return { ok: true, value: target };
  }

  // ---------------------------------------------------------------- signals

  /**
   * Signal names: `time`; `plc.<address>`; `plc.<block>.<port>`; `plc.fault.<module>`;
   * `ctl.state`, `ctl.servo`, `ctl.pc`, `ctl.alarms`, `ctl.cycles`, `ctl.<point>`;
   * `arm.<axis>`, `arm.speed`, `arm.moving`; `dev.<id>.<property>`; `wire.<row>` (level)
   * and `in.<row>` (reading 0/1); `link.healthy`; `fault.<card>` (1 when active);
   * `hs.<role>` handshake outputs.
   */
  reader(name: string): (() => SignalValue) | null {
    const hit = this.readers.get(name);
    if (hit) return hit;
    const first = this.makeReader(name);
    if (!first) return null;
    let inner: () => SignalValue = first;
    // A download can replace the sheet, the wiring or the routine, so a reader re-resolves its
    // name once per download: the trace recorder and fault triggers hold readers for the whole
    // run. A name the new parts no longer have reads 0 (a trace's signal list never changes).
    let gen = this.generation;
    const r = () => {
      if (gen !== this.generation) {
        gen = this.generation;
        inner = this.makeReader(name) ?? zero;
      }
      return inner();
    };
    this.readers.set(name, r);
    return r;
  }

  makeReader(name: string): (() => SignalValue) | null {
    if (name === 'time') return () => this.now;
    const dot = name.indexOf('.');
    if (dot < 0) return null;
    const head = name.slice(0, dot);
    const rest = name.slice(dot + 1);
    const b = (x: boolean) => (x ? 1 : 0);
    switch (head) {
      case 'plc': {
        if (rest.startsWith('%')) {
          const a = parseAddress(rest);
          if (!a.ok) return null;
          const addr = a.value;
          return () => readAddress(this.image, addr);
        }
        if (rest.startsWith('fault.')) {
          const id = rest.slice(6);
          if (!this.doc.plc.modules.some((m) => m.id === id)) return null;
          return () => b(this.moduleDead(id));
        }
        const d2 = rest.lastIndexOf('.');
        if (d2 < 0) return null;
        const block = rest.slice(0, d2);
        const port = rest.slice(d2 + 1);
        if (this.sheet.readOutput(this.plcState, block, port) === undefined) return null;
        return () => {
          const v = this.sheet.readOutput(this.plcState, block, port);
          return typeof v === 'boolean' ? b(v) : (v ?? 0);
        };
      }
      case 'ctl': {
        switch (rest) {
          case 'state':
            return () => this.stateName().state;
          case 'servo':
            return () => b(this.ctx().servoOn);
          case 'pc':
            return () => this.ctx().pc;
          case 'alarms':
            return () => this.ctx().alarms.length;
          case 'cycles':
            return () => this.ctx().cyclesCompleted;
        }
        const p = parsePointRef(rest);
        if (!p) return null;
        return INPUT_FAMILIES.has(p.family) ? () => this.logicalIn[rest] ?? 0 : () => this.logicalOut[rest] ?? 0;
      }
      case 'hs':
        if (!(HANDSHAKE_OUTPUT_ROLES as readonly string[]).includes(rest)) return null;
        return () => b(this.handshakeOutputs()[rest]);
      case 'arm': {
        if (rest === 'speed') return () => this.armNow().speed;
        if (rest === 'moving') return () => b(this.armNow().moving);
        const axis = Number(rest);
        if (!Number.isInteger(axis) || axis < 0 || axis >= this.doc.controller.axes) return null;
        return () => this.armNow().pose[axis];
      }
      case 'wire':
      case 'in': {
        const i = this.rowIndex.get(rest);
        if (i === undefined) return null;
        return head === 'wire' ? () => this.readRow(i).level : () => this.readRow(i).value;
      }
      case 'link':
        return rest === 'healthy' ? () => b(this.linkHealthy()) : null;
      case 'fault':
        return () => b(this.cards.some((c) => c.card.id === rest && c.status === 'active'));
      case 'dev': {
        const d2 = rest.lastIndexOf('.');
        if (d2 < 0) return null;
        const d = this.devs.get(rest.slice(0, d2));
        if (!d) return null;
        const prop = rest.slice(d2 + 1);
        const snap = () => this.deviceSnapshot(d);
        return () => {
          const s = snap() as Record<string, unknown>;
          if (prop.startsWith('lamp')) return b(s.lamps ? Boolean((s.lamps as boolean[])[Number(prop.slice(4) || 0)]) : false);
          if (s.feedback && prop in (s.feedback as Record<string, boolean>)) return b((s.feedback as Record<string, boolean>)[prop]);
          const v = s[prop];
          return typeof v === 'boolean' ? b(v) : typeof v === 'number' ? v : 0;
        };
      }
    }
    return null;
  }

  readSignalValue(name: string): SignalValue {
    const r = this.reader(name);
    return r ? r() : 0;
  }

  signalNames(): string[] {
    return signalNamesFrom({ doc: this.doc, plans: this.plans, outputSlots: this.sheet.outputSlots, pointRefs: this.resolved.byRef.keys() });
  }

  setTrace(names: string[]): Result<true> {
    const readers: (() => SignalValue)[] = [];
    const problems: Problem[] = [];
    names.forEach((n, i) => {
      const r = this.reader(n);
      if (!r) problems.push({ path: [i], code: 'unknown_signal', message: `no signal "${n}"` });
      else readers.push(r);
    });
    if (problems.length > 0) return { ok: false, errors: problems };
    this.recorder = createTraceRecorder(names, readers);
    return { ok: true, value: true };
  }

  sample(): void {
    this.recorder?.sample(this.now);
  }

  // ---------------------------------------------------------------- snapshot

  deviceSnapshot(d: DevState): DeviceSnapshot {
    const dev = d.dev;
    const base = { id: dev.id, type: dev.type, label: dev.label };
    switch (dev.type) {
      case 'push-button':
        return { ...base, pressed: d.pressed, latched: d.latched };
      case 'illuminated-button':
        return { ...base, pressed: d.pressed, latched: d.latched, lamps: [...d.lamps] };
      case 'selector-switch':
        return { ...base, position: d.position };
      case 'e-stop':
        return { ...base, pressed: d.latched, latched: d.latched };
      case 'pilot-light':
      case 'stack-light':
        return { ...base, lamps: [...d.lamps] };
      case 'potentiometer':
        return { ...base, value: d.value };
      case 'numeric-display':
        return { ...base, value: d.display };
      case 'proximity-sensor':
      case 'photo-eye':
      case 'part-sensor':
      case 'guard-switch':
        return dev.type === 'guard-switch' ? { ...base, active: d.active } : { ...base, active: d.active, led: this.detecting(d) };
      case 'gripper':
      case 'vacuum-cup':
      case 'conveyor': {
        const feedback: Record<string, boolean> = {};
        const terms = dev.type === 'gripper' ? ['closed', 'open'] : dev.type === 'vacuum-cup' ? ['switch'] : ['running'];
        for (const t of terms) {
          const s = this.deviceSource(d, t);
          feedback[t] = s.k === 'contact' && s.closed;
        }
        return { ...base, command: d.cmd, travel: this.posAt(d, this.now), feedback };
      }
    }
  }

  snapshot(): CellSnapshot {
    const ctx = this.ctx();
    const { state, detail } = this.stateName();
    const wires: WireSnapshot[] = this.plans.map((p, i) => {
      const r = this.readRow(i);
      const ids = this.rowFaults[i]?.ids ?? [];
      return { id: p.row.id, level: r.level, unit: r.unit, reading: r.reading, ...(r.loop ? { loop: r.loop } : {}), faults: [...ids], isLink: p.isLink };
    });
    const addresses: Record<string, { value: number; forced: boolean }> = {};
    const addAddr = (text: string) => {
      addresses[text] = { value: readAddress(this.image, text), forced: this.forces.has(text) };
    };
    for (const p of this.plans) {
      if (p.sink.kind !== 'device' && p.sink.kind !== 'controller') addAddr(formatAddress(p.sink.address));
      if (p.source.kind === 'plc-bit' || p.source.kind === 'plc-word') addAddr(formatAddress(p.source.address));
    }
    for (const t of this.forces.keys()) if (t.startsWith('%')) addAddr(t);
    const used = (a: Uint8Array) => {
      let last = -1;
      for (let i = 0; i < a.length; i++) if (a[i] !== 0) last = i;
      return Array.from(a.subarray(0, Math.max(last + 1, 4)));
    };
    const points = [...this.resolved.byRef.values()].map((pt) => {
      const isIn = INPUT_FAMILIES.has(pt.family);
      return {
        ref: pt.ref,
        label: pt.label,
        invert: pt.invert,
        rack: pt.rack,
        slot: pt.slot,
        channel: pt.channel,
        rowId: pt.rowId,
        value: (isIn ? this.logicalIn[pt.ref] : this.logicalOut[pt.ref]) ?? 0,
        forced: this.forces.has(pt.ref),
      };
    });
    const channels: Record<string, number[]> = {};
    for (const [k, a] of this.ctlIn) channels[k] = Array.from(a);
    for (const [k, a] of this.ctlOut) channels[k] = Array.from(a);
    return {
      timeMs: this.now,
      seed: this.seed,
      devices: [...this.devs.values()].map((d) => this.deviceSnapshot(d)),
      wires,
      plc: {
        scans: this.plcState.scans,
        scanPeriodMs: this.scanMs,
        image: { I: used(this.image.I), Q: used(this.image.Q), M: used(this.image.M) },
        addresses,
        blockOutputs: this.sheet.readBlockOutputs(this.plcState),
        moduleFaults: this.doc.plc.modules.filter((m) => this.moduleDead(m.id)).map((m) => m.id),
      },
      link: { kind: this.doc.link.kind, healthy: this.linkHealthy(), lastUpdateMs: this.lastBusMs },
      controller: {
        state,
        detail,
        powered: state !== 'off',
        servoOn: ctx.servoOn,
        pc: ctx.pc,
        stepElapsedMs: this.stepElapsedNow(ctx),
        holdReason: ctx.holdReason,
        cyclesCompleted: ctx.cyclesCompleted,
        alarms: ctx.alarms.map((a) => ({ ...a })),
        points,
        handshake: this.handshakeOutputs(),
        pointMap: this.pointMap.live,
        staged: this.pointMap.staged,
        moduleFaults: this.doc.controller.modules.filter((m) => this.moduleDead(m.id)).map((m) => m.id),
        channels,
      },
      arm: { ...this.armNowCopy(), target: ctx.lastTarget },
      faults: this.cards.map((c) => ({ card: c.card, status: c.status, since: c.since })),
      forces: Object.fromEntries(this.forces),
    };
  }

  armNowCopy(): { pose: number[]; speed: number; moving: boolean } {
    const a = this.armNow();
    return { pose: [...a.pose], speed: a.speed, moving: a.moving };
  }

  notify(): void {
    if (this.listeners.size === 0) return;
    const s = this.snapshot();
    for (const l of this.listeners) l(s);
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    this.listeners.clear();
    this.actor.stop();
  }

  api(): Cell {
    const rt = this as CellRuntime;
    return {
      get timeMs() {
        return rt.now;
      },
      advance: (ms) => rt.advance(ms),
      apply: (e) => rt.applyEvent(e),
      snapshot: () => rt.snapshot(),
      subscribe: (l) => {
        if (rt.disposed) return () => {};
        rt.listeners.add(l);
        return () => rt.listeners.delete(l);
      },
      readSignal: (n) => {
        if (rt.disposed) return err('disposed', 'the cell has been disposed');
        const r = rt.reader(n);
        return r ? { ok: true, value: r() } : err('unknown_signal', `no signal "${n}"`);
      },
      signalNames: () => rt.signalNames(),
      eventLog: (from = 0) => rt.log.slice(Math.max(0, Math.trunc(from) || 0)).map((l) => ({ t: l.t, event: l.event })),
      get eventCount() {
        return rt.log.length;
      },
      trace: () => rt.recorder?.trace(rt.now) ?? { signals: [], samples: [], endMs: rt.now },
      traceSince: (from) => rt.recorder?.since(from) ?? { samples: [], next: 0 },
      dispose: () => rt.dispose(),
    };
  }
}

/**
 * A download's shape problems come from the event schema, with paths into the event
 * (`['logic', 'blocks', 3, ...]`). docs/engine.md promises paths into the document, as the
 * merged-document check gives, so the carried parts are re-rooted where they live there.
 */
function downloadPathsIntoDocument(input: unknown, problems: Problem[]): Problem[] {
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
