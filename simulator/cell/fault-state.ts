/**
 * The effect of the active fault cards, as the layers read it: per wiring row, per device,
 * per module and for the link. The fault cards (faults.ts) rebuild it whenever a card
 * fires, clears or loses its row; everything else only reads it.
 */

/** What active cards do to one wiring row. */
export type RowFaults = {
  open: boolean;
  short24: boolean;
  short0: boolean;
  /** Chatter cards on the row, each with the index of its card (its seeded stream). */
  chatter: { index: number; periodMs: number; probability: number }[];
  /** The row whose wire landed on this row's terminal (swapped wires), or null. */
  swapWith: number | null;
  /** Ids of the cards acting on the row (for the snapshot). */
  ids: string[];
};

/** What active cards do to one device. */
export type DevFaults = {
  stuckOn: boolean;
  stuckOff: boolean;
  mismatch: boolean;
  /** Travel-time factor (1 = normal). */
  slow: number;
  drift: { rate: number; since: number } | null;
  loss: boolean;
  /** A sensor's off-state leakage through its input, mA (0: none). */
  leakMa: number;
};

/** Every fault in effect now. */
export class FaultState {
  /** The supply voltage in effect now: the document's, or lower while a supply-sag card is active. */
  supplyV: number;

  constructor(readonly documentV: number) {
    this.supplyV = documentV;
  }

  /** Per wiring row (plan order): its faults, or null for a healthy row. */
  rowFaults: (RowFaults | null)[] = [];
  devFaults = new Map<string, DevFaults>();
  deadModules = new Set<string>();
  linkLoss = false;

  /** True when the PLC or controller module with this id has failed. */
  moduleDead(id: string): boolean {
    return this.deadModules.size > 0 && this.deadModules.has(id);
  }

  /** Clears everything (before the cards are applied again), for `rows` wiring rows. */
  reset(rows: number): void {
    this.rowFaults = new Array<RowFaults | null>(rows).fill(null);
    this.devFaults = new Map();
    this.deadModules = new Set();
    this.linkLoss = false;
    this.supplyV = this.documentV;
  }

  /** The faults of row `i`, created healthy on first use. */
  row(i: number): RowFaults {
    return (this.rowFaults[i] ??= { open: false, short24: false, short0: false, chatter: [], swapWith: null, ids: [] });
  }

  /** The faults of a device, created healthy on first use. */
  device(id: string): DevFaults {
    let f = this.devFaults.get(id);
    if (!f) this.devFaults.set(id, (f = { stuckOn: false, stuckOff: false, mismatch: false, slow: 1, drift: null, loss: false, leakMa: 0 }));
    return f;
  }
}
