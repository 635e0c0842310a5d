/**
 * Fault cards in a running cell: one table entry per kind says what a card must name (and
 * of what type), which wiring rows it needs, and what it does once active. The board keeps
 * the cards (armed or active), fires them at their time or trigger, and rebuilds the
 * {@link FaultState} the layers read whenever a card fires, clears or loses its row.
 */
import { rejected, type Problem, type Result } from '@/simulator/shared/result';
import { faultCardSchema, type FaultCard, type FaultKind } from '@/simulator/faults/fault-card';
import type { CellDocument } from '@/simulator/schema/cell-document';
import { zodProblems } from '@/simulator/schema/validate';
import { compilePredicate, type SignalValue } from '@/simulator/trace/predicate';
import type { Clock } from './clock';
import { rebase, typesTaking, type DevState } from './devices';
import type { FaultState } from './fault-state';
import type { Wiring } from './wiring';

/** A card in the cell: armed (waiting for its time or trigger) or active since a time. */
export type CardState = { card: FaultCard; status: 'armed' | 'active'; since: number | null; when: ((read: (n: string) => SignalValue) => boolean) | null };

type Card<K extends FaultKind> = Extract<FaultCard, { kind: K }>;

/** What checking a card's targets needs from the cell. */
type Targets = {
  device(id: string, kind: FaultKind, path: (string | number)[]): void;
  row(id: string, path: (string | number)[]): void;
  module(id: string): void;
  /** The plans of two existing rows, to check a swap. */
  alike(a: string, b: string): boolean | null;
  problems: Problem[];
};

/** One kind's entry. */
type KindEntry<K extends FaultKind> = {
  /** Reports targets the cell does not have (or of the wrong type). */
  check(card: Card<K>, t: Targets): void;
  /** The wiring rows the card acts on; while one is missing (or a swap's rows differ) it waits, inactive. */
  rows?(card: Card<K>): string[];
  /** Puts an active card into effect; `index` is its place among the cards (its seeded stream), `since` when it fired. */
  apply(card: Card<K>, state: FaultState, at: { index: number; since: number; row: (id: string) => number }): void;
};

type RowKind = 'open-wire' | 'short-24v' | 'short-0v';
type DeviceKind = 'stuck-on' | 'stuck-off' | 'slow-actuator' | 'analog-drift' | 'analog-loss' | 'sensor-type-mismatch' | 'sensor-leakage';

const onRow = <K extends RowKind>(set: (f: ReturnType<FaultState['row']>) => void): KindEntry<K> => ({
  check: (card, t) => t.row((card as Card<RowKind>).row, ['row']),
  rows: (card) => [(card as Card<RowKind>).row],
  apply: (card, state, at) => {
    const c = card as Card<RowKind>;
    const f = state.row(at.row(c.row));
    set(f);
    f.ids.push(c.id);
  },
});
const onDevice = <K extends DeviceKind>(apply: KindEntry<K>['apply']): KindEntry<K> => ({
  check: (card, t) => {
    const c = card as Card<DeviceKind>;
    t.device(c.device, c.kind, ['device']);
  },
  apply,
});

/** The table: every fault kind. */
const KINDS: { [K in FaultKind]: KindEntry<K> } = {
  'stuck-on': onDevice((card, state) => void (state.device(card.device).stuckOn = true)),
  'stuck-off': onDevice((card, state) => void (state.device(card.device).stuckOff = true)),
  'open-wire': onRow((f) => void (f.open = true)),
  'short-24v': onRow((f) => void (f.short24 = true)),
  'short-0v': onRow((f) => void (f.short0 = true)),
  chatter: {
    check: (card, t) => t.row(card.row, ['row']),
    rows: (card) => [card.row],
    apply: (card, state, at) => {
      const f = state.row(at.row(card.row));
      f.chatter.push({ index: at.index, periodMs: card.periodMs, probability: card.probability });
      f.ids.push(card.id);
    },
  },
  'swapped-wires': {
    check: (card, t) => {
      const before = t.problems.length;
      t.row(card.rows[0], ['rows', 0]);
      t.row(card.rows[1], ['rows', 1]);
      if (card.rows[0] === card.rows[1]) t.problems.push({ path: ['rows'], code: 'same_row', message: 'swapped wires need two different rows' });
      else if (t.problems.length === before && t.alike(card.rows[0], card.rows[1]) === false) {
        t.problems.push({ path: ['rows'], code: 'incompatible_rows', message: 'only rows of the same kind can be swapped' });
      }
    },
    rows: (card) => [...card.rows],
    apply: (card, state, at) => {
      const [a, b] = [at.row(card.rows[0]), at.row(card.rows[1])];
      state.row(a).swapWith = b;
      state.row(b).swapWith = a;
      state.row(a).ids.push(card.id);
      state.row(b).ids.push(card.id);
    },
  },
  'dead-module': { check: (card, t) => t.module(card.module), apply: (card, state) => void state.deadModules.add(card.module) },
  'link-loss': { check: () => undefined, apply: (_card, state) => void (state.linkLoss = true) },
  'slow-actuator': onDevice((card, state) => {
    const f = state.device(card.device);
    f.slow = Math.max(f.slow, card.factor);
  }),
  'analog-drift': onDevice((card, state, at) => void (state.device(card.device).drift = { rate: card.ratePerS, since: at.since })),
  'analog-loss': onDevice((card, state) => void (state.device(card.device).loss = true)),
  'sensor-type-mismatch': onDevice((card, state) => void (state.device(card.device).mismatch = true)),
  'supply-sag': { check: () => undefined, apply: (card, state) => void (state.supplyV = Math.min(state.supplyV, card.volts)) },
  'sensor-leakage': onDevice((card, state) => {
    const f = state.device(card.device);
    f.leakMa = Math.max(f.leakMa, card.leakMa);
  }),
};

function entry(card: FaultCard): KindEntry<FaultKind> {
  return KINDS[card.kind] as KindEntry<FaultKind>;
}

/** What the board needs from the cell. */
export type FaultHost = {
  readonly clock: Clock;
  readonly doc: () => CellDocument;
  readonly devices: ReadonlyMap<string, DevState>;
  readonly wiring: Wiring;
  readonly state: FaultState;
  /** True when a signal of this name exists (for `when` triggers). */
  knows(name: string): boolean;
  /** Reads a signal now (for `when` triggers). */
  read(name: string): SignalValue;
};

export class FaultBoard {
  cards: CardState[] = [];

  constructor(private readonly host: FaultHost) {}

  /** Adds a card; it fires at once, at its time or on its trigger. A rejected card changes nothing. */
  add(input: unknown): Result<true, Problem> {
    const parsed = faultCardSchema.safeParse(input);
    if (!parsed.success) return { ok: false, errors: zodProblems(parsed.error.issues) };
    const card = parsed.data;
    const { devices, wiring } = this.host;
    const problems: Problem[] = [];
    if (this.cards.some((c) => c.card.id === card.id)) problems.push({ path: ['id'], code: 'duplicate_id', message: `fault card "${card.id}" already exists` });
    const doc = this.host.doc();
    entry(card).check(card, {
      problems,
      device: (id, kind, path) => {
        const d = devices.get(id);
        const types = typesTaking({ fault: kind });
        if (!d) problems.push({ path, code: 'unknown_device', message: `no device "${id}"` });
        else if (!types.includes(d.dev.type)) problems.push({ path, code: 'wrong_device_type', message: `a ${kind} fault needs a ${types.join(' or ')}, "${id}" is a ${d.dev.type}` });
      },
      row: (id, path) => {
        if (!wiring.rowIndex.has(id)) problems.push({ path, code: 'unknown_row', message: `no wiring row "${id}"` });
      },
      module: (id) => {
        if (!doc.plc.modules.some((m) => m.id === id) && !doc.controller.modules.some((m) => m.id === id)) {
          problems.push({ path: ['module'], code: 'unknown_module', message: `no PLC or controller module "${id}"` });
        }
      },
      alike: (a, b) => this.alike(a, b),
    });
    let when: CardState['when'] = null;
    if (card.when) {
      const c = compilePredicate(card.when, (n) => this.host.knows(n));
      if (!c.ok) problems.push(...c.errors.map((p) => ({ ...p, path: ['when', ...p.path] })));
      else when = c.value;
    }
    if (problems.length > 0) return { ok: false, errors: problems };
    const st: CardState = { card, status: 'armed', since: null, when };
    this.cards.push(st);
    if (card.at === undefined && !card.when) this.activate(st);
    else if (card.at !== undefined && card.at <= this.host.clock.now) this.activate(st);
    return { ok: true, value: true };
  }

  /** Removes a card, active or armed. */
  clear(id: string): Result<true, Problem> {
    const i = this.cards.findIndex((c) => c.card.id === id);
    if (i < 0) return rejected('unknown_fault', `no fault card "${id}"`, ['id']);
    this.rebaseDevices();
    this.cards.splice(i, 1);
    this.rebuild();
    return { ok: true, value: true };
  }

  /** Whether two existing rows may be swapped (same width, destination kind and link role); null when one is missing. */
  private alike(a: string, b: string): boolean | null {
    const { rowIndex, plans } = this.host.wiring;
    const i = rowIndex.get(a);
    const j = rowIndex.get(b);
    if (i === undefined || j === undefined) return null;
    const p = plans[i];
    const q = plans[j];
    return p.bits === q.bits && p.sink.kind === q.sink.kind && p.isLink === q.isLink;
  }

  /**
   * Whether a card's rows exist in the current wiring (and a swap's rows are still alike). A
   * download can remove a row; its card then stays armed and inactive until a later download
   * brings the row back (see docs/engine.md).
   */
  attached(card: FaultCard): boolean {
    const rows = entry(card).rows?.(card);
    if (!rows) return true;
    if (card.kind === 'swapped-wires') return this.alike(rows[0], rows[1]) === true;
    return rows.every((r) => this.host.wiring.rowIndex.has(r));
  }

  private rebaseDevices(): void {
    // Actuators keep where they are at the moment a fault changes their travel time.
    for (const d of this.host.devices.values()) rebase(d, this.host.clock.now);
  }

  /** Fires a card now (if its rows are there). */
  activate(c: CardState): void {
    if (!this.attached(c.card)) return;
    this.rebaseDevices();
    c.status = 'active';
    c.since = this.host.clock.now;
    this.rebuild();
  }

  /** After a download: active cards whose rows are gone wait, armed and inactive. */
  detachMissing(): void {
    for (const c of this.cards) {
      if (c.status === 'active' && !this.attached(c.card)) {
        c.status = 'armed';
        c.since = null;
      }
    }
  }

  /** After a download: cards whose rows came back fire again by their own rules. */
  refire(): void {
    const now = this.host.clock.now;
    for (const c of this.cards) if (c.status === 'armed' && !c.when && (c.card.at === undefined || c.card.at <= now)) this.activate(c);
  }

  /** Rebuilds the fault state from the active cards, and the wiring's fast path with it. */
  rebuild(): void {
    const { state, wiring, clock } = this.host;
    const wasLoss = state.linkLoss;
    state.reset(wiring.plans.length);
    const row = (id: string) => wiring.rowIndex.get(id)!;
    this.cards.forEach((st, index) => {
      if (st.status !== 'active') return;
      entry(st.card).apply(st.card, state, { index, since: st.since ?? clock.now, row });
    });
    for (const d of this.host.devices.values()) d.faults = state.devFaults.get(d.dev.id) ?? null;
    // A restored fieldbus link resynchronises at its next exchange, not from stale data.
    if (wasLoss && !state.linkLoss && wiring.busMs !== null) wiring.lastBusMs = null;
    wiring.buildFastRows();
    wiring.invalidate();
  }

  /** Cards due by time (a card with both `at` and `when` is armed from `at` and fires in {@link checkTriggered}). */
  checkTimed(): void {
    const now = this.host.clock.now;
    for (const c of this.cards) if (c.status === 'armed' && c.card.at !== undefined && c.card.at <= now && !c.when) this.activate(c);
  }

  /** Cards whose trigger holds now. */
  checkTriggered(): void {
    const now = this.host.clock.now;
    for (const c of this.cards) {
      if (c.status !== 'armed' || !c.when) continue;
      if (c.card.at !== undefined && c.card.at > now) continue;
      if (c.when((n) => this.host.read(n))) this.activate(c);
    }
  }

  /** The next time a timed card is due after `now`, or null. */
  nextDue(now: number): number | null {
    let next: number | null = null;
    for (const c of this.cards) if (c.status === 'armed' && c.card.at !== undefined && c.card.at > now) next = next === null ? c.card.at : Math.min(next, c.card.at);
    return next;
  }
}
