/**
 * `npm run bench`: engine measurements as a readable table; `npm run bench -- --json` prints
 * one JSON object as its last line. Not a test: numbers depend on the machine.
 *
 * Measurements are a list of named functions, each returning flat key → number results,
 * so later issues add one entry to `MEASUREMENTS` without touching the rest.
 *
 * Targets (issue 3): engine ≥ 0.5 of the hand-written baseline at 1,000 and 10,000 blocks;
 * demo cell ≥ 5,000× real time.
 */
import { benchSheets } from './sheet-bench';
import { workspaceBench } from './workspace-bench';
import { drillsBench } from './drills-bench';
import { createCell, pickAndPlaceCell } from '@/simulator';

type Figures = Record<string, number>;
type Measurement = { name: string; describe: string; run: () => Promise<Figures> | Figures };

const HOUR_MS = 3_600_000;

/**
 * Simulated-to-wall time of the pick-and-place demo over one hour of cell time: an operator
 * loads a part and presses start every 15 s (about 240 cycles an hour), the guard is opened
 * once every 10 minutes for a few seconds. Warm-up: one simulated minute first.
 */
function cellRealtime(): Figures {
  const made = createCell(pickAndPlaceCell);
  if (!made.ok) throw new Error(`demo cell invalid: ${JSON.stringify(made.errors)}`);
  const cell = made.value;
  const must = (r: { ok: boolean }) => {
    if (!r.ok) throw new Error('bench event rejected');
  };
  must(cell.advance(2000));
  must(cell.apply({ type: 'set-field', device: 'part', active: true }));
  const second = (s: number) => {
    if (s % 15 === 0) {
      must(cell.apply({ type: 'press', device: 'start' }));
      must(cell.advance(100));
      must(cell.apply({ type: 'release', device: 'start' }));
      must(cell.advance(900));
    } else if (s % 600 === 300) {
      must(cell.apply({ type: 'set-field', device: 'guard', active: false }));
      must(cell.advance(1000));
    } else if (s % 600 === 303) {
      must(cell.apply({ type: 'set-field', device: 'guard', active: true }));
      must(cell.advance(1000));
    } else must(cell.advance(1000));
  };
  for (let s = 0; s < 60; s++) second(s);
  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  for (let s = 0; s < HOUR_MS / 1000; s++) second(s);
  const wall = performance.now() - t0;
  // CPU time as well: on a shared, busy machine wall time also counts other processes' work.
  const cpu = process.cpuUsage(cpu0);
  const cpuMs = (cpu.user + cpu.system) / 1000;
  const cycles = cell.snapshot().controller.cyclesCompleted;
  cell.dispose();
  return {
    cell_realtime_factor: round(HOUR_MS / wall, 0),
    cell_wall_ms_per_hour: round(wall, 1),
    cell_realtime_factor_cpu: round(HOUR_MS / cpuMs, 0),
    cell_cycles_per_hour: cycles,
  };
}

async function sheets(): Promise<Figures> {
  const r = await benchSheets();
  const out: Figures = {
    engine_vs_baseline_100: r.engine_vs_baseline_100,
    engine_vs_baseline_1000: r.engine_vs_baseline_1000,
    engine_vs_baseline_10000: r.engine_vs_baseline_10000,
    engine_scans_per_s_1000: r.engine_scans_per_s_1000,
    heap_mb_10000: r.heap_mb_10000,
  };
  for (const d of r.details) {
    out[`engine_scans_per_s_${d.blocks}`] = d.engine_scans_per_s;
    out[`baseline_scans_per_s_${d.blocks}`] = d.baseline_scans_per_s;
  }
  return out;
}

/** Every measurement, in the order they run. Add new ones here. */
export const MEASUREMENTS: Measurement[] = [
  { name: 'logic sheets', describe: 'scans/s of generated sheets vs the same logic hand-written', run: sheets },
  { name: 'demo cell', describe: 'pick-and-place demo, one hour of cell time', run: cellRealtime },
  { name: 'workspace', describe: 'first-load JS (gzip KiB) and 500-block canvas fps in Chromium; needs BENCH_BASE_URL', run: workspaceBench },
  { name: 'drills', describe: 'server regrade of a 10-minute run; batch POST p95 with 50 clients (autocannon), needs BENCH_BASE_URL', run: drillsBench },
  { name: 'abuse', describe: 'worst /api/health latency while 10 students ask for far-ahead views; needs BENCH_BASE_URL', run: async () => (await import('./abuse-bench')).abuseBench() },
  { name: 'changeover diff', describe: 'diffCells on two 10,000-block cells differing in 1 % of blocks (median ms, target ≤ 200)', run: async () => (await import('./diff-bench')).diffBench() },
  { name: 'proofs', describe: 'proveRules: 20 interlock rules over a generated sheet with 32 inputs, latches, edges, counters (median ms, target ≤ 1,000)', run: async () => (await import('./proof-bench')).proofBench() },
  { name: 'plc link', describe: 'Modbus TCP client polling the demo cell every 10 ms on loopback: read inputs + write coils (p99 ms per request, target ≤ 5)', run: async () => (await import('./plc-link-bench')).plcLinkBench() },
  { name: 'live board', describe: '30 students streaming one batch a second; batch accepted → the trainer\'s board tile (p95 ms, target ≤ 500); needs BENCH_BASE_URL', run: async () => (await import('./live-bench')).liveBench() },
];

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

async function main(): Promise<void> {
  const json = process.argv.includes('--json');
  // The browser and server measurements need a running app; `bash scripts/start.sh` serves one here.
  process.env.BENCH_BASE_URL ??= 'http://127.0.0.1:3000';
  const all: Figures = {};
  const rows: [string, string, string][] = [];
  for (const m of MEASUREMENTS) {
    if (!json) process.stdout.write(`running ${m.name}: ${m.describe} ...\n`);
    const figures = await m.run();
    for (const [k, v] of Object.entries(figures)) {
      all[k] = v;
      rows.push([m.name, k, String(v)]);
    }
  }
  if (json) {
    process.stdout.write(`${JSON.stringify(all)}\n`);
    return;
  }
  const w = [0, 1, 2].map((i) => Math.max(...rows.map((r) => r[i].length), ['group', 'measure', 'value'][i].length));
  const line = (r: string[]) => r.map((c, i) => (i === 2 ? c.padStart(w[i]) : c.padEnd(w[i]))).join('  ');
  process.stdout.write(`\n${line(['group', 'measure', 'value'])}\n${w.map((n) => '-'.repeat(n)).join('  ')}\n`);
  for (const r of rows) process.stdout.write(`${line(r)}\n`);
  // [key, target, direction]: 'min' means the figure must reach the target, 'max' stay under it.
  const targets = [
    ['engine_vs_baseline_1000', 0.5, 'min'],
    ['engine_vs_baseline_10000', 0.5, 'min'],
    ['cell_realtime_factor', 5000, 'min'],
    ['workspace_first_load_kb', 300, 'max'],
    ['canvas_fps_500_blocks', 50, 'min'],
    ['regrade_10min_ms', 500, 'max'],
    ['batch_p95_ms_50_clients', 100, 'max'],
    ['health_worst_ms_under_abuse', 250, 'max'],
    ['diff_ms_10000_blocks', 200, 'max'],
    ['proof_ms_20_rules_32_inputs', 1000, 'max'],
  ] as const;
  process.stdout.write('\ntargets:\n');
  for (const [k, t, dir] of targets) {
    if (all[k] === undefined) {
      process.stdout.write(`  ${k}: not measured (see the messages above)\n`);
      continue;
    }
    const met = dir === 'min' ? all[k] >= t : all[k] <= t;
    process.stdout.write(`  ${k} ${dir === 'min' ? '≥' : '≤'} ${t}: ${met ? 'met' : 'NOT met'} (${all[k]})\n`);
  }
}

// Run when executed (`npm run bench`), not when imported by a later measurement script.
if (process.argv[1]?.endsWith('run.ts')) void main();
