/**
 * Workspace benchmarks, measured in Debian's Chromium against a running, built app with its
 * database (not a timed test: the numbers depend on the machine).
 *
 * - `workspace_first_load_kb`: gzip size (KiB) of every script the workspace page of the demo
 *   pick-and-place cell loads on first load (each response body gzipped with node:zlib, summed).
 *   Target ≤ 300 (issue 4).
 * - `canvas_fps_500_blocks`: frames per second (requestAnimationFrame count over 4 s) of the
 *   Logic area showing a generated 500-block sheet while the cell runs at ×1. Target ≥ 50.
 *
 * How to run: start the app as in the README (`bash scripts/start.sh`, which builds, migrates
 * and seeds the demo data), then `BENCH_BASE_URL=http://127.0.0.1:3000 npm run bench -- --json`.
 * It signs in as the demo trainer (BENCH_EMAIL / BENCH_PASSWORD override), creates a scratch
 * cell for the 500-block sheet and deletes it afterwards. Without BENCH_BASE_URL, or when the
 * app does not answer, both measurements are skipped with a message and report nothing.
 *
 * Alone: `npx tsx tests/bench/workspace-bench.ts`.
 */
import { gzipSync } from 'node:zlib';
import { chromium, type Browser, type BrowserContext, type Page } from '@playwright/test';
import { CHROMIUM_LAUNCH_OPTIONS } from '../chromium';
import { reachableBase } from './bench-support';
import { generateSheet } from './sheet-bench';

type Figures = Record<string, number>;

const DEMO_EMAIL = process.env.BENCH_EMAIL ?? 'trainer@kestrelvale.test';
const DEMO_PASSWORD = process.env.BENCH_PASSWORD ?? 'trainer-demo-2026';
const DEMO_CELL = /pick and place/i;
const FPS_WINDOW_MS = 4000;

async function signedIn(base: string): Promise<{ browser: Browser; context: BrowserContext; page: Page }> {
  const browser = await chromium.launch(CHROMIUM_LAUNCH_OPTIONS);
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await page.goto(`${base}/sign-in`);
  await page.getByLabel('E-mail').fill(DEMO_EMAIL);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 60_000 });
  return { browser, context, page };
}

async function demoCellId(page: Page, base: string): Promise<string> {
  const r = await page.request.get(`${base}/api/cells`);
  const body = (await r.json()) as { cells?: { id: string; name: string }[]; shared?: { id: string; name: string }[] };
  const cell = [...(body.cells ?? []), ...(body.shared ?? [])].find((c) => DEMO_CELL.test(c.name));
  if (!cell) throw new Error('the demo pick-and-place cell is missing: seed the database (npm run db:seed)');
  return cell.id;
}

/** Gzip size of the scripts the workspace page loads first, in KiB (1 decimal). */
export async function measureWorkspaceFirstLoadKb(base: string): Promise<number> {
  const { browser, context, page } = await signedIn(base);
  try {
    const id = await demoCellId(page, base);
    // A fresh page with an empty cache, so every script of the first load is fetched.
    const fresh = await context.newPage();
    const bodies: Promise<number>[] = [];
    fresh.on('response', (res) => {
      if (res.request().resourceType() !== 'script') return;
      bodies.push(
        res
          .body()
          .then((b) => gzipSync(b).length)
          .catch(() => 0),
      );
    });
    await fresh.goto(`${base}/cells/${id}`, { waitUntil: 'networkidle', timeout: 120_000 });
    const sizes = await Promise.all(bodies);
    return Math.round((sizes.reduce((a, b) => a + b, 0) / 1024) * 10) / 10;
  } finally {
    await browser.close();
  }
}

/** Lays out the generated 10-block rungs on a grid so the canvas shows a realistic sheet. */
function sheet500() {
  const sheet = generateSheet(50);
  sheet.blocks = sheet.blocks.map((b, i) => ({ ...b, position: { x: (i % 10) * 200, y: Math.floor(i / 10) * 130 } }));
  return sheet;
}

/** requestAnimationFrame frames per second on the Logic area with 500 blocks running at ×1. */
export async function measureCanvasFps500Blocks(base: string): Promise<number> {
  const { browser, page } = await signedIn(base);
  let scratch: string | null = null;
  try {
    const created = await page.request.post(`${base}/api/cells`, { data: { name: 'Bench: 500-block sheet', template: 'pick-and-place' } });
    if (!created.ok()) throw new Error(`creating the scratch cell failed: ${created.status()}`);
    const cell = ((await created.json()) as { cell: { id: string } }).cell;
    scratch = cell.id;
    const v1 = await page.request.get(`${base}/api/cells/${cell.id}/versions/1`);
    const doc = v1.ok() ? ((await v1.json()) as { version?: { document?: Record<string, unknown> }; document?: Record<string, unknown> }) : null;
    const document = doc?.version?.document ?? doc?.document;
    if (!document) throw new Error('could not read the scratch cell document');
    const plc = document.plc as Record<string, unknown>;
    const saved = await page.request.post(`${base}/api/cells/${cell.id}/versions`, {
      data: { baseVersion: 1, message: 'bench sheet', document: { ...document, plc: { ...plc, sheet: sheet500() } } },
    });
    if (!saved.ok()) throw new Error(`saving the 500-block sheet failed: ${saved.status()} ${await saved.text()}`);

    await page.goto(`${base}/cells/${cell.id}`, { timeout: 120_000 });
    await page.getByRole('tab', { name: /logic/i }).click();
    await page.getByTestId('logic-area').waitFor({ timeout: 120_000 });
    await page.getByRole('button', { name: 'Run ×1', exact: true }).click({ timeout: 60_000 });
    await page.waitForTimeout(1000);
    // The page script is a string: tsx would otherwise wrap named arrow functions in an
    // `__name(...)` helper that does not exist inside the browser.
    const frames = (await page.evaluate(`new Promise((resolve) => {
      let n = 0;
      const t0 = performance.now();
      const tick = (t) => {
        n++;
        if (t - t0 < ${FPS_WINDOW_MS}) requestAnimationFrame(tick);
        else resolve((n * 1000) / (t - t0));
      };
      requestAnimationFrame(tick);
    })`)) as number;
    return Math.round(frames * 10) / 10;
  } finally {
    if (scratch) await page.request.delete(`${base}/api/cells/${scratch}`).catch(() => undefined);
    await browser.close();
  }
}

/** Both workspace measurements, or nothing (with the reason on stderr) when the app is not reachable. */
export async function workspaceBench(): Promise<Figures> {
  const target = await reachableBase();
  if (!target.ok) {
    process.stderr.write(`workspace bench skipped: ${target.reason}\n`);
    return {};
  }
  return {
    workspace_first_load_kb: await measureWorkspaceFirstLoadKb(target.base),
    canvas_fps_500_blocks: await measureCanvasFps500Blocks(target.base),
  };
}

if (process.argv[1] && import.meta.url === new URL(`file://${process.argv[1]}`).href) {
  workspaceBench().then(
    (f) => process.stdout.write(`${JSON.stringify(f)}\n`),
    (e: unknown) => {
      process.stderr.write(`${(e as Error).stack ?? String(e)}\n`);
      process.exit(1);
    },
  );
}
