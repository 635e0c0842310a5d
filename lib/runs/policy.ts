import type { LoggedEvent } from '@/simulator';
import type { DrillPermissions } from '@/lib/schemas/drills';

/**
 * Which events a run may log. A drill's student cannot add or remove fault cards (that would
 * clear the hidden fault), forces only when the drill allows them, and stages point-map edits
 * only when the point map is an editable area, and downloads (`download`: logic sheet, wiring,
 * routine) only of the parts the drill lists as editable. Practice runs may use every event
 * (students practise with fault cards of their own and download whatever they edit).
 */
export function eventProblems(mode: 'drill' | 'practice', permissions: DrillPermissions | null, events: readonly LoggedEvent[]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  if (mode === 'practice') return out;
  events.forEach((e, i) => {
    const type = e.event.type;
    const key = `events.${i}.event.type`;
    if (type === 'inject-fault' || type === 'clear-fault') out[key] = ['Fault cards cannot be changed during a drill.'];
    else if ((type === 'force' || type === 'unforce') && !permissions?.forceAllowed) out[key] = ['This drill does not allow forcing.'];
    else if ((type === 'stage-point-map' || type === 'discard-staged') && !permissions?.editable.includes('point-map')) out[key] = ['This drill does not allow point-map edits.'];
    else if (e.event.type === 'download') {
      const d = e.event;
      const areas = (['logic', 'wiring', 'routine'] as const).filter((a) => d[a] !== undefined);
      const barred = areas.filter((a) => !permissions?.editable.includes(a));
      if (barred.length > 0) out[key] = [`This drill does not allow downloading: ${barred.join(', ')}.`];
    }
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
