/**
 * A cell: panel, field devices, terminal strip, link, PLC and controller on one discrete
 * clock of whole milliseconds — this file is the clock and the scan order; the rooms it
 * drives each have their own file (devices, wiring, fault cards, the PLC side, the
 * controller side, signals, snapshot, events, downloads).
 *
 * The PLC scans every `scanPeriodMs`, the controller refreshes its I/O every `ioRefreshMs`,
 * a fieldbus exchanges every `updatePeriodMs`; the clock jumps from one due instant to the
 * next (nothing else can change in between), so an hour of cell time costs only the work of
 * its scans and refreshes. Order within one instant: timed fault cards → fieldbus exchange →
 * PLC scan (read inputs, solve, write outputs) → controller refresh (read inputs, step, write
 * outputs) → triggered fault cards → trace sample. Events from outside apply between
 * instants, at the current time.
 *
 * Everything that varies is derived from the document, the event log and the seed, so a
 * replay gives the same trace.
 */
import { NOMINAL_SUPPLY_V } from '@/simulator/electrical';
import { rejected, type Problem, type Result } from '@/simulator/shared/result';
import type { CompiledSheet } from '@/simulator/plc';
import type { CellDocument } from '@/simulator/schema/cell-document';
import { validateCellDocument, zodProblems } from '@/simulator/schema/validate';
import type { RowPlan } from '@/simulator/schema/wiring-plan';
import type { SignalValue } from '@/simulator/trace/predicate';
import { createTraceRecorder, type Trace, type TraceRecorder, type TraceSample } from '@/simulator/trace/trace';
import { applyParsed } from './apply-event';
import { buildSnapshot } from './build-snapshot';
import { nextScanMs, type Clock } from './clock';
import { ControllerSide } from './controller-side';
import { arrival, initialDeviceState, type DevState } from './devices';
import { downloadPathsIntoDocument } from './download';
import { cellEventSchema, type LoggedEvent } from './events';
import { FaultBoard } from './faults';
import { FaultState } from './fault-state';
import type { CellParts } from './parts';
import { PlcSide } from './plc-side';
import { signalNamesFrom } from './signal-names';
import { Signals } from './signals';
import type { CellSnapshot } from './snapshot';
import { Wiring } from './wiring';

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
  /**
   * Warnings about the cell's document: panel colours against IEC 60204-1, a supply outside
   * IEC 61131-2's tolerance (schema/warnings.ts). The cell runs anyway.
   */
  readonly warnings: Problem[];
  /** Stops the controller actor and drops listeners; later calls are rejected. */
  dispose(): void;
};

const MAX_ADVANCE_MS = 30 * 86_400_000;

/**
 * Creates a cell from a document of unknown shape. An invalid document, or invalid options,
 * yields every problem with its path and no cell.
 */
export function createCell(document: unknown, options: CellOptions = {}): Result<Cell, Problem> {
  const v = validateCellDocument(document);
  if (!v.ok) return v;
  const { document: doc, sheet, plans, warnings } = v.value;
  if (options.seed !== undefined && !(Number.isInteger(options.seed) && options.seed >= 0 && options.seed <= 0xffffffff)) {
    return rejected('invalid_seed', 'the seed must be an integer 0..4294967295', ['options', 'seed']);
  }
  const rt = new RunningCell(doc, sheet, plans, options.seed ?? doc.seed);
  const problems: Problem[] = [];
  (options.faults ?? []).forEach((f, i) => {
    const r = rt.parts.board.add(f);
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
  return { ok: true, value: rt.api(warnings) };
}

/** The rooms of one cell, the clock over them, its log, trace and listeners. */
class RunningCell {
  readonly parts: CellParts;
  private readonly signals: Signals;
  private disposed = false;
  private readonly log: LoggedEvent[] = [];
  private readonly listeners = new Set<(s: CellSnapshot) => void>();
  private recorder: TraceRecorder | null = null;

  constructor(doc: CellDocument, sheet: CompiledSheet, plans: RowPlan[], seed: number) {
    const clock: Clock = { now: 0 };
    const forces = new Map<string, number>();
    const faults = new FaultState(doc.supply?.volts ?? NOMINAL_SUPPLY_V);
    const devices = new Map<string, DevState>();
    const devOf = new Map<object, DevState>();
    const init = doc.initial.devices ?? {};
    for (const d of [...doc.panel, ...doc.field]) {
      const st = initialDeviceState(d, init[d.id]);
      devices.set(d.id, st);
      devOf.set(d, st);
    }
    const controller = new ControllerSide(doc.controller, faults, forces);
    const plc = new PlcSide(doc.plc.modules, sheet, forces);
    let board: FaultBoard | null = null;
    const wiring = new Wiring({ clock, seed, link: doc.link, image: plc.image, faults, devOf, channelsOf: controller.channelsOf, hasFaultCards: () => board!.cards.length > 0 });
    board = new FaultBoard({
      clock,
      doc: () => this.parts.doc,
      devices,
      wiring,
      state: faults,
      knows: (n) => this.signals.reader(n) !== null,
      read: (n) => this.signals.read(n),
    });
    this.parts = { clock, seed, doc, devices, devOf, faults, board, wiring, plc, controller, forces };
    this.signals = new Signals(this.parts);
    wiring.plan(plans);
    wiring.buildFastRows();
  }

  start(): void {
    const { controller, wiring, doc } = this.parts;
    controller.actor.start();
    if (doc.initial.controllerPowered) controller.actor.send({ type: 'POWER_ON' });
    wiring.updateLoads();
    controller.writeOutputs(wiring);
    this.sample();
  }

  // ---------------------------------------------------------------- the clock

  /** The next instant anything is due after now (or `limit`): a scan, a refresh, an exchange, a timed card, an actuator's arrival. */
  private nextInstant(limit: number): number {
    const { clock, plc, controller, wiring, board } = this.parts;
    const n = clock.now;
    let next = Math.min(limit, nextScanMs(n, plc.scanMs), nextScanMs(n, controller.refreshMs));
    if (wiring.busMs !== null) next = Math.min(next, nextScanMs(n, wiring.busMs));
    const due = board.nextDue(n);
    if (due !== null) next = Math.min(next, due);
    // Only a commanded device can be travelling (see `actuators`).
    const acts = wiring.actuators;
    for (let k = 0; k < acts.length; k++) {
      const a = arrival(acts[k], n);
      if (a !== null && a > n) next = Math.min(next, a);
    }
    return next;
  }

  /** One instant, in the cell's scan order. */
  private runInstant(t: number): void {
    const { clock, plc, controller, wiring, board } = this.parts;
    clock.now = t;
    board.checkTimed();
    if (wiring.busMs !== null && t % wiring.busMs === 0) wiring.exchangeBus();
    if (t % plc.scanMs === 0) plc.scan(wiring);
    if (t % controller.refreshMs === 0) controller.refresh(wiring);
    board.checkTriggered();
    this.sample();
  }

  advance(ms: unknown): Result<{ timeMs: number }> {
    if (this.disposed) return rejected('disposed', 'the cell has been disposed');
    if (typeof ms !== 'number' || !Number.isInteger(ms)) return rejected('invalid_time', `advance takes whole milliseconds, not ${String(ms)}`);
    if (ms < 0) return rejected('negative_time', `time cannot run backwards (${ms} ms)`);
    if (ms > MAX_ADVANCE_MS) return rejected('time_range', `advance at most ${MAX_ADVANCE_MS} ms at once`);
    const clock = this.parts.clock;
    const end = clock.now + ms;
    // Only due instants run: where advance() stops is not an instant, so how a caller slices
    // time (one call of an hour or 3.6 million calls of 1 ms) never changes the run.
    for (;;) {
      const t = this.nextInstant(end + 1);
      if (t > end) break;
      this.runInstant(t);
    }
    clock.now = end;
    this.notify();
    return { ok: true, value: { timeMs: end } };
  }

  // ---------------------------------------------------------------- events

  apply(input: unknown): Result<{ timeMs: number }> {
    if (this.disposed) return rejected('disposed', 'the cell has been disposed');
    const parsed = cellEventSchema.safeParse(input);
    if (!parsed.success) return { ok: false, errors: downloadPathsIntoDocument(input, zodProblems(parsed.error.issues)) };
    const e = parsed.data;
    const { wiring, board, clock } = this.parts;
    wiring.invalidate();
    const r = applyParsed(this.parts, this.signals, e);
    if (!r.ok) return r;
    this.log.push({ t: clock.now, event: e });
    board.checkTriggered();
    this.sample();
    this.notify();
    return { ok: true, value: { timeMs: clock.now } };
  }

  // ---------------------------------------------------------------- trace and listeners

  setTrace(names: string[]): Result<true> {
    const readers: (() => SignalValue)[] = [];
    const problems: Problem[] = [];
    names.forEach((n, i) => {
      const r = this.signals.reader(n);
      if (!r) problems.push({ path: [i], code: 'unknown_signal', message: `no signal "${n}"` });
      else readers.push(r);
    });
    if (problems.length > 0) return { ok: false, errors: problems };
    this.recorder = createTraceRecorder(names, readers);
    return { ok: true, value: true };
  }

  private sample(): void {
    this.recorder?.sample(this.parts.clock.now);
  }

  private notify(): void {
    if (this.listeners.size === 0) return;
    const s = buildSnapshot(this.parts);
    for (const l of this.listeners) l(s);
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    this.listeners.clear();
    this.parts.controller.actor.stop();
  }

  api(warnings: Problem[]): Cell {
    const { parts, signals, log } = this;
    const clock = parts.clock;
    return {
      get timeMs() {
        return clock.now;
      },
      advance: (ms) => this.advance(ms),
      apply: (e) => this.apply(e),
      snapshot: () => buildSnapshot(parts),
      subscribe: (l) => {
        if (this.disposed) return () => {};
        this.listeners.add(l);
        return () => this.listeners.delete(l);
      },
      readSignal: (n) => {
        if (this.disposed) return rejected('disposed', 'the cell has been disposed');
        const r = signals.reader(n);
        return r ? { ok: true, value: r() } : rejected('unknown_signal', `no signal "${n}"`);
      },
      signalNames: () => signalNamesFrom({ doc: parts.doc, plans: parts.wiring.plans, outputSlots: parts.plc.sheet.outputSlots, pointRefs: parts.controller.resolved.byRef.keys() }),
      eventLog: (from = 0) => log.slice(Math.max(0, Math.trunc(from) || 0)).map((l) => ({ t: l.t, event: l.event })),
      get eventCount() {
        return log.length;
      },
      trace: () => this.recorder?.trace(clock.now) ?? { signals: [], samples: [], endMs: clock.now },
      traceSince: (from) => this.recorder?.since(from) ?? { samples: [], next: 0 },
      warnings,
      dispose: () => this.dispose(),
    };
  }
}
