/**
 * Signal predicates: comparisons of named signals with constants, combined with all / any /
 * not. Used by fault-card triggers and by rules. Compiled once into a closure.
 */
import type { Problem, Result } from '@/simulator/shared/result';
import type { SignalPredicate } from '@/simulator/faults/fault-card';

export type { SignalPredicate } from '@/simulator/faults/fault-card';

/** A signal's value: numbers for levels and booleans (0/1), text for state names. */
export type SignalValue = number | string;

/** A compiled predicate: evaluates against a signal reader. */
export type CompiledPredicate = (read: (name: string) => SignalValue) => boolean;

function norm(v: number | string | boolean): SignalValue {
  return typeof v === 'boolean' ? (v ? 1 : 0) : v;
}

function compare(a: SignalValue, op: string, b: SignalValue): boolean {
  switch (op) {
    case '==':
      return a === b;
    case '!=':
      return a !== b;
    case '>':
      return a > b;
    case '>=':
      return a >= b;
    case '<':
      return a < b;
    default:
      return a <= b;
  }
}

/**
 * Compiles a predicate, checking every signal name with `known`. Reports each unknown
 * name with its path inside the predicate.
 */
export function compilePredicate(p: SignalPredicate, known: (name: string) => boolean, path: (string | number)[] = []): Result<CompiledPredicate, Problem> {
  const problems: Problem[] = [];
  const build = (q: SignalPredicate, at: (string | number)[]): CompiledPredicate => {
    if ('signal' in q) {
      if (!known(q.signal)) problems.push({ path: [...at, 'signal'], code: 'unknown_signal', message: `no signal "${q.signal}"` });
      const name = q.signal;
      const op = q.op;
      const value = norm(q.value);
      return (read) => compare(read(name), op, value);
    }
    if ('all' in q) {
      const parts = q.all.map((x, i) => build(x, [...at, 'all', i]));
      return (read) => parts.every((f) => f(read));
    }
    if ('any' in q) {
      const parts = q.any.map((x, i) => build(x, [...at, 'any', i]));
      return (read) => parts.some((f) => f(read));
    }
    const inner = build(q.not, [...at, 'not']);
    return (read) => !inner(read);
  };
  const f = build(p, path);
  return problems.length > 0 ? { ok: false, errors: problems } : { ok: true, value: f };
}

/** Every signal name a predicate mentions, in order of first mention. */
export function predicateSignals(p: SignalPredicate, out: string[] = []): string[] {
  if ('signal' in p) {
    if (!out.includes(p.signal)) out.push(p.signal);
  } else if ('all' in p) p.all.forEach((x) => predicateSignals(x, out));
  else if ('any' in p) p.any.forEach((x) => predicateSignals(x, out));
  else predicateSignals(p.not, out);
  return out;
}
