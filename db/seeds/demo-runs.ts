import type { Knex } from 'knex';
import type { LoggedEvent } from '@/simulator';
import { hashTrace } from '@/simulator';
import { gradeRun } from '@/lib/runs/grade';
import { gradeSignals, replayRun } from '@/lib/runs/engine';
import type { Diagnosis } from '@/lib/schemas/runs';
import type { WeightedRule } from '@/lib/schemas/drills';
import { DEMO_CELL_NAMES } from './demo-cells';

const MARKER = 'demo-runs-v1';
const DAY_MS = 86_400_000;
const MIN_MS = 60_000;
/** The library drill the demo cohort already took last week. */
export const DEMO_CLOSED_DRILL = 'swapped-start-reset';

const ev = (t: number, event: LoggedEvent['event']): LoggedEvent => ({ t, event });
const tap = (t: number, device: string): LoggedEvent[] => [ev(t, { type: 'press', device }), ev(t + 200, { type: 'release', device })];

/**
 * A student who works it out: presses start (nothing but a fault reset happens), then reset (the
 * cycle starts), opens the guard mid-move, tests the e-stop and resets with the other button.
 */
const FOUND_IT: LoggedEvent[] = [
  ev(1000, { type: 'set-field', device: 'part', active: true }),
  ...tap(2000, 'start'),
  ...tap(6000, 'reset'),
  ev(7500, { type: 'set-field', device: 'guard', active: false }),
  ev(11_000, { type: 'set-field', device: 'guard', active: true }),
  ...tap(13_000, 'reset'),
  ev(30_000, { type: 'press', device: 'estop' }),
  ev(33_000, { type: 'release', device: 'estop' }),
  ...tap(35_000, 'start'),
  ...tap(38_000, 'reset'),
];

/** A student who notices start misbehave but blames its wire alone. */
const HALF_WAY: LoggedEvent[] = [
  ev(1500, { type: 'set-field', device: 'part', active: true }),
  ...tap(3000, 'start'),
  ...tap(8000, 'start'),
  ...tap(14_000, 'reset'),
  ev(40_000, { type: 'press', device: 'estop' }),
  ev(42_000, { type: 'release', device: 'estop' }),
];

/** Free practice on the shared demo cell: two parts through a normal cycle. */
const PRACTICE: LoggedEvent[] = [
  ev(1000, { type: 'set-field', device: 'part', active: true }),
  ...tap(2000, 'start'),
  ev(12_000, { type: 'set-field', device: 'part', active: false }),
  ev(16_000, { type: 'set-field', device: 'part', active: true }),
  ...tap(17_000, 'start'),
];

/** The log as a client would have streamed it: one batch per 10 s of cell time. */
function batches(runId: string, log: readonly LoggedEvent[], endedMs: number) {
  const out = [];
  for (let from = 0, seq = 1; from < endedMs; from += 10_000, seq++) {
    const until = Math.min(endedMs, from + 10_000);
    const events = log.filter((e) => e.t >= from && (e.t < until || (until === endedMs && e.t === until)));
    out.push({ run_id: runId, seq, idempotency_key: `demo-${seq}-${runId}`, events: JSON.stringify(events), event_count: events.length, until_ms: until });
  }
  return out;
}

/**
 * Last week's drill for the demo cohort, already closed, with two graded attempts (one right
 * diagnosis, one half right) and a saved practice run, so the gradebook, a student's results
 * and the replay page have something to show on a fresh start. Every grade and trace hash is
 * computed here by the server's own grader (lib/runs/grade.ts) on the stored cell version and
 * log, so a regrade reproduces it. Once (its own marker); false when it had already run or
 * the demo people, cells or drills are missing.
 */
export async function seedDemoRuns(knex: Knex, demoCohortName: string): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const trainer = await trx('users').where({ email: 'trainer@kestrelvale.test' }).first('id');
    if (!trainer) return false;
    const cohort = await trx('cohorts').where({ trainer_id: trainer.id, name: demoCohortName }).first('id');
    const drill = await trx('drills').where({ trainer_id: trainer.id, library_key: DEMO_CLOSED_DRILL }).first();
    const pick = await trx('cells').where({ owner_id: trainer.id, name: DEMO_CELL_NAMES.pickAndPlace }).whereNull('deleted_at').first('id');
    const students = new Map<string, string>(
      (await trx('users').whereIn('email', ['ada.lindqvist@kestrelvale.test', 'noor.achterberg@kestrelvale.test', 'ravi.mendez@kestrelvale.test']).select('id', 'email')).map((u: { id: string; email: string }) => [u.email, u.id]),
    );
    if (!cohort || !drill || !pick || students.size < 3) return false;
    const inserted = await trx('seed_markers').insert({ name: MARKER }).onConflict('name').ignore().returning('name');
    if (inserted.length === 0) return false;

    const documentOf = async (cellId: string, version: number) => (await trx('cell_versions').where({ cell_id: cellId, version }).first('document')).document as unknown;
    const now = Date.now();
    const [assignment] = await trx('assignments')
      .insert({ drill_id: drill.id, cohort_id: cohort.id, opens_at: new Date(now - 10 * DAY_MS), closes_at: new Date(now - 3 * DAY_MS), assigned_by: trainer.id })
      .returning('id');
    const drillDocument = await documentOf(drill.cell_id, drill.cell_version);

    const attempt = async (email: string, seed: number, log: LoggedEvent[], endedMs: number, diagnosis: Diagnosis, daysAgo: number) => {
      const graded = gradeRun({
        context: { document: drillDocument, seed, faults: drill.faults },
        events: log,
        endedMs,
        rules: drill.rules as WeightedRule[],
        answer: { kind: drill.answer_kind, location: drill.answer_location },
        diagnosisWeight: drill.diagnosis_weight,
        diagnosis,
      });
      if (!graded.ok) throw new Error(`demo run of ${email} does not grade: ${JSON.stringify(graded.errors.slice(0, 2))}`);
      const started = new Date(now - daysAgo * DAY_MS);
      const [run] = await trx('runs')
        .insert({
          user_id: students.get(email),
          mode: 'drill',
          drill_id: drill.id,
          assignment_id: assignment.id,
          cell_id: drill.cell_id,
          cell_version: drill.cell_version,
          seed,
          status: 'submitted',
          started_at: started,
          submitted_at: new Date(started.getTime() + 9 * MIN_MS),
          ended_ms: endedMs,
          diagnosis: JSON.stringify(diagnosis),
          grade: graded.value.grade,
          breakdown: JSON.stringify(graded.value.breakdown),
          trace_hash: graded.value.traceHash,
        })
        .returning('id');
      await trx('run_batches').insert(batches(run.id, log, endedMs));
    };
    await attempt('ada.lindqvist@kestrelvale.test', 4_112_027, FOUND_IT, 60_000, { kind: 'swapped-wires', location: 'w-start, w-reset', note: 'Start lights %IX0.3 and reset lights %IX0.0: the two conductors are landed on each other\'s terminals.' }, 6);
    await attempt('noor.achterberg@kestrelvale.test', 2_990_114, HALF_WAY, 50_000, { kind: 'swapped-wires', location: 'w-start', note: 'Start does a reset.' }, 5);

    // Ravi's practice run on the shared cell: no grade, a trace hash like any practice run.
    const version = (await trx('cell_versions').where({ cell_id: pick.id }).max('version as v').first()) as { v: number };
    const document = await documentOf(pick.id, version.v);
    const seed = 771_003;
    const endedMs = 30_000;
    const replayed = replayRun({ document, seed, faults: [], trace: gradeSignals([]) }, PRACTICE, endedMs);
    if (!replayed.ok) throw new Error(`demo practice run does not replay: ${JSON.stringify(replayed.errors.slice(0, 2))}`);
    const traceHash = hashTrace(replayed.value.trace());
    replayed.value.dispose();
    const started = new Date(now - 2 * DAY_MS);
    const [practice] = await trx('runs')
      .insert({
        user_id: students.get('ravi.mendez@kestrelvale.test'),
        mode: 'practice',
        cell_id: pick.id,
        cell_version: version.v,
        seed,
        status: 'submitted',
        started_at: started,
        submitted_at: new Date(started.getTime() + 4 * MIN_MS),
        ended_ms: endedMs,
        trace_hash: traceHash,
      })
      .returning('id');
    await trx('run_batches').insert(batches(practice.id, PRACTICE, endedMs));
    return true;
  });
}
