/**
 * The transition system a proof works on: one PLC scan as boolean functions from
 * (state bits, this scan's input bits) to (next state bits, signal values after the scan).
 *
 * - State bits: %QX/%MX bits coils write (the image persists into the next scan), latch
 *   outputs, edge memories, counter and timer encodings, previous-scan values, and the
 *   bits of rule monitors. Each has an initial value: the PLC's first scan starts from
 *   all memory off (PREV_BOOL from its `initial` parameter).
 * - Step bits: fresh every scan. `input` bits are %IX points; `free` bits stand for block
 *   outputs the encoding abstracts (see the notes).
 * - Constraints: facts about the encoding's own state bits that hold in every reachable
 *   state (a saturating count never exceeds its preset); assuming them in induction is sound.
 *
 * The builder is append-only: rule monitors add their own state bits after the sheet is
 * encoded, and a proof keeps only the cone of influence of its rule.
 */
import { Aig, type Lit } from './aig';
import type { BlockType } from '@/simulator/plc/catalogue';

/** How the encoding treated one block. */
export type EncodingNote = {
  /** Block id. */
  block: string;
  type: BlockType;
  /** `exact`: the block's BOOL outputs are encoded exactly; `abstracted`: some are free (over-approximated). */
  treatment: 'exact' | 'abstracted';
  /** One sentence: how, and why. */
  detail: string;
};

/** A state bit: its current-scan variable, initial value and next-scan function. */
export type StateBit = {
  lit: Lit;
  init: boolean;
  next: Lit;
  /** What the bit is, for diagnostics (`%QX0.1`, `seal.Q1`, `ctu.count[2]`). */
  role: string;
  /** Index of the block that owns it (absent for image bits and monitors). */
  block?: number;
  /** Canonical address for a process-image bit. */
  address?: string;
};

/** A bit chosen afresh every scan: a %IX input, or an abstracted block output. */
export type StepBit = {
  lit: Lit;
  kind: 'input' | 'free';
  role: string;
  block?: number;
  address?: string;
};

/** What a variable node of the graph stands for. */
export type VarRef = { kind: 'state'; index: number } | { kind: 'step'; index: number };

/** An append-only transition system over one {@link Aig}. */
export class TransitionSystem {
  readonly aig = new Aig();
  readonly state: StateBit[] = [];
  readonly step: StepBit[] = [];
  /** Invariants of the encoding, each with the block (or monitor) that owns it. */
  readonly constraints: { lit: Lit; owner: string }[] = [];
  /** Notes per block index. */
  readonly notes = new Map<number, EncodingNote>();
  private readonly refs = new Map<number, VarRef>();
  private readonly inputs = new Map<string, Lit>();

  /** A new state bit; its next-state function is set later with {@link setNext} (default: keeps its value). */
  addState(init: boolean, role: string, extra: { block?: number; address?: string } = {}): Lit {
    const lit = this.aig.newVar();
    this.refs.set(lit >> 1, { kind: 'state', index: this.state.length });
    this.state.push({ lit, init, next: lit, role, ...extra });
    return lit;
  }

  /** Sets the next-state function of a state bit created by {@link addState}. */
  setNext(lit: Lit, next: Lit): void {
    const ref = this.refs.get(lit >> 1);
    if (!ref || ref.kind !== 'state') throw new Error('setNext on a literal that is not a state bit');
    this.state[ref.index].next = next;
  }

  /** A new free bit, fresh every scan (an abstracted block output). */
  addFree(role: string, block?: number): Lit {
    const lit = this.aig.newVar();
    this.refs.set(lit >> 1, { kind: 'step', index: this.step.length });
    this.step.push({ lit, kind: 'free', role, block });
    return lit;
  }

  /** The input bit of a canonical %IX address (one per address, created on first use). */
  input(address: string): Lit {
    const hit = this.inputs.get(address);
    if (hit !== undefined) return hit;
    const lit = this.aig.newVar();
    this.refs.set(lit >> 1, { kind: 'step', index: this.step.length });
    this.step.push({ lit, kind: 'input', role: address, address });
    this.inputs.set(address, lit);
    return lit;
  }

  /** What a variable node stands for. */
  ref(node: number): VarRef | undefined {
    return this.refs.get(node);
  }
}
