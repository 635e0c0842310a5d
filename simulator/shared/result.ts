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

/** A failed {@link Result} with one problem: what a rejected call of the engine returns. */
export function rejected(code: string, message: string, path: (string | number)[] = []): { ok: false; errors: Problem[] } {
  return { ok: false, errors: [{ path, code, message }] };
}
