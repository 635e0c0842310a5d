/**
 * The robot controller as an xstate v5 machine. It has no timers of its own: the cell sends
 * `TICK` with the elapsed time and the inputs read at each I/O refresh, and all time lives in
 * the context (`timeMs`, boot countdown, step and pulse times), so a run is reproducible.
 *
 * States (our names): off → booting → stopped (powered, not ready) ⇄ ready → cycling ⇄ holding,
 * plus faulted and eStopped reachable from any powered state.
 * - E-stop (the e-stop-chain input goes off): stop category 0 halts motion at once and removes
 *   power; category 1 brakes at the move's deceleration and then removes power
 *   (IEC 60204-1 §9.2.2). Leaving eStopped needs the chain healthy *and* a fault-reset edge,
 *   and leads to stopped, never to motion (ISO 13850 §4.1.3: reset must not restart).
 * - Guard opened or stop requested while cycling → holding: the arm brakes to rest and the
 *   routine's clocks freeze; a start edge with the guard closed resumes.
 * - Servo power is off in stopped, faulted and eStopped once the arm is at rest: on entry when
 *   it already is, else in the refresh where the brake runs out. Ready and cycling turn it on.
 * - Decisions wait for inputs: after power-up (even with a boot time of 0) and after a routine
 *   reload, no state decision is made until an I/O refresh has read the inputs.
 * - RELOAD_ROUTINE (a download with a changed routine): off, booting and faulted stay where they
 *   are; an e-stopped controller stays e-stopped, halted; any other goes to stopped. In every
 *   case the routine restarts at step 0 and any move halts where the arm is.
 */
import { assign, setup } from 'xstate';
import type { ControllerConfig } from '@/simulator/schema/cell-document';
import {
  advanceMotion,
  beginBrake,
  reloadedContext,
  expirePulses,
  haltNow,
  initialControllerContext,
  raiseAlarm,
  roleOn,
  runRoutine,
  type ControllerContext,
} from './routine';

/** Events the controller accepts. */
export type ControllerEvent =
  | { type: 'TICK'; dt: number; inputs: Record<string, number>; hardware: string[] }
  | { type: 'POWER_ON' }
  | { type: 'POWER_OFF' }
  | { type: 'RESTART' }
  /** A changed routine (and poses) downloaded into the running controller. */
  | { type: 'RELOAD_ROUTINE'; config: ControllerConfig };

/** Input of the machine: the controller section of the cell document. It starts `off`; send `POWER_ON`. */
export type ControllerInput = { config: ControllerConfig };

type Ctx = ControllerContext;

function readTick(ctx: Ctx, e: Extract<ControllerEvent, { type: 'TICK' }>): Ctx {
  const starts = ctx.config.handshake.inputs.start;
  const resets = ctx.config.handshake.inputs.faultReset;
  const start = starts ? (e.inputs[starts] ?? 0) !== 0 : false;
  const reset = resets ? (e.inputs[resets] ?? 0) !== 0 : false;
  let next: Ctx = {
    ...ctx,
    timeMs: ctx.timeMs + e.dt,
    inputs: e.inputs,
    inputsRead: true,
    hardware: e.hardware,
    cycleComplete: false,
    startEdge: start && !ctx.prevStart,
    resetEdge: reset && !ctx.prevReset,
    prevStart: start,
    prevReset: reset,
  };
  for (const h of e.hardware) next = raiseAlarm(next, 'hardware', h);
  return expirePulses(next);
}

function tick(ctx: Ctx, event: ControllerEvent, f: (ctx: Ctx, dt: number) => Ctx): Ctx {
  return event.type === 'TICK' ? f(readTick(ctx, event), event.dt) : ctx;
}

function countBoot(ctx: Ctx, dt: number): Ctx {
  return { ...ctx, bootLeftMs: Math.max(0, ctx.bootLeftMs - dt) };
}

function brakeOut(ctx: Ctx, dt: number): Ctx {
  return stillServoOff(advanceMotion(ctx, dt));
}

function stillServoOff(ctx: Ctx): Ctx {
  return ctx.motion || !ctx.servoOn ? ctx : { ...ctx, servoOn: false };
}

function freshPower(ctx: Ctx): Ctx {
  const base = initialControllerContext(ctx.config);
  // A power cycle keeps where the arm physically is and the cell's clock.
  return { ...base, pose: ctx.pose, timeMs: ctx.timeMs };
}

/** The controller machine; create an actor with `createActor(controllerMachine, { input })`. */
export const controllerMachine = setup({
  types: {
    context: {} as Ctx,
    events: {} as ControllerEvent,
    input: {} as ControllerInput,
  },
  actions: {
    powerUp: assign(({ context }) => freshPower(context)),
    powerDown: assign(({ context }) => ({ ...haltNow(context), outputs: {}, pulses: [], wordEncodings: {} })),
    /** One I/O refresh while booting: read inputs, count the boot time down. */
    tickBoot: assign(({ context, event }) => tick(context, event, countBoot)),
    /** One refresh while cycling: read inputs, run the routine (which moves the arm). */
    tickCycle: assign(({ context, event }) => tick(context, event, runRoutine)),
    /** One refresh while ready or holding: read inputs, let any brake run out. */
    tickMove: assign(({ context, event }) => tick(context, event, advanceMotion)),
    /** One refresh while stopped, faulted or e-stopped: brake out, then remove power. */
    tickStill: assign(({ context, event }) => tick(context, event, brakeOut)),
    /** Time passing with nothing to do (the cell skips identical idle refreshes and catches up here). */
    addTime: assign(({ context, event }) => (event.type === 'TICK' ? { ...context, timeMs: context.timeMs + event.dt } : context)),
    servoOn: assign({ servoOn: true }),
    /** Power is removed once a controlled stop has reached rest. */
    servoOffWhenStill: assign(({ context }) => stillServoOff(context)),
    brake: assign(({ context }) => beginBrake(context)),
    haltNow: assign(({ context }) => haltNow(context)),
    consumeEdges: assign({ startEdge: false, resetEdge: false }),
    clearAlarms: assign(({ context }) => ({
      ...context,
      alarms: context.alarms.filter((a) => a.code === 'hardware' && context.hardware.includes(a.message)),
      stepElapsedMs: 0,
    })),
    /** The changed routine replaces the old one (see `reloadedContext`). */
    reloadRoutine: assign(({ context, event }) => (event.type === 'RELOAD_ROUTINE' ? reloadedContext(context, event.config) : context)),
    servoOff: assign({ servoOn: false }),
    holdForGuard: assign({ holdReason: 'guard' as const }),
    holdForStop: assign({ holdReason: 'stop' as const }),
    clearHold: assign({ holdReason: null }),
  },
  guards: {
    /** Boot time counted down, and the inputs read at least once (a boot time of 0 still reads before it decides). */
    bootDone: ({ context }) => context.bootLeftMs <= 0 && context.inputsRead,
    chainBroken: ({ context }) => context.inputsRead && !roleOn(context, 'estopHealthy', true),
    hasAlarm: ({ context }) => context.inputsRead && context.alarms.length > 0,
    canBeReady: ({ context }) => context.inputsRead && context.alarms.length === 0 && roleOn(context, 'estopHealthy', true) && !roleOn(context, 'stop', false),
    stopRequested: ({ context }) => roleOn(context, 'stop', false),
    guardOpen: ({ context }) => !roleOn(context, 'guardClosed', true),
    startPermitted: ({ context }) =>
      context.startEdge && roleOn(context, 'guardClosed', true) && roleOn(context, 'estopHealthy', true) && !roleOn(context, 'stop', false),
    resetAccepted: ({ context }) =>
      context.inputsRead && context.resetEdge && roleOn(context, 'estopHealthy', true) && context.hardware.length === 0,
    /** Resuming from a hold also waits for the arm to have braked to rest. */
    resumePermitted: ({ context }) =>
      context.motion === null &&
      context.startEdge &&
      roleOn(context, 'guardClosed', true) &&
      roleOn(context, 'estopHealthy', true) &&
      !roleOn(context, 'stop', false),
    cycleComplete: ({ context }) => context.cycleComplete,
    categoryZero: ({ context }) => context.config.stopCategory === 0,
  },
}).createMachine({
  id: 'controller',
  context: ({ input }) => initialControllerContext(input.config),
  initial: 'off',
  states: {
    off: {
      on: {
        POWER_ON: { target: 'booting', actions: 'powerUp' },
        RESTART: { target: 'booting', actions: 'powerUp' },
        TICK: { actions: 'addTime' },
        RELOAD_ROUTINE: { actions: 'reloadRoutine' },
      },
    },
    booting: {
      on: { TICK: { actions: 'tickBoot' }, RELOAD_ROUTINE: { actions: 'reloadRoutine' } },
      always: [{ guard: 'bootDone', target: 'stopped' }],
    },
    stopped: {
      // At rest, power goes on entry: an idle controller whose inputs do not change gets no
      // further TICK (the cell holds such refreshes back), so tickStill alone could leave the
      // servo on indefinitely. Still moving (a brake under way), tickStill removes it at rest.
      entry: ['consumeEdges', 'clearHold', 'servoOffWhenStill'],
      on: { TICK: { actions: 'tickStill' }, RELOAD_ROUTINE: { actions: ['reloadRoutine', 'servoOffWhenStill'] } },
      always: [
        { guard: 'chainBroken', target: 'eStopped' },
        { guard: 'hasAlarm', target: 'faulted' },
        { guard: 'canBeReady', target: 'ready' },
      ],
    },
    ready: {
      entry: ['consumeEdges', 'servoOn', 'clearHold'],
      on: { TICK: { actions: 'tickMove' }, RELOAD_ROUTINE: { target: 'stopped', actions: 'reloadRoutine' } },
      always: [
        { guard: 'chainBroken', target: 'eStopped' },
        { guard: 'hasAlarm', target: 'faulted' },
        { guard: 'stopRequested', target: 'stopped' },
        { guard: 'startPermitted', target: 'cycling' },
      ],
    },
    cycling: {
      entry: ['consumeEdges', 'clearHold', 'servoOn'],
      on: { TICK: { actions: 'tickCycle' }, RELOAD_ROUTINE: { target: 'stopped', actions: 'reloadRoutine' } },
      always: [
        { guard: 'chainBroken', target: 'eStopped' },
        { guard: 'hasAlarm', target: 'faulted' },
        { guard: 'guardOpen', target: 'holding', actions: 'holdForGuard' },
        { guard: 'stopRequested', target: 'holding', actions: 'holdForStop' },
        { guard: 'cycleComplete', target: 'ready' },
      ],
    },
    holding: {
      entry: ['consumeEdges', 'brake'],
      on: { TICK: { actions: 'tickMove' }, RELOAD_ROUTINE: { target: 'stopped', actions: 'reloadRoutine' } },
      always: [
        { guard: 'chainBroken', target: 'eStopped' },
        { guard: 'hasAlarm', target: 'faulted' },
        { guard: 'resumePermitted', target: 'cycling' },
      ],
    },
    faulted: {
      // As in stopped: power off at once when already at rest, otherwise once the brake runs out.
      entry: ['consumeEdges', 'brake', 'clearHold', 'servoOffWhenStill'],
      on: { TICK: { actions: 'tickStill' }, RELOAD_ROUTINE: { actions: 'reloadRoutine' } },
      always: [
        { guard: 'chainBroken', target: 'eStopped' },
        { guard: 'resetAccepted', target: 'stopped', actions: 'clearAlarms' },
      ],
    },
    eStopped: {
      entry: ['consumeEdges', 'clearHold'],
      initial: 'choose',
      states: {
        choose: {
          always: [{ guard: 'categoryZero', target: 'halted', actions: 'haltNow' }, { target: 'braking', actions: 'brake' }],
        },
        halted: {},
        braking: {
          always: [{ guard: ({ context }) => context.motion === null, target: 'halted', actions: 'servoOffWhenStill' }],
        },
      },
      on: { TICK: { actions: 'tickStill' }, RELOAD_ROUTINE: { target: '.halted', actions: ['reloadRoutine', 'servoOff'] } },
      always: [{ guard: 'resetAccepted', target: 'stopped', actions: 'clearAlarms' }],
    },
  },
  on: {
    POWER_OFF: { target: '.off', actions: 'powerDown' },
    RESTART: { target: '.booting', actions: 'powerUp' },
  },
});

/** Plain-English state names of the controller, as shown in snapshots. */
export type ControllerStateName = 'off' | 'booting' | 'stopped' | 'ready' | 'cycling' | 'holding' | 'faulted' | 'eStopped';
