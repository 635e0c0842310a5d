/**
 * Typed results for the engine. Callers are expected to handle rejection, so the
 * engine returns a value instead of throwing (shared/STYLE.md: pure transitions
 * return a typed result).
 */

/** One problem found in an input document, located by its path inside that document. */
export type Problem = {
  /** Path from the document root, e.g. `['blocks', 3, 'params', 'PT']`. */
  path: (string | number)[];
  /** Human-readable explanation, in English. */
  message: string;
  /** Stable machine-readable code, e.g. `algebraic_loop`, `dangling_connection`. */
  code: string;
  /** Ids of other things involved (block ids of a loop, the other row of an overlap ...). */
  related?: string[];
};

/** Success with a value, or failure with every problem found (never only the first). */
export type Result<T, E = Problem> = { ok: true; value: T } | { ok: false; errors: E[] };

/** Wraps a value as a successful {@link Result}. */
export function ok<T>(value: T): { ok: true; value: T } {
  return { ok: true, value };
}

/** Wraps one or more errors as a failed {@link Result}. */
export function fail<E>(errors: E | E[]): { ok: false; errors: E[] } {
  return { ok: false, errors: Array.isArray(errors) ? errors : [errors] };
}

/** Builds a {@link Problem}. */
export function problem(path: (string | number)[], code: string, message: string, related?: string[]): Problem {
  return related && related.length > 0 ? { path, message, code, related } : { path, message, code };
}

/** Prefixes every problem's path, for nesting a sub-document's problems inside a parent. */
export function prefixProblems(prefix: (string | number)[], problems: Problem[]): Problem[] {
  return problems.map((p) => ({ ...p, path: [...prefix, ...p.path] }));
}
