/**
 * When an assignment is open: the one rule every page, route, service and query uses. Pure
 * (no `server-only`, no database), so the browser and the server import the same module.
 *
 * An assignment is `upcoming` before `opensAt`, `open` from `opensAt` through `closesAt`
 * inclusive, and `closed` strictly after `closesAt`: work sent at the closing instant itself
 * still counts.
 */

/** Where an assignment stands at a moment. */
export type AssignmentState = 'upcoming' | 'open' | 'closed';

/** The times an assignment is open between (ISO 8601). */
export type AssignmentWindow = { opensAt: string; closesAt: string };

/** The state of an assignment at `now` (ms since the epoch; the current time by default). */
export function assignmentState(a: AssignmentWindow, now: number = Date.now()): AssignmentState {
  if (now < Date.parse(a.opensAt)) return 'upcoming';
  if (assignmentClosed(a, now)) return 'closed';
  return 'open';
}

/** True once an assignment has closed: strictly after its closing time. */
export function assignmentClosed(a: Pick<AssignmentWindow, 'closesAt'>, now: number = Date.now()): boolean {
  return now > Date.parse(a.closesAt);
}

/**
 * The same rule for a query over stored assignments: one has not closed at `now` while its
 * closing time is at or after the instant returned (`closes_at >= notClosedSince(now)`).
 */
export function notClosedSince(now: number = Date.now()): Date {
  return new Date(now);
}
