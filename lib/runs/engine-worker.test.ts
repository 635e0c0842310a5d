import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { entryBytes, live, type LoadPayload } from './engine-worker';

const document = cellDocumentSchema.parse(pickAndPlaceCell);
const load = (): LoadPayload => ({ context: { document, seed: 1, faults: [] }, events: [], untilMs: 0, lastSeq: 0, downloads: 0 });
const one = entryBytes(JSON.stringify(document).length, 0);

describe('the engine thread’s live-run cache', () => {
  it('is bounded by estimated memory, not count: a third cell that does not fit drops the least recently used', () => {
    const cacheBytes = Math.floor(2.5 * one);
    expect(live({ op: 'prepare', runId: 'mem-a', budgetMs: 5000, cacheBytes, load: load() }).kind).toBe('ok');
    expect(live({ op: 'prepare', runId: 'mem-b', budgetMs: 5000, cacheBytes, load: load() }).kind).toBe('ok');
    // Using a again makes b the least recently used.
    expect(live({ op: 'view', runId: 'mem-a', atLeastSeq: 0, targetMs: 10, budgetMs: 5000, cacheBytes }).kind).toBe('ok');
    const third = live({ op: 'prepare', runId: 'mem-c', budgetMs: 5000, cacheBytes, load: load() });
    expect(third.evicted).toEqual(['mem-b']);
    expect(live({ op: 'peek', runId: 'mem-b' }).kind).toBe('miss');
    expect(live({ op: 'peek', runId: 'mem-a' }).kind).toBe('ok');
    expect(live({ op: 'evict', runIds: ['mem-a', 'mem-c'] }).kind).toBe('ok');
  });

  it('stops a view at its budget and keeps the progress for the next request', () => {
    const cacheBytes = 10 * one;
    live({ op: 'prepare', runId: 'budget-a', budgetMs: 5000, cacheBytes, load: load() });
    const first = live({ op: 'view', runId: 'budget-a', atLeastSeq: 0, targetMs: 86_400_000, budgetMs: 50, cacheBytes });
    expect(first.kind).toBe('budget');
    const reached = first.kind === 'budget' ? first.timeMs : 0;
    expect(reached).toBeGreaterThan(0);
    expect(reached).toBeLessThan(86_400_000);
    const second = live({ op: 'view', runId: 'budget-a', atLeastSeq: 0, targetMs: 86_400_000, budgetMs: 50, cacheBytes });
    expect(second.kind === 'budget' ? second.timeMs : Infinity).toBeGreaterThan(reached);
    live({ op: 'evict', runIds: ['budget-a'] });
  });

  it('refuses an append whose run has more downloads than allowed, and asks for the log when its cell is behind', () => {
    const cacheBytes = 10 * one;
    live({ op: 'prepare', runId: 'dl-a', budgetMs: 5000, cacheBytes, load: { ...load(), downloads: 3 } });
    const over = live({ op: 'append', runId: 'dl-a', afterSeq: 0, seq: 1, events: [], untilMs: 100, downloads: 2, maxDownloads: 4, budgetMs: 5000, cacheBytes });
    expect(over.kind).toBe('rejected');
    const behind = live({ op: 'append', runId: 'dl-a', afterSeq: 5, seq: 6, events: [], untilMs: 100, downloads: 0, maxDownloads: 4, budgetMs: 5000, cacheBytes });
    expect(behind.kind).toBe('miss');
    live({ op: 'evict', runIds: ['dl-a'] });
  });
});
