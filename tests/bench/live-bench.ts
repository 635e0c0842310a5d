/**
 * `live_view_p95_ms_30_students` (issue 13, target ≤ 500 ms): 30 students of the demo cohort
 * each stream one batch a second into their attempt at a fresh assignment while the trainer's
 * live board is open (GET /api/assignments/[id]/live/stream, read with fetch); a sample is the
 * time from a batch's 201 (accepted) to the board's `tile` event carrying that batch's seq. The
 * students start at random offsets within the second (seeded), as a class does. Needs
 * BENCH_BASE_URL (a running app on a seeded database, DATABASE_URL for the bench's own rows);
 * BENCH_BOARD_URL, when set, opens the board on a second app process of the same database, so
 * every sample crosses processes through LISTEN/NOTIFY, as behind a load balancer.
 */
import { benchDatabaseUrl, benchStudents, reachableBase, signIn } from './bench-support';
import { readSseFrames } from '../sse-frames';

type Figures = Record<string, number>;

const STUDENTS = 30;
const SECONDS = 12;

function p95(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil(s.length * 0.95) - 1)] ?? NaN;
}

export async function liveBench(): Promise<Figures> {
  const target = await reachableBase();
  if (!target.ok) {
    process.stderr.write(`live board bench skipped: ${target.reason}\n`);
    return {};
  }
  const base = target.base;
  const { default: knexFactory } = await import('knex');
  const { knexConfig } = await import('@/db/config');
  const { DEMO_COHORT } = await import('@/db/seeds/demo');
  const knex = knexFactory(knexConfig(benchDatabaseUrl()));
  const people = await benchStudents(base, STUDENTS, 'live');
  let assignmentId: string | null = null;
  const abort = new AbortController();
  try {
    const trainerCookie = await signIn(base, 'trainer@kestrelvale.test', 'trainer-demo-2026');
    const cohort = await knex('cohorts').where({ name: DEMO_COHORT }).first('id', 'trainer_id');
    const drill = await knex('drills').where({ trainer_id: cohort.trainer_id }).whereNull('deleted_at').first('id');
    // Written straight to the database: the assign route would mail the whole cohort.
    const [row] = await knex('assignments')
      .insert({ drill_id: drill.id, cohort_id: cohort.id, opens_at: new Date(Date.now() - 60_000), closes_at: new Date(Date.now() + 3_600_000), assigned_by: cohort.trainer_id })
      .returning('id');
    assignmentId = row.id as string;

    const runs: { runId: string; cookie: string }[] = [];
    for (const cookie of people.cookies) {
      const r = await fetch(`${base}/api/assignments/${assignmentId}/run`, { method: 'POST', headers: { cookie } });
      if (!r.ok) throw new Error(`could not start an attempt (${r.status}): ${await r.text()}`);
      runs.push({ runId: ((await r.json()) as { run: { id: string } }).run.id, cookie });
    }

    // The trainer's board: tile arrival times by run and seq.
    const seen = new Map<string, number>();
    const maxSeen = new Map<string, number>();
    const boardBase = process.env.BENCH_BOARD_URL?.replace(/\/$/, '') || base;
    const res = await fetch(`${boardBase}/api/assignments/${assignmentId}/live/stream`, { headers: { cookie: trainerCookie }, signal: abort.signal });
    if (res.status !== 200 || !res.body) throw new Error(`the board stream answered ${res.status}`);
    let boardReady!: () => void;
    const ready = new Promise<void>((r) => (boardReady = r));
    void readSseFrames(res.body, (event, data) => {
      if (event === 'board') boardReady();
      if (event !== 'tile' || !data) return;
      // A tile at seq L shows every batch up to L (one fold may take two batches that came close together).
      const t = JSON.parse(data) as { runId: string | null; lastSeq: number };
      if (!t.runId) return;
      const now = performance.now();
      for (let q = (maxSeen.get(t.runId) ?? 0) + 1; q <= t.lastSeq; q++) seen.set(`${t.runId}:${q}`, now);
      maxSeen.set(t.runId, Math.max(maxSeen.get(t.runId) ?? 0, t.lastSeq));
    });
    await ready;

    // Seeded offsets (a small LCG, so two runs of the bench send the same pattern).
    let seed = 20261204;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const accepted = new Map<string, number>();
    const t0 = performance.now() + 200;
    await Promise.all(
      runs.map(async ({ runId, cookie }, k) => {
        const offset = rand() * 1000;
        for (let s = 1; s <= SECONDS; s++) {
          const wait = t0 + offset + (s - 1) * 1000 - performance.now();
          if (wait > 0) await new Promise((r) => setTimeout(r, wait));
          const r = await fetch(`${base}/api/runs/${runId}/batches`, {
            method: 'POST',
            headers: { cookie, 'content-type': 'application/json' },
            body: JSON.stringify({ key: `live-bench-${runId}-${s}`, seq: s, untilMs: s * 1000, events: s % 4 === 0 ? [{ t: s * 1000 - 10, event: { type: 'press', device: 'estop' } }] : [] }),
          });
          if (r.status !== 201) throw new Error(`batch ${s} of student ${k} answered ${r.status}: ${await r.text()}`);
          accepted.set(`${runId}:${s}`, performance.now());
        }
      }),
    );
    // Let the last tiles arrive (up to 5 s), then measure.
    const until = performance.now() + 5000;
    while (performance.now() < until && [...accepted.keys()].some((k) => !seen.has(k))) await new Promise((r) => setTimeout(r, 50));
    const lat: number[] = [];
    let missing = 0;
    for (const [k, at] of accepted) {
      const got = seen.get(k);
      if (got === undefined) missing++;
      else lat.push(Math.max(0, got - at));
    }
    return { live_view_p95_ms_30_students: Math.round(p95(lat) * 10) / 10, live_view_median_ms: Math.round([...lat].sort((a, b) => a - b)[Math.floor(lat.length / 2)] * 10) / 10, live_view_samples: lat.length, live_view_missing: missing };
  } finally {
    abort.abort();
    await people.remove();
    if (assignmentId) await knex('assignments').where({ id: assignmentId }).delete();
    await knex.destroy();
  }
}
