import { describe, expect, it } from 'vitest';
import type { JobEvent, JobRecord } from '@/lib/jobs/types';
import { mergeEvent, mergeRecord, sortedJobs, type JobMap } from './job-merge';

const base: JobRecord = {
  id: 'a',
  kind: 'drill-regrade',
  subject: 'drill:1',
  ownerId: 'u',
  state: 'queued',
  progress: { done: 0, total: 0, note: '' },
  result: null,
  error: null,
  attempts: 0,
  version: 1,
  createdAt: '2026-12-04T10:00:00.000Z',
  startedAt: null,
  finishedAt: null,
};

const event = (over: Partial<JobEvent>): JobEvent => ({ id: 'a', kind: 'drill-regrade', subject: 'drill:1', state: 'running', progress: { done: 1, total: 4, note: '' }, attempts: 1, version: 2, ...over });

describe('merging job views by version', () => {
  it('an event newer than the record moves it on, keeping what only the record has', () => {
    let m: JobMap = mergeRecord(new Map(), { ...base, ownerId: 'owner' });
    m = mergeEvent(m, event({ version: 3, progress: { done: 2, total: 4, note: 'two' } }));
    expect(m.get('a')).toMatchObject({ state: 'running', ownerId: 'owner', progress: { done: 2, total: 4, note: 'two' }, version: 3 });
  });

  it('an older event or record arriving late changes nothing', () => {
    let m: JobMap = mergeEvent(new Map(), event({ version: 5, progress: { done: 3, total: 4, note: '' } }));
    const same = mergeEvent(m, event({ version: 4 }));
    expect(same).toBe(m);
    m = mergeRecord(m, { ...base, version: 2 });
    expect(m.get('a')!.progress.done).toBe(3);
  });

  it('the record read after a finishing event brings the result in, at the same version', () => {
    let m: JobMap = mergeRecord(new Map(), base);
    m = mergeEvent(m, event({ state: 'done', version: 6, progress: { done: 4, total: 4, note: '' } }));
    expect(m.get('a')).toMatchObject({ state: 'done', result: null });
    m = mergeRecord(m, { ...base, state: 'done', version: 6, result: { ok: true }, finishedAt: '2026-12-04T10:01:00.000Z' });
    expect(m.get('a')!.result).toEqual({ ok: true });
    // …and a later copy without it (a snapshot of the same version) does not take it away.
    expect(mergeRecord(m, { ...base, state: 'done', version: 6 }).get('a')!.result).toEqual({ ok: true });
  });

  it('lists newest first', () => {
    let m: JobMap = mergeRecord(new Map(), base);
    m = mergeRecord(m, { ...base, id: 'b', createdAt: '2026-12-04T11:00:00.000Z' });
    expect(sortedJobs(m).map((j) => j.id)).toEqual(['b', 'a']);
  });
});
