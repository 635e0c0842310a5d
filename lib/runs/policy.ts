import type { CellEvent, LoggedEvent } from '@/simulator';

/**
 * The run policy: one module the server (lib/runs/service.ts) and the browser (the drill
 * attempt's connection, components/runs/remote-engine.ts) both import, so the two can never
 * disagree about what a run may log. No `server-only`: it is pure.
 */

/** What a drill lets its student change (the drill's permissions; the browser gets the same). */
export type EventPermissions = { forceAllowed: boolean; editable: readonly string[] };

/**
 * Bounds on what one run may ask of the server's engine.
 * - `downloadsPerBatch`, `downloadsPerRun`: a `download` event recompiles and revalidates the
 *   whole document, so a batch or a run full of them would be a cheap way to burn the server.
 *   A student downloads after each edit; a few per minute is heavy use.
 * - `speed`: how fast a run's cell time may run ahead of its wall-clock age. A drill attempt
 *   runs on the server at ×1; a practice run runs in the browser at ×1 or ×10 and the server
 *   follows it, so neither can ask the server to simulate far beyond what it could have run.
 * - `slackMs`: room for clocks, start-up and a slow first batch.
 */
export const LIMITS = {
  downloadsPerBatch: 5,
  downloadsPerRun: 300,
  speed: { drill: 1, practice: 10 },
  slackMs: 60_000,
} as const;

/** The cell time a run may reach now: its age since it started × its mode's speed, plus slack. */
export function allowedUntilMs(run: { mode: 'drill' | 'practice'; startedAt: string }, nowMs: number): { untilMs: number; rate: number } {
  const rate = LIMITS.speed[run.mode];
  const age = Math.max(0, nowMs - Date.parse(run.startedAt));
  return { untilMs: Math.floor(age * rate + LIMITS.slackMs), rate };
}

/** How many `download` events a list holds. */
export function countDownloads(events: readonly LoggedEvent[]): number {
  let n = 0;
  for (const e of events) if (e.event.type === 'download') n++;
  return n;
}

/**
 * Why a drill's student may not log `event`, or null when they may. A student cannot add or
 * remove fault cards (that would clear the hidden fault), forces only when the drill allows
 * them, stages point-map edits only when the point map is an editable area, and downloads
 * (`download`: logic sheet, wiring, routine) only the parts the drill lists as editable.
 * A drill without permissions (null) allows none of the optional ones.
 */
export function eventRefusal(event: CellEvent, permissions: EventPermissions | null): string | null {
  const type = event.type;
  if (type === 'inject-fault' || type === 'clear-fault') return 'Fault cards cannot be changed during a drill.';
  if ((type === 'force' || type === 'unforce') && !permissions?.forceAllowed) return 'This drill does not allow forcing.';
  if ((type === 'stage-point-map' || type === 'discard-staged') && !permissions?.editable.includes('point-map')) return 'This drill does not allow point-map edits.';
  if (event.type === 'download') {
    const d = event;
    const barred = (['logic', 'wiring', 'routine'] as const).filter((a) => d[a] !== undefined && !permissions?.editable.includes(a));
    if (barred.length > 0) return `This drill does not allow downloading: ${barred.join(', ')}.`;
  }
  return null;
}

/**
 * Which events of a batch a run may not log, by field path (`events.<i>.event.type`), with a
 * batch's download cap. Practice runs may use every event (students practise with fault cards
 * of their own and download whatever they edit); a drill's go through {@link eventRefusal}.
 */
export function eventProblems(mode: 'drill' | 'practice', permissions: EventPermissions | null, events: readonly LoggedEvent[]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  const downloads = countDownloads(events);
  if (downloads > LIMITS.downloadsPerBatch) out.events = [`A batch may hold at most ${LIMITS.downloadsPerBatch} downloads; this one has ${downloads}.`];
  if (mode === 'practice') return out;
  events.forEach((e, i) => {
    const why = eventRefusal(e.event, permissions);
    if (why) out[`events.${i}.event.type`] = [why];
  });
  return out;
}

/**
 * Time checks of a batch against what is stored: events in time order, none before the last
 * stored batch's end, none after this batch's `untilMs`; `untilMs` never goes back and never
 * passes the drill's time limit.
 */
export function timeProblems(events: readonly LoggedEvent[], untilMs: number, previousUntilMs: number, timeLimitMs: number | null): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  if (untilMs < previousUntilMs) out.untilMs = [`The run already reached ${previousUntilMs} ms; untilMs cannot go back.`];
  if (timeLimitMs !== null && untilMs > timeLimitMs) out.untilMs = [`The drill's time limit is ${timeLimitMs} ms.`];
  let prev = previousUntilMs;
  events.forEach((e, i) => {
    if (e.t < prev) out[`events.${i}.t`] = [`Event at ${e.t} ms comes before ${prev} ms.`];
    else if (e.t > untilMs) out[`events.${i}.t`] = [`Event at ${e.t} ms is after untilMs (${untilMs} ms).`];
    prev = Math.max(prev, e.t);
  });
  return out;
}
