import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import Piscina from 'piscina';
import { afterAll, describe, expect, it } from 'vitest';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { buildBundle, ENGINE_WORKER } from './bundle';

const dir = mkdtempSync(path.join(tmpdir(), 'cw-worker-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the engine worker bundle', () => {
  it('builds and runs a live task and a grade in a real worker thread (every dependency loads in the bundle)', async () => {
    process.env.ENGINE_WORKER_FILE = path.join(dir, 'engine-worker.mjs');
    const file = buildBundle(ENGINE_WORKER);
    delete process.env.ENGINE_WORKER_FILE;
    const pool = new Piscina({ filename: pathToFileURL(file).href, minThreads: 1, maxThreads: 1 });
    try {
      const document = cellDocumentSchema.parse(pickAndPlaceCell);
      const load = { context: { document, seed: 3, faults: [] }, events: [], untilMs: 0, lastSeq: 0, downloads: 0 };
      const view = await pool.run({ op: 'view', runId: 'bundle-a', atLeastSeq: 0, targetMs: 2000, budgetMs: 5000, cacheBytes: 64 * 1024 * 1024, load }, { name: 'live' });
      expect(view.kind).toBe('ok');
      expect(view.snapshot.timeMs).toBe(2000);
      const graded = await pool.run({ kind: 'practice', context: { document, seed: 3, faults: [] }, events: [], endedMs: 2000 }, { name: 'grade' });
      expect(graded.ok).toBe(true);
      expect(graded.value.traceHash).toMatch(/^[0-9a-f]+$/);
    } finally {
      await pool.destroy();
    }
  }, 60_000);
});
