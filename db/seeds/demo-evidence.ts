import type { Knex } from 'knex';
import type { LoggedEvent, Rule } from '@/simulator';
import type { InterlockRuleBody } from '@/db/interlock-rules';
import { DEMO_CELL_NAMES } from './demo-cells';

const MARKER = 'demo-evidence-v1';

const bit = (signal: string, value: 'on' | 'off' = 'on') => ({ signal, value });

/**
 * The interlock rules Brennick's lead keeps with the line 3 cell (invented plant). Addresses as
 * the demo changeover names them (db/seeds/demo-changeovers.ts): front guard %IX0.4, rear guard
 * %IX0.7 (only in the proposal), cycle stop %IX0.1 (NC: on while not pressed), e-stop chain
 * %IX0.2, start request %QX0.0, stop request %QX0.1, guard closed to the robot %QX0.3, red and
 * yellow tiers %QX1.0 and %QX1.1. Proved on the demo changeover:
 * - "Robot held whenever the yellow tier shows a guard open" holds today and is violated by
 *   the proposal, whose rear door lights the yellow tier but is not passed to the robot — the
 *   interlock the change breaks;
 * - "A start begins only with both guards closed" is violated today (there is no rear door)
 *   and proved on the proposal — what the change is for;
 * - the others hold on both (one of them with the start pulse's timer encoded exactly).
 */
export const DEMO_INTERLOCK_RULES: { title: string; body: InterlockRuleBody }[] = [
  {
    title: 'Robot held whenever the yellow tier shows a guard open',
    body: { kind: 'never', what: bit('%QX0.3'), while: { all: [bit('%QX1.1'), bit('%IX0.1')] } },
  },
  {
    title: 'A start begins only with both guards closed',
    body: { kind: 'within', after: bit('%QX0.0'), expect: { all: [bit('%IX0.4'), bit('%IX0.7')] }, scans: 0, trigger: 'rises' },
  },
  {
    title: 'Red tier whenever the e-stop chain is open',
    body: { kind: 'never', what: bit('%QX1.0', 'off'), while: bit('%IX0.2', 'off') },
  },
  {
    title: 'Stop request only while cycle stop is pressed',
    body: { kind: 'only-if', what: bit('%QX0.1'), requires: [bit('%IX0.1', 'off')] },
  },
  {
    title: 'Start request is a pulse, off again within 12 scans',
    body: { kind: 'within', after: bit('%QX0.0'), expect: bit('%QX0.0', 'off'), scans: 12, trigger: 'rises' },
  },
];

const ev = (t: number, event: LoggedEvent['event']): LoggedEvent => ({ t, event });
const startCycle: LoggedEvent[] = [
  ev(2000, { type: 'set-field', device: 'part', active: true }),
  ev(2100, { type: 'press', device: 'start' }),
  ev(2160, { type: 'release', device: 'start' }),
];
/** "While the robot cycles, the rear guard reads open": the event the rear-door rules start from. */
const rearOpenWhileCycling = { all: [{ signal: 'plc.%IX0.7', op: '==' as const, value: 0 }, { signal: 'hs.cycling', op: '==' as const, value: 1 }] };

/**
 * Two scenarios in the headless runner's formats. The rear door does not exist on today's
 * cell, so the second scenario opens it the way a rehearsal would: by forcing its PLC input
 * off (an unwired input on the base, the door's switch on the proposal).
 */
export const DEMO_SCENARIOS: { name: string; description: string; events: LoggedEvent[]; rules: Rule[]; durationMs: number }[] = [
  {
    name: 'Normal part cycle',
    description: 'A part arrives, the operator presses start, the robot places it at place 1 and returns home.',
    events: startCycle,
    rules: [
      { id: 'one-cycle', label: 'One part placed within 15 s', kind: 'eventually', withinMs: 15_000, p: { signal: 'ctl.cycles', op: '>=', value: 1 } },
      { id: 'no-motion-front-open', label: 'The arm never moves with the front guard open', kind: 'never', p: { all: [{ signal: 'arm.moving', op: '==', value: 1 }, { signal: 'plc.%IX0.4', op: '==', value: 0 }] } },
    ],
    durationMs: 16_000,
  },
  {
    name: 'Rear guard opened mid-cycle',
    description: 'The rear guard door is opened two seconds into a cycle (its input forced off) and closed again two seconds later.',
    events: [...startCycle, ev(4000, { type: 'force', target: '%IX0.7', value: 0 }), ev(6000, { type: 'unforce', target: '%IX0.7' })],
    rules: [
      { id: 'yellow-on-rear-open', label: 'Yellow tier within 100 ms of the rear guard opening', kind: 'after', event: rearOpenWhileCycling, withinMs: 100, p: { signal: 'plc.%QX1.1', op: '==', value: 1 } },
      { id: 'arm-stops-on-rear-open', label: 'The arm stops within 600 ms of the rear guard opening', kind: 'after', event: rearOpenWhileCycling, withinMs: 600, p: { signal: 'arm.moving', op: '==', value: 0 } },
    ],
    durationMs: 12_000,
  },
];

/**
 * The demo lead's interlock rules and scenarios, once (own marker), on their line 3 cell.
 * Runs after the changeover seed, and does nothing (leaving no marker) while the cell is not
 * there. Returns false when it had already run.
 */
export async function seedDemoEvidence(knex: Knex): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const lead = await trx('users').where({ email: 'lead@brennick.test' }).first('id');
    const cell = lead ? await trx('cells').where({ owner_id: lead.id, name: DEMO_CELL_NAMES.leadCopy }).whereNull('deleted_at').first('id') : undefined;
    if (!lead || !cell) return false;
    const inserted = await trx('seed_markers').insert({ name: MARKER }).onConflict('name').ignore().returning('name');
    if (inserted.length === 0) return false;
    await trx('interlock_rules').insert(
      DEMO_INTERLOCK_RULES.map((r, i) => ({ cell_id: cell.id, position: i + 1, title: r.title, body: JSON.stringify(r.body), created_by: lead.id, updated_by: lead.id })),
    );
    await trx('cell_scenarios').insert(
      DEMO_SCENARIOS.map((s) => ({
        cell_id: cell.id,
        name: s.name,
        description: s.description,
        events: JSON.stringify(s.events),
        rules: JSON.stringify(s.rules),
        faults: '[]',
        seed: null,
        duration_ms: s.durationMs,
        created_by: lead.id,
      })),
    );
    return true;
  });
}
