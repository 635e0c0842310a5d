/**
 * The engine's own bench groups only ("logic sheets" and "demo cell" of `npm run bench`),
 * without the browser and server measurements that need a running app. Each group runs
 * `--repeat <n>` times (default 1) and the median of every figure is printed as one JSON line.
 *
 * Run: `npx tsx tests/bench/engine-groups.ts [--repeat 3] [--only "demo cell"]`.
 */
import { MEASUREMENTS } from './run';
import { median } from './bench-support';

const ENGINE_GROUPS = ['logic sheets', 'demo cell'];

async function main(): Promise<void> {
  const i = process.argv.indexOf('--repeat');
  const repeat = i >= 0 ? Math.max(1, Number(process.argv[i + 1]) || 1) : 1;
  const o = process.argv.indexOf('--only');
  const groups = o >= 0 ? [process.argv[o + 1]] : ENGINE_GROUPS;
  const all: Record<string, number[]> = {};
  for (const m of MEASUREMENTS.filter((x) => groups.includes(x.name) && ENGINE_GROUPS.includes(x.name))) {
    for (let r = 0; r < repeat; r++) {
      const figures = await m.run();
      for (const [k, v] of Object.entries(figures)) (all[k] ??= []).push(v);
    }
  }
  const out: Record<string, number> = {};
  for (const [k, vs] of Object.entries(all)) out[k] = median(vs);
  process.stdout.write(`${JSON.stringify(out)}\n`);
}

void main();
