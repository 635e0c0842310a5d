import type { CellSnapshot, LoggedEvent, Trace } from '@/simulator';

type WireSnapshot = CellSnapshot['wires'][number];

/** A wire as a meter sees it: level, reading, loop status, but not which card acts on it. */
export type SanitisedWire = Omit<WireSnapshot, 'faults'>;

/** What a student attempting a drill may see: every symptom, no fault card. */
export type SanitisedSnapshot = Omit<CellSnapshot, 'faults' | 'wires' | 'seed'> & { wires: SanitisedWire[] };

/**
 * Strips everything that names a fault card from a snapshot, and the run's seed (which decides
 * when an intermittent fault acts): the `faults` list and each
 * wire's `faults`. Symptoms stay (levels, readings, NE 43 loop status, module fault lists,
 * link health, controller alarms), since finding the fault from them is the exercise.
 * Builds a new object (the cell's snapshot is not modified) and copies only known keys, so
 * a field the engine adds later is not passed through unreviewed.
 */
export function sanitiseSnapshot(s: CellSnapshot): SanitisedSnapshot {
  return {
    timeMs: s.timeMs,
    devices: s.devices,
    wires: s.wires.map((w) => {
      const out: SanitisedWire = { id: w.id, level: w.level, unit: w.unit, reading: w.reading, isLink: w.isLink };
      if (w.loop !== undefined) out.loop = w.loop;
      return out;
    }),
    plc: s.plc,
    link: s.link,
    // The supply voltage is a symptom a meter shows; it names no card.
    supply: s.supply,
    controller: s.controller,
    arm: s.arm,
    forces: s.forces,
  };
}

/** True for a signal that reports a fault card directly (`fault.<card id>`). Module fault LEDs (`plc.fault.<module>`) are symptoms and stay. */
export function isHiddenSignal(name: string): boolean {
  return name.startsWith('fault.');
}

/** Signals a replay shows: everything a technician could observe (not the free-running clock), plus the hidden ones when allowed. */
export function displaySignals(names: string[], hidden: string[]): string[] {
  const shown = names.filter((n) => n !== 'time' && !isHiddenSignal(n));
  for (const h of hidden) if (!shown.includes(h)) shown.push(h);
  return shown;
}

/** A trace without signals that name fault cards (indices renumbered). */
export function sanitiseTrace(trace: Trace): Trace {
  const keep: number[] = [];
  const map = new Map<number, number>();
  trace.signals.forEach((s, i) => {
    if (!isHiddenSignal(s)) {
      map.set(i, keep.length);
      keep.push(i);
    }
  });
  return {
    signals: keep.map((i) => trace.signals[i]),
    samples: trace.samples.filter((x) => map.has(x[1])).map((x) => [x[0], map.get(x[1])!, x[2]]),
    endMs: trace.endMs,
  };
}

/** Events that add or remove fault cards, which a drill's student never sees in a log. */
export function sanitiseEvents(events: LoggedEvent[]): LoggedEvent[] {
  return events.filter((e) => e.event.type !== 'inject-fault' && e.event.type !== 'clear-fault');
}
