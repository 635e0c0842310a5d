/**
 * An and-inverter graph (AIG): the prover's one representation of boolean logic. Every
 * function of one PLC scan — contacts, coils, latches, edges, counters, timers, rule
 * monitors — is built from two-input ANDs and negations, with structural hashing and
 * constant folding so equal sub-terms are shared. The solver module turns the graph into
 * clauses once per unrolled scan.
 *
 * A literal is `2 · node + sign`; node 0 is the constant FALSE, so literal 0 is FALSE and 1
 * is TRUE. Variable nodes stand for state bits, input bits and free (abstracted) bits.
 */

/** A literal: `2 · node + 1` when negated. */
export type Lit = number;

/** The constant FALSE. */
export const FALSE: Lit = 0;
/** The constant TRUE. */
export const TRUE: Lit = 1;

/** Negation of a literal. */
export const neg = (a: Lit): Lit => a ^ 1;
/** The node a literal refers to. */
export const nodeOf = (a: Lit): number => a >> 1;
/** Whether a literal is negated. */
export const isNegated = (a: Lit): boolean => (a & 1) === 1;

// Keys pack two literals into one safe integer: graphs stay far below 2^26 nodes.
const KEY_SCALE = 2 ** 27;

/** A structurally hashed and-inverter graph. */
export class Aig {
  /** Per node: left input literal, or −1 for a variable (and for the constant). */
  readonly left: number[] = [-1];
  /** Per node: right input literal, or the variable's ordinal for a variable node. */
  readonly right: number[] = [-1];
  private readonly table = new Map<number, number>();
  private vars = 0;

  /** Number of nodes (the constant included). */
  get size(): number {
    return this.left.length;
  }

  /** Number of variables created so far. */
  get varCount(): number {
    return this.vars;
  }

  /** A new variable; returns its positive literal. */
  newVar(): Lit {
    this.left.push(-1);
    this.right.push(this.vars++);
    return (this.left.length - 1) * 2;
  }

  /** True when `node` is a variable node. */
  isVar(node: number): boolean {
    return node > 0 && this.left[node] === -1;
  }

  /** The ordinal of a variable node (its creation index). */
  varOrdinal(node: number): number {
    return this.right[node];
  }

  /** Conjunction, folded and hashed. */
  and(a: Lit, b: Lit): Lit {
    if (a > b) [a, b] = [b, a];
    if (a === FALSE) return FALSE;
    if (a === TRUE) return b;
    if (a === b) return a;
    if (a === neg(b)) return FALSE;
    const key = a * KEY_SCALE + b;
    const hit = this.table.get(key);
    if (hit !== undefined) return hit * 2;
    this.left.push(a);
    this.right.push(b);
    const node = this.left.length - 1;
    this.table.set(key, node);
    return node * 2;
  }

  /** Disjunction. */
  or(a: Lit, b: Lit): Lit {
    return neg(this.and(neg(a), neg(b)));
  }

  /** Exclusive or. */
  xor(a: Lit, b: Lit): Lit {
    if (a === FALSE) return b;
    if (a === TRUE) return neg(b);
    if (b === FALSE) return a;
    if (b === TRUE) return neg(a);
    return this.or(this.and(a, neg(b)), this.and(neg(a), b));
  }

  /** Equivalence. */
  eq(a: Lit, b: Lit): Lit {
    return neg(this.xor(a, b));
  }

  /** `c ? t : e`. */
  ite(c: Lit, t: Lit, e: Lit): Lit {
    if (c === TRUE) return t;
    if (c === FALSE) return e;
    if (t === e) return t;
    return this.or(this.and(c, t), this.and(neg(c), e));
  }

  /** `a → b`. */
  implies(a: Lit, b: Lit): Lit {
    return this.or(neg(a), b);
  }

  /** Conjunction of a list (TRUE when empty). */
  andAll(xs: readonly Lit[]): Lit {
    return xs.reduce((acc, x) => this.and(acc, x), TRUE);
  }

  /** Disjunction of a list (FALSE when empty). */
  orAll(xs: readonly Lit[]): Lit {
    return xs.reduce((acc, x) => this.or(acc, x), FALSE);
  }

  /** Odd parity of a list (FALSE when empty). */
  xorAll(xs: readonly Lit[]): Lit {
    return xs.reduce((acc, x) => this.xor(acc, x), FALSE);
  }

  /**
   * The variable nodes `roots` depend on, in first-visit order. Iterative, so deep
   * graphs (long chains of blocks) cannot overflow the stack.
   */
  support(roots: readonly Lit[]): number[] {
    const seen = new Set<number>();
    const out: number[] = [];
    const stack = roots.map(nodeOf);
    while (stack.length > 0) {
      const n = stack.pop() as number;
      if (n === 0 || seen.has(n)) continue;
      seen.add(n);
      if (this.left[n] === -1) out.push(n);
      else stack.push(this.left[n] >> 1, this.right[n] >> 1);
    }
    return out;
  }

  /** Evaluates literals under an assignment of variable nodes (unassigned variables read FALSE). */
  evaluate(roots: readonly Lit[], value: (varNode: number) => boolean): boolean[] {
    const memo = new Map<number, boolean>();
    const nodeValue = (root: number): boolean => {
      const stack = [root];
      while (stack.length > 0) {
        const n = stack[stack.length - 1];
        if (memo.has(n)) {
          stack.pop();
          continue;
        }
        if (n === 0) {
          memo.set(0, false);
          stack.pop();
          continue;
        }
        if (this.left[n] === -1) {
          memo.set(n, value(n));
          stack.pop();
          continue;
        }
        const l = this.left[n] >> 1;
        const r = this.right[n] >> 1;
        if (!memo.has(l)) stack.push(l);
        else if (!memo.has(r)) stack.push(r);
        else {
          const lv = (memo.get(l) as boolean) !== isNegated(this.left[n]);
          const rv = (memo.get(r) as boolean) !== isNegated(this.right[n]);
          memo.set(n, lv && rv);
          stack.pop();
        }
      }
      return memo.get(root) as boolean;
    };
    return roots.map((lit) => nodeValue(nodeOf(lit)) !== isNegated(lit));
  }
}

// ---- unsigned bit vectors (least significant bit first), for counters and timers

/** Bits needed to count 0..max. */
export function widthFor(max: number): number {
  let w = 0;
  while (2 ** w <= max) w++;
  return w;
}

/** A constant as `width` literal bits. */
export function constBits(value: number, width: number): Lit[] {
  return Array.from({ length: width }, (_, i) => (Math.floor(value / 2 ** i) % 2 === 1 ? TRUE : FALSE));
}

/** `x == value` for an unsigned vector (FALSE when the value does not fit). */
export function eqConst(g: Aig, x: readonly Lit[], value: number): Lit {
  if (value < 0 || value >= 2 ** x.length) return FALSE;
  const k = constBits(value, x.length);
  return g.andAll(x.map((b, i) => (k[i] === TRUE ? b : neg(b))));
}

/** `x <= value` for an unsigned vector. */
export function leConst(g: Aig, x: readonly Lit[], value: number): Lit {
  if (value < 0) return FALSE;
  if (value >= 2 ** x.length - 1) return TRUE;
  const k = constBits(value, x.length);
  // From the most significant bit down: x <= k when x equals k so far and then has a 0 where k has 1.
  let le: Lit = TRUE; // the lower bits alone compare <=
  for (let i = 0; i < x.length; i++) {
    le = k[i] === TRUE ? g.or(neg(x[i]), le) : g.and(neg(x[i]), le);
  }
  return le;
}

/** `x + 1`, wrapping. */
export function increment(g: Aig, x: readonly Lit[]): Lit[] {
  let carry: Lit = TRUE;
  return x.map((b) => {
    const s = g.xor(b, carry);
    carry = g.and(b, carry);
    return s;
  });
}

/** `x − 1`, wrapping. */
export function decrement(g: Aig, x: readonly Lit[]): Lit[] {
  let borrow: Lit = TRUE;
  return x.map((b) => {
    const s = g.xor(b, borrow);
    borrow = g.and(neg(b), borrow);
    return s;
  });
}

/** Bitwise `c ? a : b`. */
export function muxBits(g: Aig, c: Lit, a: readonly Lit[], b: readonly Lit[]): Lit[] {
  return a.map((x, i) => g.ite(c, x, b[i]));
}
