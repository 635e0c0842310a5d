/**
 * Changeover-diff benchmark (not a timed test: the numbers depend on the machine).
 *
 * - `diff_ms_10000_blocks`: `diffCells(base, proposed)` on two versions of the pick-and-place
 *   demo cell whose logic sheet is the generated 10,000-block sheet of sheet-bench.ts (1,000
 *   rungs, 10,000 connections). The proposed version differs in 1 % of the blocks, scattered
 *   over the sheet: 80 timer/counter presets changed, 10 blocks removed (with their
 *   connections) and 10 added (each wired in). Both versions are separate copies, as two
 *   versions read from the database are, so nothing is shared by reference. Median of 9 runs
 *   after 3 warm-up runs. Target ≤ 200 ms.
 *
 * Alone: `npx tsx tests/bench/diff-bench.ts` (add `--json` for one JSON line).
 */
import { cellDocumentSchema, diffCells, pickAndPlaceCell, type CellDocument } from '@/simulator';
import { median } from './bench-support';
import { generateSheet } from './sheet-bench';

const RUNGS = 1000; // 10 blocks per rung
const WARM_UP = 3;
const RUNS = 9;

/** Base and proposed cells with 10,000 blocks, differing in 100 of them (1 %). */
export function diffBenchCells(): { base: CellDocument; proposed: CellDocument; changedBlocks: number } {
  const base = cellDocumentSchema.parse({ ...structuredClone(pickAndPlaceCell), plc: { ...pickAndPlaceCell.plc, sheet: generateSheet(RUNGS) } });
  const proposed = structuredClone(base);
  const sheet = proposed.plc.sheet;
  let changed = 0;
  // Presets: every 125th block from block 3 that has a PT or PV (the TON and CTU of a rung).
  for (let i = 3; i < sheet.blocks.length && changed < 80; i += 125) {
    const b = sheet.blocks.find((x, k) => k >= i && (x.type === 'TON' || x.type === 'CTU'));
    if (b?.type === 'TON') b.params.PT += 5;
    else if (b?.type === 'CTU') b.params.PV += 1;
    if (b) changed++;
  }
  // Removed: the `done` coil of 10 rungs spread over the sheet, with the connection into it.
  const gone = new Set(Array.from({ length: 10 }, (_, k) => `r${50 + k * 97}_done`));
  sheet.blocks = sheet.blocks.filter((b) => !gone.has(b.id));
  sheet.connections = sheet.connections.filter((c) => !gone.has(c.to.block));
  // Added: a memory coil on 10 other rungs, fed from that rung's AND.
  for (let k = 0; k < 10; k++) {
    const r = 25 + k * 99;
    sheet.blocks.splice(r * 10, 0, { id: `r${r}_mem`, type: 'COIL', position: { x: 700, y: r * 60 }, params: { address: `%MX${100 + (r >> 3)}.${r & 7}` } });
    sheet.connections.push({ id: `r${r}_w11`, from: { block: `r${r}_and`, port: 'Q' }, to: { block: `r${r}_mem`, port: 'IN' } });
  }
  return { base, proposed, changedBlocks: changed + gone.size + 10 };
}

/** Median milliseconds of one 10,000-block cell diff. */
export function diffBench(): { diff_ms_10000_blocks: number } {
  const { base, proposed, changedBlocks } = diffBenchCells();
  if (changedBlocks !== 100) throw new Error(`diff bench: ${changedBlocks} blocks differ, not 100 (1 %)`);
  // The figure is only meaningful when the diff finds exactly the change made.
  const check = diffCells(base, proposed).summary.areas.logic;
  if (check.added !== 20 || check.removed !== 20 || check.changed !== 80) throw new Error(`diff bench: unexpected logic diff ${JSON.stringify(check)}`);
  for (let i = 0; i < WARM_UP; i++) diffCells(base, proposed);
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    diffCells(base, proposed);
    times.push(performance.now() - t0);
  }
  return { diff_ms_10000_blocks: Math.round(median(times) * 10) / 10 };
}

const isMain = typeof process !== 'undefined' && process.argv[1] !== undefined && /diff-bench\.ts$/.test(process.argv[1]);
if (isMain) {
  const r = diffBench();
  console.log(process.argv.includes('--json') ? JSON.stringify(r) : `cell diff, 10,000 blocks, 1 % changed: ${r.diff_ms_10000_blocks} ms (median of ${RUNS}; target ≤ 200)`);
}
