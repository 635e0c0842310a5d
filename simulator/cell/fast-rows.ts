/**
 * The wiring's fast path: the reading of every fault-free row specialised once into a
 * closure over exactly the objects it reads (the device state, the Q byte, the controller
 * channel), so the scan and the refresh skip the generic source → wire → input walk and
 * its lookups. Each reader gives what the generic reading (wiring.ts) gives; a row with a
 * fault on it, a dead module or a lost link keeps the generic path.
 */
import { readAddress, type ProcessImage } from '@/simulator/address';
import type { RowPlan } from '@/simulator/schema/wiring-plan';
import type { InputReading } from '@/simulator/electrical';
import type { Clock } from './clock';
import { fastDeviceSource, type DevState } from './devices';
import type { FaultState } from './fault-state';
import { digitalOn, DRIVE_ON, inputTypeOf, OFF, supplyReadsOn, type Src, type SrcReader } from './sources';

/** What a fault-free row delivers now (0/1, or the word). */
export type RowReader = () => number;

/** The parts of the wiring the fast path reads. */
export type FastRowsSource = {
  readonly plans: readonly RowPlan[];
  readonly prevReading: InputReading[];
  readonly busSrc: readonly Src[][];
  readonly busMs: number | null;
  readonly host: {
    readonly clock: Clock;
    readonly image: ProcessImage;
    readonly faults: FaultState;
    readonly devOf: ReadonlyMap<object, DevState>;
    readonly channelsOf: ReadonlyMap<object, Float64Array>;
  };
};

/**
 * Specialises the reading of every fault-free row into a closure over exactly the objects
 * it reads (the device state, the Q byte, the controller channel), so the scan and the
 * refresh skip the generic source → wire → input walk and its lookups. Faults, dead
 * modules and link loss change only when the fault cards are rebuilt, which calls this
 * again; a row they touch keeps the generic path. Each reader gives what the generic
 * path gives.
 */
export function fastRowReaders(w: FastRowsSource): (RowReader | null)[] {
  const faults = w.host.faults;
  return w.plans.map((p, i) => (faults.linkLoss || faults.rowFaults[i] !== null ? null : fastRow(w, p, i)));
}

function fastRow(w: FastRowsSource, p: RowPlan, i: number): RowReader | null {
  const sink = p.sink;
  if (sink.kind === 'plc-analog' || (sink.kind === 'controller' && sink.module.type === 'analog-in')) return null;
  if (p.bits === 1 && sink.kind === 'device' && sink.terminalKind === 'load') {
    const src = fastSource(w, p, i, 0);
    if (!src) return null;
    return () => {
      const s = src();
      return s.k === 'drive' && s.on ? 1 : 0;
    };
  }
  if (p.bits === 1 && (sink.kind === 'plc-bit' || sink.kind === 'controller')) {
    // Exact only while the full supply reads ON on this input (else the generic reading
    // classifies the voltage); 0 V is OFF for every type.
    if (!supplyReadsOn(w.host.faults.supplyV, inputTypeOf(sink))) return null;
    const src = fastSource(w, p, i, 0);
    if (!src) return null;
    const sinking = sink.kind === 'plc-bit' ? sink.module.wiring === 'sinking' : true;
    const prev = w.prevReading;
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
        const src = fastSource(w, p, i, b);
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
    const src = fastSource(w, p, i, 0);
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
function fastSource(w: FastRowsSource, p: RowPlan, i: number, bit: number): SrcReader | null {
  const h = w.host;
  if (p.isLink && w.busMs !== null) {
    const held = w.busSrc[i];
    const k = Math.min(bit, held.length - 1);
    return () => held[k];
  }
  const s = p.source;
  switch (s.kind) {
    case 'plc-bit': {
      if (h.faults.moduleDead(s.module.id)) return null;
      const img = h.image;
      const byte = s.address.byte;
      const shift = s.address.bit ?? 0;
      return () => (((img.Q[byte] >> shift) & 1) === 1 ? DRIVE_ON : OFF);
    }
    case 'plc-word': {
      if (h.faults.moduleDead(s.module.id)) return null;
      const img = h.image;
      const addr = s.address;
      const bits = p.bits;
      return () => {
        const w = readAddress(img, addr);
        return { k: 'word', value: bits >= 32 ? w : w % 2 ** bits };
      };
    }
    case 'controller': {
      const m = s.module;
      if (h.faults.moduleDead(m.id) || m.type === 'analog-out') return null;
      const arr = h.channelsOf.get(m);
      const ch = s.channel + (p.bits > 1 ? bit : 0);
      if (!arr) return () => OFF;
      return () => ((arr[ch] ?? 0) !== 0 ? DRIVE_ON : OFF);
    }
    case 'device':
      return fastDeviceSource(h.devOf.get(s.device)!, s.terminal, h.clock);
  }
}
