import { describe, expect, it } from 'vitest';
import { assignmentClosed, assignmentState, notClosedSince } from './assignment-window';

const a = { opensAt: '2026-03-01T08:00:00.000Z', closesAt: '2026-03-08T17:00:00.000Z' };
const at = (iso: string) => Date.parse(iso);

describe('assignment window (one rule for pages, routes, services and queries)', () => {
  it('is upcoming before it opens, open from the opening through the closing instant, closed after', () => {
    expect(assignmentState(a, at('2026-03-01T07:59:59.999Z'))).toBe('upcoming');
    expect(assignmentState(a, at('2026-03-01T08:00:00.000Z'))).toBe('open');
    expect(assignmentState(a, at('2026-03-08T17:00:00.000Z'))).toBe('open');
    expect(assignmentState(a, at('2026-03-08T17:00:00.001Z'))).toBe('closed');
    expect(assignmentClosed(a, at('2026-03-08T17:00:00.000Z'))).toBe(false);
    expect(assignmentClosed(a, at('2026-03-08T17:00:00.001Z'))).toBe(true);
  });

  it('the query cutoff agrees: a stored closing time at or after it has not closed', () => {
    for (const now of [at('2026-03-08T16:59:59.999Z'), at('2026-03-08T17:00:00.000Z'), at('2026-03-08T17:00:00.001Z')]) {
      const stillOpenByQuery = Date.parse(a.closesAt) >= notClosedSince(now).getTime();
      expect(stillOpenByQuery).toBe(!assignmentClosed(a, now));
    }
  });
});
