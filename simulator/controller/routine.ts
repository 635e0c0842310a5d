/**
 * The routine executor and arm motion as pure functions over the controller's context.
 * The xstate machine (controller.machine.ts) calls these from its named actions; keeping
 * them here lets each be tested without a machine and keeps the machine file readable.
 */
import type { Condition, ControllerConfig, Pose, RoutineStep, WordEncoding } from '@/simulator/schema/cell-document';
import { MAX_INSTANT_STEPS_PER_REFRESH } from '@/simulator/schema/limits';
import { along, pathLength, positionAtTime, speedAtTime, moveTime } from './motion';

/** An active alarm: code, message, and when it was raised (ms of cell time). */
export type Alarm = { code: string; message: string; atMs: number };

/** A planned path segment: a rest-to-rest move, or a brake from speed to rest. */
export type Motion =
  | { kind: 'move'; poseId: string; from: number[]; to: number[]; length: number; vmax: number; amax: number; elapsedMs: number }
  | { kind: 'brake'; origin: number[]; dir: number[]; v0: number; a: number; elapsedMs: number };

/** Everything the controller machine keeps between ticks (plain, serialisable data). */
export type ControllerContext = {
  config: ControllerConfig;
  poses: Record<string, Pose>;
  labels: Record<string, number>;
  timeMs: number;
  bootLeftMs: number;
  /** Logical input values read at the last I/O refresh (booleans as 0/1). */
  inputs: Record<string, number>;
  /**
   * True once inputs have been read since power-up or a routine reload: the controller makes
   * no state decision (boot done, e-stop chain, ready, reset) on inputs it has not read.
   */
  inputsRead: boolean;
  startEdge: boolean;
  resetEdge: boolean;
  prevStart: boolean;
  prevReset: boolean;
  /** Hardware causes (dead module, link lost) present at the last refresh. */
  hardware: string[];
  /** Values the routine drives (DO, AO, WO, TO), by logical point. */
  outputs: Record<string, number>;
  /** Encoding of each word output, set by the last set-word step. */
  wordEncodings: Record<string, WordEncoding>;
  pulses: { ref: string; untilMs: number }[];
  pc: number;
  stepElapsedMs: number;
  pose: number[];
  speed: number;
  motion: Motion | null;
  servoOn: boolean;
  lastTarget: string | null;
  alarms: Alarm[];
  cycleDoneUntilMs: number;
  cycleComplete: boolean;
  cyclesCompleted: number;
  holdReason: 'guard' | 'stop' | null;
};

/** Builds the starting context of a controller (arm at its home pose, nothing running). */
export function initialControllerContext(config: ControllerConfig): ControllerContext {
  const poses: Record<string, Pose> = {};
  for (const p of config.poses) poses[p.id] = p;
  const labels: Record<string, number> = {};
  config.routine.forEach((s, i) => {
    if (s.label) labels[s.label] = i;
  });
  const home = poses[config.homePose]?.coordinates ?? new Array(config.axes).fill(0);
  return {
    config,
    poses,
    labels,
    timeMs: 0,
    bootLeftMs: config.bootMs,
    inputs: {},
    inputsRead: false,
    startEdge: false,
    resetEdge: false,
    prevStart: false,
    prevReset: false,
    hardware: [],
    outputs: {},
    wordEncodings: {},
    pulses: [],
    pc: 0,
    stepElapsedMs: 0,
    pose: padTo([...home], config.axes),
    speed: 0,
    motion: null,
    servoOn: false,
    lastTarget: null,
    alarms: [],
    cycleDoneUntilMs: -1,
    cycleComplete: false,
    cyclesCompleted: 0,
    holdReason: null,
  };
}

function padTo(v: number[], n: number): number[] {
  while (v.length < n) v.push(0);
  return v.slice(0, n);
}

/** True when a role is configured and its input is on; `fallback` when it is not configured. */
export function roleOn(ctx: ControllerContext, role: keyof ControllerConfig['handshake']['inputs'], fallback: boolean): boolean {
  const ref = ctx.config.handshake.inputs[role];
  if (!ref) return fallback;
  return (ctx.inputs[ref] ?? 0) !== 0;
}

/** Reads a point for a condition: inputs first, then the controller's own outputs. */
export function pointValue(ctx: ControllerContext, ref: string): number {
  return ctx.inputs[ref] ?? ctx.outputs[ref] ?? 0;
}

/** Evaluates a routine condition. */
export function evaluateCondition(ctx: ControllerContext, c: Condition): boolean {
  const v = pointValue(ctx, c.point);
  switch (c.op) {
    case '==':
      return v === c.value;
    case '!=':
      return v !== c.value;
    case '>':
      return v > c.value;
    case '>=':
      return v >= c.value;
    case '<':
      return v < c.value;
    case '<=':
      return v <= c.value;
  }
}

/** Position and speed of the arm after `motion` has run `elapsedMs`. */
export function samplePath(m: Motion, elapsedMs: number): { pose: number[]; speed: number; done: boolean } {
  const t = elapsedMs / 1000;
  if (m.kind === 'move') {
    const s = positionAtTime(m.length, m.vmax, m.amax, t);
    const done = t >= moveTime(m.length, m.vmax, m.amax);
    return { pose: done ? [...m.to] : along(m.from, m.to, s, m.length), speed: done ? 0 : speedAtTime(m.length, m.vmax, m.amax, t), done };
  }
  const tStop = m.v0 / m.a;
  const tt = Math.min(t, tStop);
  const s = m.v0 * tt - 0.5 * m.a * tt * tt;
  return { pose: m.origin.map((o, i) => o + m.dir[i] * s), speed: t >= tStop ? 0 : m.v0 - m.a * t, done: t >= tStop };
}

/** Advances the current motion by `dt` ms; returns the context with pose, speed and motion updated. */
export function advanceMotion(ctx: ControllerContext, dt: number): ControllerContext {
  if (!ctx.motion) return ctx.speed === 0 ? ctx : { ...ctx, speed: 0 };
  const motion = { ...ctx.motion, elapsedMs: ctx.motion.elapsedMs + dt };
  const s = samplePath(motion, motion.elapsedMs);
  return { ...ctx, pose: s.pose, speed: s.speed, motion: s.done ? null : motion };
}

/**
 * Turns the current motion into a brake at the move's acceleration (a controlled stop,
 * IEC 60204-1 §9.2.2 category 1 / a hold). A brake already under way is kept.
 */
export function beginBrake(ctx: ControllerContext): ControllerContext {
  const m = ctx.motion;
  if (!m || m.kind === 'brake') return ctx;
  const cur = samplePath(m, m.elapsedMs);
  if (cur.done || cur.speed <= 0) return { ...ctx, motion: null, speed: 0, pose: cur.pose };
  const dir = m.to.map((v, i) => (v - m.from[i]) / m.length);
  return { ...ctx, pose: cur.pose, speed: cur.speed, motion: { kind: 'brake', origin: cur.pose, dir, v0: cur.speed, a: m.amax, elapsedMs: 0 } };
}

/** Stop category 0: motion ends where the arm is, this instant, and power is removed. */
export function haltNow(ctx: ControllerContext): ControllerContext {
  return { ...ctx, motion: null, speed: 0, servoOn: false };
}

/** Ends pulses whose time is up. */
export function expirePulses(ctx: ControllerContext): ControllerContext {
  if (ctx.pulses.length === 0) return ctx;
  const outputs = { ...ctx.outputs };
  const pulses = ctx.pulses.filter((p) => {
    if (ctx.timeMs >= p.untilMs) {
      outputs[p.ref] = 0;
      return false;
    }
    return true;
  });
  return { ...ctx, outputs, pulses };
}

function target(ctx: ControllerContext, to: string | number): number {
  return typeof to === 'number' ? to : (ctx.labels[to] ?? ctx.config.routine.length);
}

function raise(ctx: ControllerContext, code: string, message: string): ControllerContext {
  if (ctx.alarms.some((a) => a.code === code && a.message === message)) return ctx;
  return { ...ctx, alarms: [...ctx.alarms, { code, message, atMs: ctx.timeMs }] };
}

/** Adds an alarm (no duplicate of the same code and message). */
export const raiseAlarm = raise;

/**
 * Runs the routine for one refresh of `dt` ms while cycling. Time-consuming steps (wait,
 * pause, move) use the refresh's time once; instant steps (set, pulse, set-word, branch,
 * jump) run on within the same refresh, at most {@link MAX_INSTANT_STEPS_PER_REFRESH} of
 * them, so a jump loop cannot hang the engine. Reaching the end of the routine completes a
 * cycle: the cycle-done pulse starts and the program pointer returns to step 0.
 */
export function runRoutine(input: ControllerContext, dt: number): ControllerContext {
  let ctx = input;
  const steps: readonly RoutineStep[] = ctx.config.routine;
  let timeUsed = false;
  for (let n = 0; n < MAX_INSTANT_STEPS_PER_REFRESH; n++) {
    if (ctx.pc >= steps.length) {
      return {
        ...ctx,
        pc: 0,
        stepElapsedMs: 0,
        cycleComplete: true,
        cyclesCompleted: ctx.cyclesCompleted + 1,
        cycleDoneUntilMs: ctx.timeMs + ctx.config.cycleDonePulseMs,
      };
    }
    const step = steps[ctx.pc];
    const next = { pc: ctx.pc + 1, stepElapsedMs: 0 };
    switch (step.kind) {
      case 'wait': {
        if (evaluateCondition(ctx, step.condition)) {
          ctx = { ...ctx, ...next };
          continue;
        }
        if (timeUsed) return ctx;
        const elapsed = ctx.stepElapsedMs + dt;
        if (step.timeoutMs !== undefined && elapsed >= step.timeoutMs) {
          return raise({ ...ctx, stepElapsedMs: elapsed }, 'wait_timeout', step.alarm ?? `step ${ctx.pc}: ${step.condition.point} not ${step.condition.op} ${step.condition.value} within ${step.timeoutMs} ms`);
        }
        return { ...ctx, stepElapsedMs: elapsed };
      }
      case 'set':
        ctx = { ...ctx, ...next, outputs: { ...ctx.outputs, [step.point]: step.value } };
        continue;
      case 'pulse':
        ctx = {
          ...ctx,
          ...next,
          outputs: { ...ctx.outputs, [step.point]: 1 },
          pulses: [...ctx.pulses.filter((p) => p.ref !== step.point), { ref: step.point, untilMs: ctx.timeMs + step.ms }],
        };
        continue;
      case 'set-word':
        ctx = {
          ...ctx,
          ...next,
          outputs: { ...ctx.outputs, [step.point]: step.value },
          wordEncodings: { ...ctx.wordEncodings, [step.point]: step.encoding },
        };
        continue;
      case 'branch':
        ctx = { ...ctx, pc: evaluateCondition(ctx, step.condition) ? target(ctx, step.to) : ctx.pc + 1, stepElapsedMs: 0 };
        continue;
      case 'jump':
        ctx = { ...ctx, pc: target(ctx, step.to), stepElapsedMs: 0 };
        continue;
      case 'alarm':
        return raise(ctx, 'routine_alarm', step.message);
      case 'pause': {
        if (timeUsed) return ctx;
        const elapsed = ctx.stepElapsedMs + dt;
        if (elapsed >= step.ms) {
          ctx = { ...ctx, ...next };
          timeUsed = true;
          continue;
        }
        return { ...ctx, stepElapsedMs: elapsed };
      }
      case 'move': {
        if (timeUsed) return ctx;
        const pose = ctx.poses[step.pose];
        if (!pose) return raise(ctx, 'unknown_pose', `step ${ctx.pc}: no pose "${step.pose}"`);
        if (!ctx.motion || ctx.motion.kind !== 'move' || ctx.motion.poseId !== pose.id) {
          const to = padTo([...pose.coordinates], ctx.config.axes);
          const length = pathLength(ctx.pose, to);
          const vmax = pose.speed * ((step.speedPercent ?? 100) / 100);
          ctx = { ...ctx, motion: { kind: 'move', poseId: pose.id, from: [...ctx.pose], to, length, vmax, amax: pose.accel, elapsedMs: 0 } };
        }
        ctx = advanceMotion(ctx, dt);
        timeUsed = true;
        if (ctx.motion === null) {
          ctx = { ...ctx, ...next, lastTarget: step.pose };
          continue;
        }
        return ctx;
      }
    }
  }
  return ctx;
}

/** True when the arm is still and within the position tolerance of pose `id`. */
export function isAtPose(ctx: ControllerContext, id: string | null): boolean {
  if (!id || ctx.motion) return false;
  const p = ctx.poses[id];
  if (!p) return false;
  return pathLength(ctx.pose, padTo([...p.coordinates], ctx.config.axes)) <= ctx.config.positionTolerance;
}

/**
 * The context after a changed routine is loaded: power, clock, pose, alarms and cycle count
 * are kept; what the old routine drove (outputs, pulses, word encodings) is dropped, any move
 * halts where the arm is, and the routine starts over at step 0. Edges are consumed and the
 * inputs count as unread, so the next state decision waits for the next I/O refresh.
 */
export function reloadedContext(ctx: ControllerContext, config: ControllerConfig): ControllerContext {
  const fresh = initialControllerContext(config);
  return {
    ...ctx,
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
    startEdge: false,
    resetEdge: false,
    inputsRead: false,
  };
}
