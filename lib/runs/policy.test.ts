import { describe, expect, it } from 'vitest';
import type { LoggedEvent } from '@/simulator';
import { eventProblems, timeProblems } from './policy';

const ev = (t: number, event: LoggedEvent['event']): LoggedEvent => ({ t, event });

describe('eventProblems', () => {
  const log = [
    ev(1, { type: 'press', device: 'start' }),
    ev(2, { type: 'clear-fault', id: 'f1' }),
    ev(3, { type: 'force', target: '%IX0.1', value: 1 }),
    ev(4, { type: 'stage-point-map', rows: [] }),
    ev(5, { type: 'restart-controller' }),
  ];
  it('keeps fault cards out of a drill and applies its permissions', () => {
    expect(Object.keys(eventProblems('drill', { forceAllowed: false, editable: [] }, log))).toEqual(['events.1.event.type', 'events.2.event.type', 'events.3.event.type']);
    expect(Object.keys(eventProblems('drill', { forceAllowed: true, editable: ['point-map'] }, log))).toEqual(['events.1.event.type']);
  });
  it('lets a drill download only the areas it lists as editable, naming the event index', () => {
    const sheet = { scanPeriodMs: 10, blocks: [], connections: [] };
    const downloads = [
      ev(1, { type: 'download', logic: sheet } as LoggedEvent['event']),
      ev(2, { type: 'download', wiring: [] } as LoggedEvent['event']),
      ev(3, { type: 'download', routine: { steps: [], poses: [] } } as LoggedEvent['event']),
      ev(4, { type: 'download', logic: sheet, wiring: [] } as LoggedEvent['event']),
    ];
    expect(Object.keys(eventProblems('drill', { forceAllowed: true, editable: [] }, downloads))).toEqual(['events.0.event.type', 'events.1.event.type', 'events.2.event.type', 'events.3.event.type']);
    const logicOnly = eventProblems('drill', { forceAllowed: true, editable: ['logic'] }, downloads);
    expect(Object.keys(logicOnly)).toEqual(['events.1.event.type', 'events.2.event.type', 'events.3.event.type']);
    expect(logicOnly['events.3.event.type'][0]).toContain('wiring');
    expect(eventProblems('drill', { forceAllowed: false, editable: ['logic', 'wiring', 'routine'] }, downloads)).toEqual({});
    expect(eventProblems('practice', null, downloads)).toEqual({});
  });
  it('lets practice use every event', () => {
    expect(eventProblems('practice', null, log)).toEqual({});
  });
});

describe('timeProblems', () => {
  it('accepts events from the stored end up to untilMs', () => {
    expect(timeProblems([ev(1000, { type: 'press', device: 's' }), ev(1000, { type: 'release', device: 's' })], 2000, 1000, 600_000)).toEqual({});
  });
  it('refuses going back, events outside the window, and passing the time limit', () => {
    expect(Object.keys(timeProblems([], 500, 1000, null))).toEqual(['untilMs']);
    expect(Object.keys(timeProblems([ev(999, { type: 'press', device: 's' })], 2000, 1000, null))).toEqual(['events.0.t']);
    expect(Object.keys(timeProblems([ev(2500, { type: 'press', device: 's' })], 2000, 1000, null))).toEqual(['events.0.t']);
    expect(Object.keys(timeProblems([], 700_000, 0, 600_000))).toEqual(['untilMs']);
  });
});
