/**
 * The terminal strip: what each row's source puts on its wire, what faults on the wire do,
 * and what the destination reads — a PLC input bit or word, a controller channel, a load
 * (lamp, display, actuator). Also the fieldbus exchange of link rows.
 *
 * Two ways to read a row, giving the same answer: the generic walk (source → wire → input,
 * with every fault) and, for healthy digital rows, a closure specialised once to exactly the
 * objects it reads (the hot path). Readings the consumers took while nothing time-dependent
 * was in play are held until something invalidates them (see {@link Wiring.invalidate}).
 */
import { readAddress, type ProcessImage } from '@/simulator/address';
import { decodeWord, inputReading, inputVolts, ne43Status, sensorDrivesInput, SIGNAL_SPANS, type InputReading } from '@/simulator/electrical';
import { chatterOpen } from '@/simulator/faults/fault-card';
import type { CellDocument } from '@/simulator/schema/cell-document';
import type { RowPlan, RowSink, RowSource } from '@/simulator/schema/wiring-plan';
import type { Clock } from './clock';
import { command, deviceSource, isActuator, travelAt, type DevState } from './devices';
import { fastRowReaders, type RowReader } from './fast-rows';
import type { FaultState } from './fault-state';
import { digitalOn, DRIVE_ON, inputTypeOf, OFF, supplyReadsOn, ZERO_WORD, type Src } from './sources';

/** What a destination sees: the level on the wire, its unit, the input's reading and value. */
export type Reading = { level: number; unit: 'V' | 'mA' | 'word'; reading: InputReading; value: number; loop?: string };

const NO_WIRE_FAULT = { open: false, short24: false, short0: false };

/** What the wiring reads from the rest of the cell. */
export type WiringHost = {
  readonly clock: Clock;
  readonly seed: number;
  readonly link: CellDocument['link'];
  readonly image: ProcessImage;
  readonly faults: FaultState;
  /** Device state by device object (identity lookups on the hot path). */
  readonly devOf: ReadonlyMap<object, DevState>;
  /** Channel array of each controller module, by module object. */
  readonly channelsOf: ReadonlyMap<object, Float64Array>;
  /** True while any fault card exists (armed cards may fire, active ones may chatter or drift). */
  hasFaultCards(): boolean;
};

export class Wiring {
  plans: RowPlan[] = [];
  rowIndex = new Map<string, number>();
  /** Rows by destination: PLC inputs, controller inputs, loads (plan indexes). */
  plcInRows: number[] = [];
  ctlInRows: number[] = [];
  loadRows: number[] = [];
  /** Byte and bit mask in the I area of each PLC input row (`plcInRows` order; unused for word and analog rows). */
  plcInByte: number[] = [];
  plcInMask: number[] = [];
  /** Driven device of each load row (`loadRows` order). */
  loadDevs: DevState[] = [];
  /** Devices an output can command: the only ones that can be travelling. */
  actuators: DevState[] = [];
  /** The channel array each controller input row feeds (`ctlInRows` order). */
  ctlRowArrs: Float64Array[] = [];
  /** Each input's last state, held inside the IEC 61131-2 transition band. */
  prevReading: InputReading[] = [];
  /** What the fieldbus last exchanged on each link row (per bit). */
  busSrc: Src[][] = [];
  lastBusMs: number | null = null;
  readonly busMs: number | null;
  /** Per row: a reader specialised to the objects it reads while the row is fault-free, else null. */
  fastRows: (RowReader | null)[] = [];
  /**
   * Whether what the wiring last delivered still holds, per consumer: the PLC's input bytes,
   * the controller's input values and the loads. Set after a reading taken while nothing
   * time-dependent was in play ({@link settled}); cleared by anything that can change a
   * row's source — an event, a fault, the controller writing its outputs, a PLC output byte
   * that feeds a row, a device command.
   */
  plcInValid = false;
  ctlInValid = false;
  loadsValid = false;
  /**
   * The Q bytes that rows read, as of the latest reading: while any reading is held, Q still
   * equals this copy (forces come as events, which invalidate), so a scan that leaves Q
   * different from it has changed what a row delivers.
   */
  qFed: Uint8Array = new Uint8Array(0);

  constructor(readonly host: WiringHost) {
    this.busMs = host.link.kind === 'fieldbus' ? host.link.updatePeriodMs : null;
  }

  /**
   * Resolves the wiring plan into the hot-path tables (row kinds, input bytes, loads, the Q
   * bytes rows read). Called at creation and again when a download replaces the wiring; an
   * input keeps its last reading (transition band) and a link row what the fieldbus last
   * exchanged on it when its row id survives.
   */
  plan(plans: RowPlan[]): void {
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
    this.host.faults.rowFaults = plans.map(() => null);
    plans.forEach((p, i) => {
      this.rowIndex.set(p.row.id, i);
      if (p.sink.kind === 'device') this.loadRows.push(i);
      else if (p.sink.kind === 'controller') this.ctlInRows.push(i);
      else this.plcInRows.push(i);
    });
    this.prevReading = plans.map((p) => prev.get(p.row.id) ?? 'off');
    this.busSrc = plans.map((p) => {
      const h = held.get(p.row.id);
      return h && h.length === p.bits ? h : Array.from({ length: p.bits }, () => OFF);
    });
    for (const i of this.plcInRows) {
      const sink = plans[i].sink;
      this.plcInByte.push(sink.kind === 'plc-bit' ? sink.address.byte : 0);
      this.plcInMask.push(1 << (sink.kind === 'plc-bit' ? (sink.address.bit ?? 0) : 0));
    }
    for (const i of this.loadRows) {
      const sink = plans[i].sink;
      if (sink.kind !== 'device') continue;
      const d = this.host.devOf.get(sink.device)!;
      this.loadDevs.push(d);
      if (isActuator(d.dev) && !this.actuators.includes(d)) this.actuators.push(d);
    }
    for (const i of this.ctlInRows) {
      const sink = plans[i].sink;
      this.ctlRowArrs.push(sink.kind === 'controller' ? this.host.channelsOf.get(sink.module)! : new Float64Array(0));
    }
    let qFedEnd = 0;
    for (const p of plans) {
      const s = p.source;
      if (s.kind === 'plc-bit') qFedEnd = Math.max(qFedEnd, s.address.byte + 1);
      // A word source may span up to four bytes (a double word).
      if (s.kind === 'plc-word') qFedEnd = Math.max(qFedEnd, s.address.byte + 4);
    }
    this.qFed = new Uint8Array(Math.min(qFedEnd, this.host.image.Q.length));
  }

  /** Records the Q bytes a reading is being taken from (see `qFed`). */
  noteFedQ(): void {
    if (this.qFed.length > 0) this.qFed.set(this.host.image.Q.subarray(0, this.qFed.length));
  }

  /** Forgets every held reading (see `plcInValid`). */
  invalidate(): void {
    this.plcInValid = false;
    this.ctlInValid = false;
    this.loadsValid = false;
  }

  /** After a scan: a row fed by an output byte the scan (or a force) changed reads anew. */
  checkFedQ(): void {
    const Q = this.host.image.Q;
    const fed = this.qFed;
    for (let b = 0; b < fed.length; b++) {
      if (fed[b] !== Q[b]) {
        fed.set(Q.subarray(0, fed.length));
        this.invalidate();
        return;
      }
    }
  }

  /**
   * True when no row's reading can change with time alone: no fault card (chatter, drift,
   * timed and triggered cards, link watchdogs), no fieldbus exchange, and every commanded
   * device at the end of its travel now. Readings taken then hold until an invalidation.
   */
  settled(): boolean {
    if (this.host.hasFaultCards() || this.busMs !== null) return false;
    const acts = this.actuators;
    const now = this.host.clock.now;
    for (let k = 0; k < acts.length; k++) {
      const d = acts[k];
      if (travelAt(d, now) !== (d.cmd ? 1 : 0)) return false;
    }
    return true;
  }

  // ---------------------------------------------------------------- link

  /** Whether the PLC–controller link carries signals now (a lost fieldbus keeps going until its watchdog runs out). */
  linkHealthy(): boolean {
    const loss = this.host.faults.linkLoss;
    if (this.busMs === null) return !loss;
    if (!loss) return true;
    const w = this.host.link.kind === 'fieldbus' ? this.host.link.watchdogMs : 0;
    return this.lastBusMs !== null && this.host.clock.now - this.lastBusMs < w;
  }

  /** One fieldbus exchange: every link row takes what its source puts out now. */
  exchangeBus(): void {
    if (this.host.faults.linkLoss) return;
    for (let i = 0; i < this.plans.length; i++) {
      const p = this.plans[i];
      if (!p.isLink) continue;
      const arr = this.busSrc[i];
      for (let b = 0; b < arr.length; b++) arr[b] = p.source.kind === 'controller' ? this.sourceNow(p.source, b, p.bits) : this.sourceNow(p.source, 0, p.bits);
    }
    this.lastBusMs = this.host.clock.now;
  }

  // ---------------------------------------------------------------- generic reading

  /** The signal a source puts on a row, bit `bit` for word rows. */
  sourceNow(s: RowSource, bit: number, bits: number): Src {
    const h = this.host;
    switch (s.kind) {
      case 'device':
        return deviceSource(h.devOf.get(s.device)!, s.terminal, h.clock.now);
      case 'plc-bit':
        return ((h.image.Q[s.address.byte] >> (s.address.bit ?? 0)) & 1) === 1 && !h.faults.moduleDead(s.module.id) ? DRIVE_ON : OFF;
      case 'plc-word': {
        if (h.faults.moduleDead(s.module.id)) return ZERO_WORD;
        const w = readAddress(h.image, s.address);
        return { k: 'word', value: bits >= 32 ? w : w % 2 ** bits };
      }
      case 'controller': {
        const m = s.module;
        const v = h.faults.moduleDead(m.id) ? 0 : (h.channelsOf.get(m)?.[s.channel + bit] ?? 0);
        if (m.type === 'analog-out') return { k: 'analog', value: v, unit: m.signal ? SIGNAL_SPANS[m.signal].unit : 'V' };
        return v !== 0 ? DRIVE_ON : OFF;
      }
    }
  }

  /** Source of row `i` (through a swapped-wires fault), bit `bit`. */
  rowSource(i: number, bit: number): Src {
    const f = this.host.faults.rowFaults[i];
    const j = f?.swapWith ?? i;
    const p = this.plans[j];
    if (p.isLink) {
      if (!this.linkHealthy()) return p.source.kind === 'plc-word' ? ZERO_WORD : OFF;
      if (this.busMs !== null) return this.busSrc[j][Math.min(bit, this.busSrc[j].length - 1)];
    }
    if (p.bits > 1 && p.source.kind === 'controller') return this.sourceNow(p.source, bit, p.bits);
    return this.sourceNow(p.source, 0, p.bits);
  }

  /** The wire's own condition now: open (a break, chatter, an unplugged hardwired link), shorted to +24 V or 0 V. */
  wireState(i: number): { open: boolean; short24: boolean; short0: boolean } {
    const faults = this.host.faults;
    const f = faults.rowFaults[i];
    if (f === null && !faults.linkLoss) return NO_WIRE_FAULT;
    let open = f?.open ?? false;
    if (f && f.chatter.length > 0) {
      for (const c of f.chatter) if (chatterOpen(this.host.seed, c.index, c.periodMs, c.probability, this.host.clock.now)) open = true;
    }
    if (faults.linkLoss && this.busMs === null && this.plans[i].isLink) open = true;
    return { open, short24: f?.short24 ?? false, short0: f?.short0 ?? false };
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
    const supply = this.host.faults.supplyV;
    if (sink.kind === 'device') {
      const on = w.short24 || (!w.open && !w.short0 && src.k === 'drive' && src.on);
      return { level: on ? supply : 0, unit: 'V', reading: on ? 'on' : 'off', value: on ? 1 : 0 };
    }
    const sinking = sink.kind === 'plc-bit' ? sink.module.wiring === 'sinking' : true;
    const inputType = inputTypeOf(sink);
    const kind = sinking ? 'sinking' : 'sourcing';
    const wire = w.short24 ? 'short_to_24v' : w.short0 ? 'short_to_0v' : w.open ? 'open' : 'ok';
    // A switched-off sensor whose output stage suits the input leaks its current through it.
    const leaks = wire === 'ok' && src.k === 'sensor' && !src.on && src.leakMa && sensorDrivesInput(src.out, kind);
    const drive = leaks ? { leakMa: src.leakMa as number } : { volts: inputVolts(digitalOn(src, sinking), wire, kind, supply) };
    const { volts, reading } = inputReading(inputType, drive);
    // In the transition band an input keeps its last state, as IEC 61131-2 leaves it (what a
    // real input most often does).
    const value = reading === 'on' ? 1 : reading === 'off' ? 0 : this.prevReading[i] === 'on' ? 1 : 0;
    if (reading !== 'undefined' && commit) this.prevReading[i] = reading;
    return { level: volts, unit: 'V', reading, value };
  }

  /**
   * The value row `i` delivers (0/1 for digital rows), committing the input's state: the fast
   * path for fault-free digital rows, where the input sees either the full supply or nothing
   * (ON or OFF for its type), else the generic walk.
   */
  readValue(i: number): number {
    const fast = this.fastRows[i];
    if (fast !== null) return fast();
    const p = this.plans[i];
    if (p.bits === 1 && this.host.faults.rowFaults[i] === null && !this.host.faults.linkLoss) {
      const sink = p.sink;
      if (sink.kind === 'device' && sink.terminalKind === 'load') {
        const src = this.rowSource(i, 0);
        return src.k === 'drive' && src.on ? 1 : 0;
      }
      if ((sink.kind === 'plc-bit' || (sink.kind === 'controller' && sink.module.type !== 'analog-in')) && supplyReadsOn(this.host.faults.supplyV, inputTypeOf(sink))) {
        const src = this.rowSource(i, 0);
        if (src.k !== 'sensor' || !src.leakMa) {
          const on = digitalOn(src, sink.kind === 'plc-bit' ? sink.module.wiring === 'sinking' : true);
          this.prevReading[i] = on ? 'on' : 'off';
          return on ? 1 : 0;
        }
      }
    }
    return this.readRow(i, true).value;
  }

  /** True when the row's destination module has failed (its inputs read nothing). */
  sinkDead(sink: RowSink): boolean {
    return sink.kind !== 'device' && this.host.faults.moduleDead(sink.module.id);
  }

  // ---------------------------------------------------------------- the fast path

  /**
   * Specialises the reading of every fault-free row (fast-rows.ts). Faults, dead modules and
   * link loss change only when the fault cards are rebuilt, which calls this again; a row
   * they touch keeps the generic path.
   */
  buildFastRows(): void {
    this.fastRows = fastRowReaders(this);
  }

  // ---------------------------------------------------------------- loads

  /** Applies what the load rows deliver to lamps, displays and actuators (a changed command invalidates the held readings). */
  updateLoads(): void {
    // Re-applying the same readings would change nothing (same lamps, same display, same commands).
    if (this.loadsValid) return;
    // Valid once applied, unless a command changes below (which invalidates).
    this.loadsValid = this.settled();
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
      } else if (command(d, value !== 0, this.host.clock.now)) this.invalidate();
    }
  }
}
