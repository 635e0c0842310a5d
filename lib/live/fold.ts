import type { FaultCard, LoggedEvent } from '@/simulator';

/**
 * What a tile learns from a run's own events, folded batch by batch: forces active, e-stops
 * pressed in, fault cards cleared, and the notable events for the drill-wide timeline. Pure,
 * so the board's stream folds each new batch into what it holds instead of re-reading a log.
 */
export interface EventFacts {
  forces: Record<string, number>;
  estopPressed: string[];
  cleared: string[];
  lastEvent: string | null;
}

export const emptyFacts = (): EventFacts => ({ forces: {}, estopPressed: [], cleared: [], lastEvent: null });

/** A fault card's place as the diagnosis form names it: its row(s) or device. */
export function faultPlaces(card: FaultCard): string[] {
  const c = card as Record<string, unknown>;
  const out: string[] = [];
  for (const k of ['row', 'device', 'module', 'target']) if (typeof c[k] === 'string') out.push((c[k] as string).toLowerCase());
  if (Array.isArray(c.rows)) for (const r of c.rows) if (typeof r === 'string') out.push(r.toLowerCase());
  return out;
}

/**
 * Folds `events` into `facts`; returns the new facts and the notable events' texts with their
 * cell times. `estops` are the ids of the cell's e-stop devices (a press of any other button
 * is not notable).
 */
export function foldEvents(facts: EventFacts, events: readonly LoggedEvent[], estops: ReadonlySet<string>): { facts: EventFacts; notable: { t: number; text: string }[] } {
  const forces = { ...facts.forces };
  const pressed = new Set(facts.estopPressed);
  const cleared = new Set(facts.cleared);
  const notable: { t: number; text: string }[] = [];
  for (const { t, event: e } of events) {
    let text: string | null = null;
    switch (e.type) {
      case 'press':
        if (estops.has(e.device)) {
          pressed.add(e.device);
          text = `e-stop ${e.device} pressed`;
        }
        break;
      case 'release':
        if (estops.has(e.device) && pressed.delete(e.device)) text = `e-stop ${e.device} released`;
        break;
      case 'force':
        forces[e.target] = e.value;
        text = `force ${e.target} = ${e.value}`;
        break;
      case 'unforce':
        delete forces[e.target];
        text = `force removed from ${e.target}`;
        break;
      case 'clear-fault':
        cleared.add(e.id);
        text = `fault ${e.id} cleared`;
        break;
      case 'inject-fault':
        text = `fault ${e.fault.id} injected`;
        break;
      case 'restart-controller':
        text = 'controller restarted';
        break;
      case 'power-controller':
        text = `controller power ${e.on ? 'on' : 'off'}`;
        break;
      case 'download':
        text = `download (${[e.logic && 'logic', e.wiring && 'wiring', e.routine && 'routine'].filter(Boolean).join(', ')})`;
        break;
      default:
        break;
    }
    if (text) notable.push({ t, text });
  }
  return {
    facts: { forces, estopPressed: [...pressed].sort(), cleared: [...cleared].sort(), lastEvent: notable.at(-1)?.text ?? facts.lastEvent },
    notable,
  };
}
