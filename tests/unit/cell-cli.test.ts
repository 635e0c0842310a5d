import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ex = (f: string) => join('simulator/demo/examples', f);
function cli(...args: string[]) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/cell-cli/cell.ts', ...args], { encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

describe('headless runner', () => {
  it('validate: exit 0 on a good document, 1 with every problem and its path on a bad one', () => {
    expect(cli('validate', ex('pick-and-place.cell.json')).code).toBe(0);
    const dir = mkdtempSync(join(tmpdir(), 'cw-'));
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ schemaVersion: 1, id: '9bad', panel: 'none' }));
    const r = cli('validate', bad);
    expect(r.code).toBe(1);
    const body = JSON.parse(r.out) as { ok: boolean; problems: { at: string }[] };
    expect(body.ok).toBe(false);
    expect(body.problems.map((p) => p.at)).toEqual(expect.arrayContaining(['id', 'panel', 'name', 'controller']));
  }, 60_000);

  it('run: prints the trace and rule results; exit 1 when a rule fails; exit 2 on bad usage', () => {
    const pass = cli('run', ex('pick-and-place.cell.json'), '--events', ex('pick-and-place.events.json'), '--for', '30s', '--trace', 'ctl.state', '--rules', ex('pick-and-place.rules.json'));
    expect(pass.code).toBe(0);
    const body = JSON.parse(pass.out) as { ok: boolean; hash: string; trace: { signals: string[]; endMs: number } };
    expect(body.ok).toBe(true);
    expect(body.hash).toMatch(/^[0-9a-f]{16}$/);
    expect(body.trace.endMs).toBe(30_000);
    expect(body.trace.signals).toContain('ctl.state');
    const fail = cli('run', ex('pick-and-place.cell.json'), '--events', ex('pick-and-place.events.json'), '--for', '30s', '--rules', ex('failing.rules.json'));
    expect(fail.code).toBe(1);
    expect(JSON.parse(fail.out).rules[0].violation.timeMs).toBeGreaterThan(0);
    expect(cli('run', ex('pick-and-place.cell.json'), '--for', 'soon').code).toBe(2);
    expect(cli('frobnicate').code).toBe(2);
  }, 60_000);

  it('prove: the demo interlocks give one violation with its replay events (exit 1) and two proofs', () => {
    const r = cli('prove', ex('pick-and-place.cell.json'), ex('pick-and-place.interlocks.json'));
    expect(r.code).toBe(1);
    const body = JSON.parse(r.out) as { ok: boolean; summary: Record<string, number>; verdicts: { rule: string; status: string; events?: unknown[] }[] };
    expect(body.summary).toEqual({ proved: 2, violated: 1, undecided: 0 });
    const broken = body.verdicts.find((v) => v.rule === 'start-needs-guard')!;
    // The start pulse (TP, PT 100 ms) outlives a guard opened during it: IEC 61131-3 TP keeps Q for PT whatever IN does.
    expect(broken.status).toBe('violated');
    expect(broken.events?.length).toBeGreaterThan(0);
    expect(cli('prove', ex('pick-and-place.cell.json')).code).toBe(2);
  }, 120_000);

  it('diff: identical cells give an empty diff (exit 0); a proposal with another scan period names it', () => {
    const same = cli('diff', ex('pick-and-place.cell.json'), ex('pick-and-place.cell.json'));
    expect(same.code).toBe(0);
    expect((JSON.parse(same.out) as { diff: { summary: { identical: boolean } } }).diff.summary.identical).toBe(true);
    const dir = mkdtempSync(join(tmpdir(), 'cw-'));
    const doc = JSON.parse(readFileSync(ex('pick-and-place.cell.json'), 'utf8'));
    doc.plc.sheet.scanPeriodMs = 20;
    writeFileSync(join(dir, 'proposed.json'), JSON.stringify(doc));
    const changed = cli('diff', ex('pick-and-place.cell.json'), join(dir, 'proposed.json'));
    expect(changed.code).toBe(0);
    const diff = (JSON.parse(changed.out) as { diff: { summary: { identical: boolean; total: number } } }).diff;
    expect(diff.summary.identical).toBe(false);
    expect(changed.out).toContain('scanPeriodMs');
  }, 60_000);
});

describe('exported JSON Schemas', () => {
  it('docs/schema holds the current export (regenerate with `npm run cell -- schema docs/schema`)', async () => {
    const { cellJsonSchemas } = await import('@/scripts/cell-cli/json-schema');
    const { readFileSync } = await import('node:fs');
    const all = cellJsonSchemas();
    for (const [name, schema] of Object.entries(all)) {
      const file = JSON.parse(readFileSync(`docs/schema/${name}.schema.json`, 'utf8'));
      expect(file).toEqual(JSON.parse(JSON.stringify(schema)));
    }
    expect((all.cell as { required: string[] }).required).toEqual(expect.arrayContaining(['schemaVersion', 'panel', 'wiring', 'controller']));
  });
});
