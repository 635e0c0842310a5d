/**
 * The robot controller in the cell: its machine (controller/controller.machine.ts), its I/O
 * modules' channels, the live and staged point map, and one I/O refresh — read the input
 * channels through the point map, step the machine, write the outputs back to the channels.
 *
 * An idle refresh that would only let time pass is held back and handed over with the next
 * refresh that matters ({@link ControllerSide.canCoast}); exact, because motion is a
 * closed-form function of time.
 */
import { createActor, type Actor } from 'xstate';
import { applyInvert, decodeWord, encodeWord } from '@/simulator/electrical';
import { controllerMachine, type ControllerStateName } from '@/simulator/controller/controller.machine';
import { evaluateCondition, isAtPose, roleOn, samplePath, type ControllerContext } from '@/simulator/controller/routine';
import { moveTime } from '@/simulator/controller/motion';
import { INPUT_FAMILIES, parsePointRef, resolvePointMap, type PointMapState, type ResolvedPoint, type ResolvedPointMap } from '@/simulator/controller/point-map';
import { HANDSHAKE_OUTPUT_ROLES, type CellDocument } from '@/simulator/schema/cell-document';
import type { FaultState } from './fault-state';
import type { Wiring } from './wiring';

/** The hardware causes of a healthy cell: one shared, frozen value, so an idle refresh allocates nothing. */
const NO_CAUSES = Object.freeze([]) as unknown as string[];

export class ControllerSide {
  actor: Actor<typeof controllerMachine>;
  config: CellDocument['controller'];
  pointMap: PointMapState;
  resolved!: ResolvedPointMap;
  inPoints: ResolvedPoint[] = [];
  outPoints: ResolvedPoint[] = [];
  /** Channel arrays of `inPoints` / `outPoints` (null when no module sits at the point's rack/slot). */
  private inArrs: (Float64Array | null)[] = [];
  private outArrs: (Float64Array | null)[] = [];
  /** Input and output channel arrays by `rack.slot`. */
  readonly ctlIn = new Map<string, Float64Array>();
  readonly ctlOut = new Map<string, Float64Array>();
  /** Channel array of each module, by module object (no string keys on the hot path). */
  readonly channelsOf = new Map<object, Float64Array>();
  private readonly inArrsAll: Float64Array[];
  /** Inputs of the last refresh sent to the controller, to skip identical idle refreshes. */
  lastInputs: number[] = [];
  /** The refresh's input buffer, swapped with `lastInputs` when a refresh is sent (no allocation per refresh). */
  private inputBuffer: number[] = [];
  /** Last raw word and its decoded value per input point (a WI point's word rarely changes). */
  private wordRaw: number[] = [];
  private wordValue: number[] = [];
  private lastHardware = '';
  private lastHardwareList: string[] = [];
  /** Time held back by {@link canCoast}, handed over with the next refresh sent. */
  pendingDt = 0;
  logicalIn: Record<string, number> = {};
  logicalOut: Record<string, number> = {};

  constructor(
    config: CellDocument['controller'],
    private readonly faults: FaultState,
    private readonly forces: ReadonlyMap<string, number>,
  ) {
    this.config = config;
    this.pointMap = { live: config.pointMap, staged: config.staged };
    for (const m of config.modules) {
      const isIn = m.type === 'digital-in' || m.type === 'analog-in' || m.type === 'tool-in';
      const arr = new Float64Array(m.channels);
      (isIn ? this.ctlIn : this.ctlOut).set(`${m.rack}.${m.slot}`, arr);
      this.channelsOf.set(m, arr);
    }
    this.inArrsAll = [...this.ctlIn.values()];
    this.setLive(resolvePointMap(this.pointMap.live));
    this.actor = createActor(controllerMachine, { input: { config } });
  }

  get refreshMs(): number {
    return this.config.ioRefreshMs;
  }

  /** Makes a resolved point map the live one. */
  setLive(map: ResolvedPointMap): void {
    this.resolved = map;
    this.inPoints = [...map.byRef.values()].filter((p) => INPUT_FAMILIES.has(p.family));
    this.outPoints = [...map.byRef.values()].filter((p) => !INPUT_FAMILIES.has(p.family));
    this.inArrs = this.inPoints.map((p) => this.ctlIn.get(`${p.rack}.${p.slot}`) ?? null);
    this.outArrs = this.outPoints.map((p) => this.ctlOut.get(`${p.rack}.${p.slot}`) ?? null);
    this.lastInputs = [];
    this.wordRaw = this.inPoints.map(() => NaN);
    this.wordValue = this.inPoints.map(() => 0);
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

  // ---------------------------------------------------------------- refresh

  /** One I/O refresh: read, then step the machine and write — or hold it back when nothing would change. */
  refresh(wiring: Wiring): void {
    // Held readings are exactly what the last refresh read (`lastInputs` always ends up
    // holding those), and the input channels still show them.
    const values = wiring.ctlInValid ? this.lastInputs : this.readInputs(wiring);
    const hardware = this.hardwareCauses(wiring);
    const hwKey = hardware.length === 0 ? '' : hardware.join('\n');
    if (this.canCoast(values, hwKey)) {
      // Nothing the controller reads has changed and the refresh would only let time pass
      // (idle, or mid-move with the move not ending yet): the time is handed over with the
      // next refresh that matters.
      this.pendingDt += this.refreshMs;
      return;
    }
    this.send(values, hardware, hwKey, wiring);
  }

  /** Reads the controller's input rows into its channels, and its logical input values into `inputBuffer`. */
  private readInputs(wiring: Wiring): number[] {
    const ins = this.inArrsAll;
    for (let k = 0; k < ins.length; k++) ins[k].fill(0);
    const rows = wiring.ctlInRows;
    const deadAny = this.faults.deadModules.size > 0;
    for (let k = 0; k < rows.length; k++) {
      const i = rows[k];
      const p = wiring.plans[i];
      const sink = p.sink;
      if (sink.kind !== 'controller' || (deadAny && wiring.sinkDead(sink))) continue;
      const arr = wiring.ctlRowArrs[k];
      const v = wiring.readValue(i);
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
      else v = applyInvert(arr[pt.channel] !== 0, pt.invert) ? 1 : 0;
      if (this.forces.size > 0) {
        const f = this.forces.get(pt.ref);
        if (f !== undefined) v = f;
      }
      values[k] = v;
    }
    wiring.ctlInValid = wiring.settled();
    wiring.noteFedQ();
    return values;
  }

  /** Sends one refresh's inputs (and any time held back) to the controller, then writes its outputs. */
  private send(values: number[], hardware: string[], hwKey: string, wiring: Wiring): void {
    // Time held back in a wait or pause reaches that step first, with the inputs it was held
    // under: a wait that new inputs end hands the rest of its refresh to the next step, which
    // must get this refresh's time only, as it would have without coasting.
    if (this.pendingDt > 0 && this.inTimedStep(this.ctx())) this.sync();
    const inputs: Record<string, number> = {};
    const pts = this.inPoints;
    for (let k = 0; k < pts.length; k++) inputs[pts[k].ref] = values[k];
    for (const [t, v] of this.forces) {
      if (t.startsWith('%') || inputs[t] !== undefined) continue;
      if (parsePointRef(t)?.input) inputs[t] = v;
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
    this.writeOutputs(wiring);
  }

  /** Hands time held back by {@link canCoast} to the controller before anything else reaches it. */
  sync(): void {
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
  private canCoast(values: number[], hwKey: string): boolean {
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
  private inTimedStep(ctx: ControllerContext): boolean {
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

  /** What the controller reports as failed hardware: its dead modules, a lost fieldbus. */
  private hardwareCauses(wiring: Wiring): string[] {
    if (this.faults.deadModules.size === 0 && !this.faults.linkLoss) return NO_CAUSES;
    const causes: string[] = [];
    for (const m of this.config.modules) if (this.faults.moduleDead(m.id)) causes.push(`module "${m.id}" (rack ${m.rack} slot ${m.slot}) failed`);
    if (wiring.busMs !== null && !wiring.linkHealthy()) causes.push('fieldbus link lost');
    return causes;
  }

  // ---------------------------------------------------------------- outputs

  /** The handshake outputs by role, from the controller's state. */
  handshakeOutputs(): Record<string, boolean> {
    const ctx = this.ctx();
    const { state } = this.stateName();
    const powered = state !== 'off' && state !== 'booting';
    const on: Record<(typeof HANDSHAKE_OUTPUT_ROLES)[number], boolean> = {
      ready: state === 'ready',
      atHome: powered && isAtPose(ctx, ctx.config.homePose),
      cycling: state === 'cycling' || state === 'holding',
      atPosition: powered && isAtPose(ctx, ctx.lastTarget),
      partHeld: powered && roleOn(ctx, 'partHeld', false),
      cycleDone: powered && ctx.timeMs < ctx.cycleDoneUntilMs,
      fault: state === 'faulted',
    };
    return on;
  }

  /** Writes the routine's outputs, the handshake and output forces to the output channels. */
  writeOutputs(wiring: Wiring): void {
    wiring.invalidate();
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
      if (p && !p.input) out[t] = v;
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
      else arr[pt.channel] = applyInvert(v !== 0, pt.invert) ? 1 : 0;
    }
    wiring.updateLoads();
  }

  // ---------------------------------------------------------------- routine reload

  /**
   * A changed routine, downloaded: the machine's RELOAD_ROUTINE event (controller.machine.ts)
   * keeps power, clock, pose, alarms and cycle count, drops what the old routine drove, halts
   * any move where the arm is and restarts the routine at step 0; off, booting and faulted stay,
   * e-stopped stays halted, anything else goes to stopped. A new start edge is needed to cycle.
   */
  reloadRoutine(config: CellDocument['controller']): void {
    this.config = config;
    this.actor.send({ type: 'RELOAD_ROUTINE', config });
  }
}
