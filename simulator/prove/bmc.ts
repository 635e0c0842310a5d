/**
 * Safety checking on the SAT solver: bounded model checking from the initial state for
 * the shortest counterexample, and k-induction over simple paths to prove the property
 * for every reachable state (Sheeran, Singh & Stålmarck, "Checking safety properties
 * using induction and a SAT-solver", FMCAD 2000).
 *
 * One unrolling serves both questions. Step k's state is a function of step k−1's, its
 * first state is free, and an `init` literal pins it to the initial state when assumed.
 * Required for every query of the check: the encoding's invariants at every step, all
 * states pairwise distinct (a shortest counterexample never repeats a state, so this
 * loses none), and "no violation" at every depth already checked. At depth k:
 *   1. init ∧ bad_k satisfiable → the shortest counterexample has k + 1 scans;
 *   2. bad_k unsatisfiable → proved by k-induction;
 *   3. init unsatisfiable → no simple path of k + 1 states exists from the start, so every
 *      reachable state was checked: proved exhaustively.
 * Only the rule's cone of influence is unrolled. The budget counts clauses given to the
 * solver, so it is deterministic (the caller limits wall time around the whole proof).
 */
import Logic from 'logic-solver';
import { FALSE, TRUE, nodeOf, type Lit } from './aig';
import type { TransitionSystem } from './system';

/** Limits of one check. */
export type CheckLimits = { maxDepth: number; budget: number };

/** What one check found. */
export type CheckOutcome =
  | { kind: 'proved'; method: 'k-induction' | 'exhaustive'; depth: number }
  | { kind: 'violated'; depth: number; steps: Map<number, boolean>[] }
  | { kind: 'undecided'; reason: 'max-depth' | 'budget'; bound: number };

/** Sizes and effort of one check. */
export type CheckStats = { stateBits: number; inputBits: number; freeBits: number; clauses: number; satCalls: number };

/** The part of the system that can influence `bad`: state and step bits, and the invariants over them. */
export type Cone = { state: number[]; step: number[]; constraints: Lit[] };

/** The cone of influence of `bad`: a fixpoint over next-state functions. */
export function coneOfInfluence(ts: TransitionSystem, bad: Lit): Cone {
  const g = ts.aig;
  const state = new Set<number>();
  const step = new Set<number>();
  const visit = (roots: Lit[]) => {
    const fresh: number[] = [];
    for (const node of g.support(roots)) {
      const ref = ts.ref(node);
      if (!ref) continue;
      if (ref.kind === 'step') step.add(ref.index);
      else if (!state.has(ref.index)) {
        state.add(ref.index);
        fresh.push(ref.index);
      }
    }
    return fresh;
  };
  let work = visit([bad]);
  while (work.length > 0) work = visit(work.map((j) => ts.state[j].next));
  // An invariant is kept when it speaks only of bits already in the cone (it only narrows).
  const constraints = ts.constraints
    .filter((c) =>
      g.support([c.lit]).every((node) => {
        const ref = ts.ref(node);
        return ref !== undefined && ref.kind === 'state' && state.has(ref.index);
      }),
    )
    .map((c) => c.lit);
  return { state: [...state].sort((a, b) => a - b), step: [...step].sort((a, b) => a - b), constraints };
}

/**
 * One SAT solver shared by the checks of one proof run: creating a solver instantiates a
 * whole MiniSat module (milliseconds each), so the rules of a run share one. Each check
 * unrolls its own copy of its cone and guards every constraint that is not a definition
 * with its own activation literal, so no check's constraints can touch another's answers.
 */
export type SatSession = { solver: Logic.Solver; falseVar: number; vars: number };

/** A solver for one proof run (see {@link SatSession}). */
export function createSatSession(): SatSession {
  const solver = new Logic.Solver();
  const falseVar = solver.getVarNum('v0');
  solver.require(Logic.not(falseVar));
  return { solver, falseVar, vars: 0 };
}

/** Checks that `bad` is false after every scan of every run from the initial state. */
export function checkSafety(
  ts: TransitionSystem,
  bad: Lit,
  limits: CheckLimits,
  session: () => SatSession = createSatSession,
): { outcome: CheckOutcome; stats: CheckStats; cone: Cone } {
  const cone = coneOfInfluence(ts, bad);
  const stats: CheckStats = { stateBits: cone.state.length, inputBits: 0, freeBits: 0, clauses: 0, satCalls: 0 };
  for (const j of cone.step) stats[ts.step[j].kind === 'input' ? 'inputBits' : 'freeBits']++;
  // A constant needs no solver: never broken, or broken by the very first scan whatever the inputs.
  if (bad === FALSE) return { outcome: { kind: 'proved', method: 'k-induction', depth: 0 }, stats, cone };
  if (bad === TRUE) return { outcome: { kind: 'violated', depth: 0, steps: [new Map()] }, stats, cone };
  return Logic.disablingAssertions(() => run(ts, bad, cone, limits, session(), stats));
}

function run(ts: TransitionSystem, bad: Lit, cone: Cone, limits: CheckLimits, session: SatSession, sizes: CheckStats): { outcome: CheckOutcome; stats: CheckStats; cone: Cone } {
  const g = ts.aig;
  const { solver, falseVar } = session;
  let clauses = 0;
  let satCalls = 0;
  const fresh = () => solver.getVarNum(`v${++session.vars}`);
  const clause = (...terms: number[]) => {
    clauses++;
    solver.require(Logic.or(...terms));
  };
  // This check's constraints hold only while `active` is assumed.
  const active = fresh();
  const guarded = (...terms: number[]) => clause(-active, ...terms);
  const solveWith = (...terms: number[]) => {
    satCalls++;
    const q = fresh();
    for (const t of [active, ...terms]) clause(-q, t);
    return solver.solveAssuming(q);
  };
  const term = (map: Int32Array, lit: Lit) => ((lit & 1) === 1 ? -map[nodeOf(lit)] : map[nodeOf(lit)]);
  // The AND nodes of one step's logic, in creation order (children before parents).
  const roots = [bad, ...cone.constraints, ...cone.state.map((j) => ts.state[j].next)];
  const andNodes: number[] = [];
  {
    const seen = new Uint8Array(g.size);
    const stack = roots.map(nodeOf);
    while (stack.length > 0) {
      const n = stack.pop() as number;
      if (n === 0 || seen[n]) continue;
      seen[n] = 1;
      if (!g.isVar(n)) {
        andNodes.push(n);
        stack.push(g.left[n] >> 1, g.right[n] >> 1);
      }
    }
    andNodes.sort((a, b) => a - b);
  }
  const stats = (): CheckStats => ({ ...sizes, clauses, satCalls });

  const init = fresh();
  // Solver terms of each step's state bits, by position in cone.state.
  const states: number[][] = [cone.state.map(() => fresh())];
  cone.state.forEach((j, p) => clause(-init, ts.state[j].init ? states[0][p] : -states[0][p]));
  const stepTerms: Int32Array[] = [];

  for (let k = 0; k <= limits.maxDepth; k++) {
    if (clauses > limits.budget) return { outcome: { kind: 'undecided', reason: 'budget', bound: k }, stats: stats(), cone };
    // ---- step k: its state, inputs and logic
    const map = new Int32Array(g.size);
    map[0] = falseVar;
    cone.state.forEach((j, p) => (map[nodeOf(ts.state[j].lit)] = states[k][p]));
    const inputs = new Int32Array(cone.step.length);
    cone.step.forEach((j, p) => (map[nodeOf(ts.step[j].lit)] = inputs[p] = fresh()));
    stepTerms.push(inputs);
    for (const n of andNodes) {
      const x = fresh();
      const a = term(map, g.left[n]);
      const b = term(map, g.right[n]);
      clause(-x, a);
      clause(-x, b);
      clause(x, -a, -b);
      map[n] = x;
    }
    for (const c of cone.constraints) guarded(term(map, c));
    states.push(cone.state.map((j) => term(map, ts.state[j].next)));
    // ---- simple path: state k differs from every earlier state
    for (let i = 0; i < k; i++) {
      const diffs: number[] = [];
      states[k].forEach((a, p) => {
        const b = states[i][p];
        if (a === b) return;
        if (a === -b) {
          diffs.push(-falseVar);
          return;
        }
        const d = fresh();
        clause(-d, a, b);
        clause(-d, -a, -b);
        diffs.push(d);
      });
      guarded(...(diffs.length > 0 ? diffs : [falseVar]));
    }
    const badK = term(map, bad);
    // ---- 1. a counterexample of k + 1 scans from the initial state
    const cex = solveWith(init, badK);
    if (cex) {
      const steps = stepTerms.map((terms) => {
        const values = new Map<number, boolean>();
        cone.step.forEach((j, p) => values.set(j, cex.evaluate(terms[p])));
        return values;
      });
      return { outcome: { kind: 'violated', depth: k, steps }, stats: stats(), cone };
    }
    // ---- 2. induction step: k good distinct states cannot lead to a bad one
    if (!solveWith(badK)) return { outcome: { kind: 'proved', method: 'k-induction', depth: k }, stats: stats(), cone };
    // ---- 3. no simple path of k + 1 states from the start: every reachable state was checked
    if (!solveWith(init)) return { outcome: { kind: 'proved', method: 'exhaustive', depth: k }, stats: stats(), cone };
    guarded(-badK);
  }
  return { outcome: { kind: 'undecided', reason: 'max-depth', bound: limits.maxDepth + 1 }, stats: stats(), cone };
}
