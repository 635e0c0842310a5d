/**
 * The device catalogue: per device type, one entry saying what its terminals put on the
 * wiring, what it shows in a snapshot (and so which `dev.<id>.<property>` signals it has),
 * which operator events move it, which fault cards apply to it and how long it travels.
 * Like the block catalogue (plc/catalogue.ts), a table beats a method per case: the generic
 * reading (with device faults), the fast path (without) and the signal list are all derived
 * from the same entry.
 */
import { contactClosed, engineeringToSignal, SIGNAL_SPANS } from '@/simulator/electrical';
import { rejected, type Problem, type Result } from '@/simulator/shared/result';
import type { CellDocument, FieldDevice, PanelDevice } from '@/simulator/schema/cell-document';
import type { Clock } from './clock';
import type { FaultKind } from '@/simulator/faults/fault-card';
import type { CellEvent } from './events';
import type { DevFaults } from './fault-state';
import type { DeviceSnapshot } from './snapshot';
import { contact, OFF, SENSOR, type Src, type SrcReader } from './sources';

/** Any panel or field device. */
export type Device = PanelDevice | FieldDevice;
/** A device type name. */
export type DeviceType = Device['type'];

/** The live state of one device. */
export type DevState = {
  dev: Device;
  pressed: boolean;
  latched: boolean;
  position: number;
  value: number;
  active: boolean;
  /** Actuators: commanded on. */
  cmd: boolean;
  /** Actuators: travel 0..1 at `posAtMs` (see {@link travelAt}). */
  pos: number;
  posAtMs: number;
  lamps: boolean[];
  /** Numeric display: the decoded value (−1 for a word invalid in its encoding). */
  display: number;
  /** Active device fault cards' effect, or null for a healthy device (kept by the fault cards). */
  faults: DevFaults | null;
};

/** What an output terminal of a device puts on its row when the device is healthy. */
type Output =
  /** A contact; `stuck` when stuck-on / stuck-off cards force it. */
  | { kind: 'contact'; closed: (d: DevState, t: number) => boolean; stuck: boolean }
  /** A three-wire sensor output, switched while the sensor detects. */
  | { kind: 'sensor' }
  /** An analog signal (V or mA) for the device's value. */
  | { kind: 'analog' };

/** The operator events that move devices. */
type OperatorEvent = Extract<CellEvent, { type: 'press' | 'release' | 'toggle' | 'set-selector' | 'set-analog' | 'set-field' }>;
type FaultKindOnDevice = 'stuck-on' | 'stuck-off' | 'slow-actuator' | 'analog-drift' | 'analog-loss' | 'sensor-type-mismatch' | 'sensor-leakage';

/** One catalogue entry. */
type Kind = {
  /** What `terminal` sources (null for input terminals). */
  output(dev: Device, terminal: string): Output | null;
  /** A sensor's detection while healthy (target present, part present; a light-on photo-eye inverts). */
  sees?(d: DevState): boolean;
  /** Snapshot fields beyond id, type and label; `t` is the cell time, `source` the device's reading of a terminal. */
  snapshot(d: DevState, t: number, source: (terminal: string) => Src): Omit<DeviceSnapshot, 'id' | 'type' | 'label'>;
  /** Operator events the device takes. */
  events: readonly OperatorEvent['type'][];
  /** Fault cards that apply to it. */
  faults: readonly FaultKindOnDevice[];
  /** Full-stroke travel time (ms) of an actuator for a command (0: instant). */
  strokeMs?(dev: Device, cmd: boolean): number;
};

/** A conveyor's run-up (and run-down) to full speed, ms (our model). */
const CONVEYOR_RAMP_MS = 200;
const STUCK: FaultKindOnDevice[] = ['stuck-on', 'stuck-off'];
const SENSOR_FAULTS: FaultKindOnDevice[] = ['stuck-on', 'stuck-off', 'sensor-type-mismatch', 'sensor-leakage'];
const ACTUATOR_FAULTS: FaultKindOnDevice[] = ['stuck-on', 'stuck-off', 'slow-actuator'];
const BUTTON_EVENTS: OperatorEvent['type'][] = ['press', 'release', 'toggle'];
const FIELD_EVENTS: OperatorEvent['type'][] = ['press', 'release', 'toggle', 'set-field'];

const contactOf = (closed: (d: DevState, t: number) => boolean, stuck = true): Output => ({ kind: 'contact', closed, stuck });
const closedOn = (terminal: string, want: string, closed: (d: DevState, t: number) => boolean): Output | null => (terminal === want ? contactOf(closed) : null);
const lamps = (d: DevState) => ({ lamps: [...d.lamps] });
const closedFeedback = (terms: string[], source: (terminal: string) => Src) => {
  const feedback: Record<string, boolean> = {};
  for (const t of terms) {
    const s = source(t);
    feedback[t] = s.k === 'contact' && s.closed;
  }
  return feedback;
};
const button = (lit: boolean): Kind => ({
  output: (dev, terminal) => {
    if (terminal !== 'contact' || (dev.type !== 'push-button' && dev.type !== 'illuminated-button')) return null;
    const kind = dev.contact;
    return dev.action === 'momentary' ? contactOf((d) => contactClosed(kind, d.pressed)) : contactOf((d) => contactClosed(kind, d.latched));
  },
  snapshot: (d) => (lit ? { pressed: d.pressed, latched: d.latched, ...lamps(d) } : { pressed: d.pressed, latched: d.latched }),
  events: BUTTON_EVENTS,
  faults: STUCK,
});
const sensor = (sees: (d: DevState) => boolean): Kind => ({
  output: (_dev, terminal) => (terminal === 'out' ? { kind: 'sensor' } : null),
  sees,
  snapshot: (d) => ({ active: d.active, led: detecting(d) }),
  events: FIELD_EVENTS,
  faults: SENSOR_FAULTS,
});
const actuator = (feedback: string[], output: Kind['output'], strokeMs: Kind['strokeMs']): Kind => ({
  output,
  snapshot: (d, t, source) => ({ command: d.cmd, travel: travelAt(d, t), feedback: closedFeedback(feedback, source) }),
  events: [],
  faults: ACTUATOR_FAULTS,
  strokeMs,
});

/** The catalogue, by device type (panel devices first, then field devices). */
export const DEVICE_CATALOGUE: Readonly<Record<DeviceType, Kind>> = {
  'push-button': button(false),
  'illuminated-button': button(true),
  'selector-switch': {
    // Closed when the terminal is `pos<position>`; a terminal of any other shape never closes.
    output: (_dev, terminal) => {
      const m = /^pos(0|[1-9]\d*)$/.exec(terminal);
      const at = m ? Number(m[1]) : -1;
      return contactOf((d) => d.position === at);
    },
    snapshot: (d) => ({ position: d.position }),
    events: ['set-selector'],
    faults: STUCK,
  },
  'e-stop': {
    // Latching, with an NC contact: struck (latched) opens the circuit (ISO 13850).
    output: (_dev, terminal) => closedOn(terminal, 'contact', (d) => contactClosed('NC', d.latched)),
    snapshot: (d) => ({ pressed: d.latched, latched: d.latched }),
    events: BUTTON_EVENTS,
    faults: STUCK,
  },
  'pilot-light': { output: () => null, snapshot: lamps, events: [], faults: [] },
  'stack-light': { output: () => null, snapshot: lamps, events: [], faults: [] },
  potentiometer: {
    output: (_dev, terminal) => (terminal === 'signal' ? { kind: 'analog' } : null),
    snapshot: (d) => ({ value: d.value }),
    events: ['set-analog'],
    faults: ['analog-drift', 'analog-loss'],
  },
  'numeric-display': { output: () => null, snapshot: (d) => ({ value: d.display }), events: [], faults: [] },
  'proximity-sensor': sensor((d) => d.active),
  'photo-eye': sensor((d) => (d.dev.type === 'photo-eye' && d.dev.mode === 'light-on' ? !d.active : d.active)),
  'part-sensor': sensor((d) => d.active),
  'guard-switch': {
    // Actuated while the guard is open: an NC contact is closed while the guard is closed.
    output: (dev, terminal) => (terminal === 'contact' && dev.type === 'guard-switch' ? contactOf((d) => contactClosed(dev.contact, !d.active)) : null),
    snapshot: (d) => ({ active: d.active }),
    events: FIELD_EVENTS,
    faults: STUCK,
  },
  // A stuck card holds the gripper's "closed" feedback; its "open" switch follows the jaws.
  gripper: actuator(
    ['closed', 'open'],
    (_dev, terminal) => (terminal === 'closed' ? contactOf((d, t) => travelAt(d, t) >= 1) : terminal === 'open' ? contactOf((d, t) => travelAt(d, t) <= 0, false) : null),
    (dev) => (dev.type === 'gripper' ? dev.travelMs : 0),
  ),
  'vacuum-cup': actuator(
    ['switch'],
    // The switch closes once vacuum is fully built and opens as soon as it starts to release.
    (_dev, terminal) => closedOn(terminal, 'switch', (d, t) => (d.cmd ? travelAt(d, t) >= 1 : travelAt(d, t) > 0)),
    (dev, cmd) => (dev.type === 'vacuum-cup' ? (cmd ? dev.buildMs : dev.releaseMs) : 0),
  ),
  conveyor: actuator(['running'], (_dev, terminal) => closedOn(terminal, 'running', (d, t) => travelAt(d, t) >= 1), () => CONVEYOR_RAMP_MS),
};

/** The device types an operator event or a fault kind applies to, in catalogue order. */
export function typesTaking(what: { event: string } | { fault: string }): DeviceType[] {
  return (Object.keys(DEVICE_CATALOGUE) as DeviceType[]).filter((t) => {
    const k = DEVICE_CATALOGUE[t];
    return 'event' in what ? (k.events as readonly string[]).includes(what.event) : (k.faults as readonly string[]).includes(what.fault);
  });
}

/**
 * Device types each device fault card applies to, by kind (from the catalogue): a card on any
 * other device is refused when it is armed.
 */
export const FAULT_DEVICE_TYPES: Readonly<Partial<Record<FaultKind, readonly DeviceType[]>>> = Object.freeze(
  Object.fromEntries((['stuck-on', 'stuck-off', 'slow-actuator', 'analog-drift', 'analog-loss', 'sensor-type-mismatch', 'sensor-leakage'] as const).map((k) => [k, typesTaking({ fault: k })])),
);

/** True for devices an output drives on and off (lamps and displays only show what they get). */
export function isActuator(dev: Device): boolean {
  return DEVICE_CATALOGUE[dev.type].strokeMs !== undefined;
}

// ---------------------------------------------------------------- state and travel

/** A device's state at the start of a run, from the document's initial state. */
export function initialDeviceState(dev: Device, init: NonNullable<CellDocument['initial']['devices']>[string] = {}): DevState {
  const active = dev.type === 'guard-switch' ? (init.guardClosed ?? init.active ?? true) : dev.type === 'part-sensor' ? (init.partPresent ?? init.active ?? false) : (init.active ?? false);
  const value = dev.type === 'potentiometer' ? Math.min(dev.max, Math.max(dev.min, init.value ?? dev.min)) : (init.value ?? 0);
  const lampList = dev.type === 'stack-light' ? dev.tiers.map(() => false) : [false];
  return { dev, pressed: init.pressed ?? false, latched: init.latched ?? false, position: init.position ?? 0, value, active, cmd: false, pos: 0, posAtMs: 0, lamps: lampList, display: 0, faults: null };
}

/** Travel time (ms, full stroke) of an actuator now, including a slow-actuator fault. */
function strokeMs(d: DevState): number {
  const base = DEVICE_CATALOGUE[d.dev.type].strokeMs?.(d.dev, d.cmd) ?? 0;
  return base * (d.faults?.slow ?? 1);
}

/**
 * An actuator's travel (0..1) at time `t`: a pure function of where it was when last
 * rebased (command change, fault change) — never of when it was read, so reading a
 * snapshot cannot change a run.
 */
export function travelAt(d: DevState, t: number): number {
  const target = d.cmd ? 1 : 0;
  const T = strokeMs(d);
  if (T <= 0) return target;
  const moved = (t - d.posAtMs) / T;
  return d.pos < target ? Math.min(target, d.pos + moved) : Math.max(target, d.pos - moved);
}

/** Fixes the actuator's travel at `t` as the new starting point (before its command or faults change). */
export function rebase(d: DevState, t: number): void {
  d.pos = travelAt(d, t);
  d.posAtMs = t;
}

/** When the actuator will reach its end (after `t`), or null when it is at rest. */
export function arrival(d: DevState, t: number): number | null {
  const target = d.cmd ? 1 : 0;
  if (d.pos === target) return null;
  const end = d.posAtMs + Math.max(1, Math.ceil(Math.abs(target - d.pos) * strokeMs(d) - 1e-9));
  return end > t ? end : null;
}

/** Changes an actuator's command at `t`; true when it changed (what the wiring delivers may then change). */
export function command(d: DevState, on: boolean, t: number): boolean {
  if (d.cmd === on) return false;
  rebase(d, t);
  d.cmd = on;
  return true;
}

// ---------------------------------------------------------------- readings

/** Whether a sensor detects now, stuck faults included. */
export function detecting(d: DevState): boolean {
  const f = d.faults;
  if (f?.stuckOn) return true;
  if (f?.stuckOff) return false;
  return DEVICE_CATALOGUE[d.dev.type].sees?.(d) ?? false;
}

/** What a device's output terminal puts on its row at `t`, device faults included. */
export function deviceSource(d: DevState, terminal: string, t: number): Src {
  const dev = d.dev;
  const out = DEVICE_CATALOGUE[dev.type].output(dev, terminal);
  if (!out) return OFF;
  const f = d.faults;
  switch (out.kind) {
    case 'contact': {
      const closed = out.closed(d, t);
      return contact(f && out.stuck ? (f.stuckOn ? true : f.stuckOff ? false : closed) : closed);
    }
    case 'sensor': {
      const stage = dev.type === 'proximity-sensor' || dev.type === 'photo-eye' || dev.type === 'part-sensor' ? dev.output : 'PNP';
      const fitted = f?.mismatch ? (stage === 'PNP' ? 'NPN' : 'PNP') : stage;
      const on = detecting(d);
      // Switched off, a leaky sensor still passes a little current through the input.
      if (!on && f && f.leakMa > 0) return { k: 'sensor', out: fitted, on: false, leakMa: f.leakMa };
      return SENSOR[fitted][on ? 1 : 0];
    }
    case 'analog': {
      if (dev.type !== 'potentiometer') return OFF;
      const unit = SIGNAL_SPANS[dev.signal].unit;
      if (f?.loss) return { k: 'analog', value: 0, unit };
      let value = engineeringToSignal(d.value, dev.signal, dev.min, dev.max);
      if (f?.drift) value += (f.drift.rate * (t - f.drift.since)) / 1000;
      return { k: 'analog', value, unit };
    }
  }
}

/**
 * {@link deviceSource} for a healthy device, specialised once to its type and terminal (the
 * hot path), reading the time from `clock`. Null where only the generic reading is worth
 * having (a faulted device, an analog signal).
 */
export function fastDeviceSource(d: DevState, terminal: string, clock: Clock): SrcReader | null {
  if (d.faults !== null) return null;
  const dev = d.dev;
  const kind = DEVICE_CATALOGUE[dev.type];
  const out = kind.output(dev, terminal);
  if (!out) return () => OFF;
  switch (out.kind) {
    case 'contact': {
      const closed = out.closed;
      return () => contact(closed(d, clock.now));
    }
    case 'sensor': {
      if (!kind.sees || (dev.type !== 'proximity-sensor' && dev.type !== 'photo-eye' && dev.type !== 'part-sensor')) return null;
      const pair = SENSOR[dev.output];
      const sees = kind.sees;
      return () => pair[sees(d) ? 1 : 0];
    }
    case 'analog':
      return null;
  }
}

/** A device's snapshot at `t`. */
export function deviceSnapshot(d: DevState, t: number): DeviceSnapshot {
  const dev = d.dev;
  return { id: dev.id, type: dev.type, label: dev.label, ...DEVICE_CATALOGUE[dev.type].snapshot(d, t, (terminal) => deviceSource(d, terminal, t)) };
}

/**
 * The properties a device's signals (`dev.<id>.<property>`) read: its snapshot's fields, each
 * lamp as `lamp<i>` and each feedback contact by terminal name.
 */
export function deviceSignalProperties(dev: Device): string[] {
  const s = deviceSnapshot(initialDeviceState(dev), 0);
  const names: string[] = [];
  for (const k of Object.keys(s)) if (!['id', 'type', 'label', 'lamps', 'feedback'].includes(k)) names.push(k);
  if (s.lamps) s.lamps.forEach((_, i) => names.push(`lamp${i}`));
  if (s.feedback) for (const k of Object.keys(s.feedback)) names.push(k);
  return names;
}

// ---------------------------------------------------------------- operator events

/** Finds a device an event may move, or the reason it may not. */
export function deviceFor(devices: ReadonlyMap<string, DevState>, id: string, event: OperatorEvent['type']): Result<DevState, Problem> {
  const d = devices.get(id);
  if (!d) return rejected('unknown_device', `no device "${id}"`, ['device']);
  if (!DEVICE_CATALOGUE[d.dev.type].events.includes(event)) return rejected('wrong_device_type', `"${id}" is a ${d.dev.type}; this event needs a ${typesTaking({ event }).join(' or ')}`, ['device']);
  return { ok: true, value: d };
}

/** Applies an operator event to its device (after {@link deviceFor}); a rejected one changes nothing. */
export function operate(d: DevState, e: OperatorEvent): Result<true, Problem> {
  const dev = d.dev;
  switch (e.type) {
    case 'press':
    case 'release':
    case 'toggle':
      if (dev.type === 'e-stop') {
        d.latched = e.type === 'toggle' ? !d.latched : e.type === 'press';
      } else if (dev.type === 'push-button' || dev.type === 'illuminated-button') {
        if (dev.action === 'maintained') {
          if (e.type !== 'release') d.latched = !d.latched;
          d.pressed = e.type === 'press';
        } else d.pressed = e.type === 'toggle' ? !d.pressed : e.type === 'press';
      } else {
        if (e.type !== 'toggle') return rejected('wrong_device_type', `"${dev.id}" is a ${dev.type}: use set-field or toggle`, ['type']);
        d.active = !d.active;
      }
      return { ok: true, value: true };
    case 'set-selector':
      if (dev.type !== 'selector-switch') return { ok: true, value: true };
      if (e.position >= dev.positions.length) return rejected('out_of_range', `"${dev.id}" has positions 0..${dev.positions.length - 1}`, ['position']);
      d.position = e.position;
      return { ok: true, value: true };
    case 'set-analog':
      if (dev.type !== 'potentiometer') return { ok: true, value: true };
      if (!(e.value >= dev.min && e.value <= dev.max)) return rejected('out_of_range', `"${dev.id}" ranges ${dev.min}..${dev.max} ${dev.unit}`, ['value']);
      d.value = e.value;
      return { ok: true, value: true };
    case 'set-field':
      d.active = e.active;
      return { ok: true, value: true };
  }
}
