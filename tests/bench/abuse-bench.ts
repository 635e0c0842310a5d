/**
 * `health_worst_ms_under_abuse` (issue 9): the worst latency of GET /api/health while 10
 * students each keep asking for a far-ahead view of their practice run, against the running app.
 *
 * Half of the students ask for a view seven simulated days ahead of a fresh run (refused at once:
 * a run may only be as far ahead as its age allows). The other half have runs whose start is
 * set seven days back, so the same request is inside their allowance and each one makes the
 * server's engine work for its whole budget in a worker thread (then 503 with Retry-After, the
 * progress kept), until the student's engine time runs out. Each student sends a new request as
 * soon as the last is answered, ignoring Retry-After, as an abuser would.
 * Meanwhile one client asks /api/health every 25 ms; the figure is the slowest answer.
 * Target ≤ 250 ms on the 2-core machine. Needs BENCH_BASE_URL and DATABASE_URL (bench students).
 */
import knexFactory from 'knex';
import { knexConfig } from '@/db/config';
import { benchDatabaseUrl, benchStudents, median, reachableBase } from './bench-support';

type Figures = Record<string, number>;

const STUDENTS = 10;
const DURATION_MS = 10_000;
const WEEK_MS = 7 * 86_400_000;

export async function abuseBench(): Promise<Figures> {
  const target = await reachableBase();
  if (!target.ok) {
    process.stderr.write(`abuse bench skipped: ${target.reason}\n`);
    return {};
  }
  const base = target.base;
  const people = await benchStudents(base, STUDENTS, 'abuse');
  const knex = knexFactory(knexConfig(benchDatabaseUrl()));
  try {
    const cells = (await (await fetch(`${base}/api/cells`, { headers: { cookie: people.cookies[0] } })).json()) as { shared?: { id: string; name: string }[] };
    const cell = cells.shared?.find((c) => /pick and place/i.test(c.name));
    if (!cell) throw new Error('the demo pick-and-place cell is not shared with the demo cohort: seed the database');
    const runs: { id: string; cookie: string }[] = [];
    for (const [i, cookie] of people.cookies.entries()) {
      const r = await fetch(`${base}/api/runs`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body: JSON.stringify({ cellId: cell.id, seed: 1000 + i }) });
      if (r.status !== 201) throw new Error(`could not start a practice run (${r.status}): ${await r.text()}`);
      const id = ((await r.json()) as { run: { id: string } }).run.id;
      if (i % 2 === 1) await knex('runs').where({ id }).update({ started_at: new Date(Date.now() - WEEK_MS) });
      runs.push({ id, cookie });
    }
    const until = Date.now() + DURATION_MS;
    const statuses: Record<number, number> = {};
    let views = 0;
    const abuser = async (run: { id: string; cookie: string }) => {
      while (Date.now() < until) {
        const r = await fetch(`${base}/api/runs/${run.id}/view?t=${WEEK_MS}`, { headers: { cookie: run.cookie } });
        await r.arrayBuffer();
        statuses[r.status] = (statuses[r.status] ?? 0) + 1;
        views++;
      }
    };
    const latencies: number[] = [];
    const prober = async () => {
      while (Date.now() < until) {
        const t0 = performance.now();
        const r = await fetch(`${base}/api/health`);
        await r.arrayBuffer();
        latencies.push(performance.now() - t0);
        await new Promise((res) => setTimeout(res, 25));
      }
    };
    await Promise.all([prober(), ...runs.map(abuser)]);
    return {
      health_worst_ms_under_abuse: Math.round(Math.max(...latencies) * 10) / 10,
      health_p50_ms_under_abuse: Math.round(median(latencies) * 10) / 10,
      health_probes_under_abuse: latencies.length,
      abuse_views_per_s: Math.round(views / (DURATION_MS / 1000)),
      abuse_views_422: statuses[422] ?? 0,
      abuse_views_503: statuses[503] ?? 0,
      abuse_views_200: statuses[200] ?? 0,
    };
  } finally {
    await knex.destroy();
    await people.remove();
  }
}

if (process.argv[1] && import.meta.url === new URL(`file://${process.argv[1]}`).href) {
  abuseBench().then(
    (f) => process.stdout.write(`${JSON.stringify(f)}\n`),
    (e: unknown) => {
      process.stderr.write(`${(e as Error).stack ?? String(e)}\n`);
      process.exit(1);
    },
  );
}
