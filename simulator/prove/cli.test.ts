/**
 * The headless `prove` command with files and output held in memory: exit codes, JSON
 * output, and the replay events carried by a violated verdict.
 */
import { describe, expect, it } from 'vitest';
import { proveCommand, type ProveIo } from './cli';
import { cellWithSheet, estopWiredNc, estopWiredNo } from './test-cells';

function io(files: Record<string, string>) {
  const out: string[] = [];
  const err: string[] = [];
  const value: ProveIo = {
    readFile: (path) => {
      if (!(path in files)) throw new Error('ENOENT: no such file');
      return files[path];
    },
    stdout: (t) => out.push(t),
    stderr: (t) => err.push(t),
  };
  return { io: value, json: () => JSON.parse(out.join('')), err: () => err.join('') };
}

const rules = JSON.stringify([
  { id: 'estop', title: 'Start only with the e-stop chain healthy', kind: 'only-if', what: { signal: '%QX0.1', value: 'on' }, requires: [{ signal: '%IX0.3', value: 'on' }] },
]);

describe('prove command', () => {
  it('exits 1 on a violation and prints the verdict with its replay events', () => {
    const t = io({ 'cell.json': JSON.stringify(cellWithSheet(estopWiredNo)), 'rules.json': rules });
    expect(proveCommand(['cell.json', 'rules.json'], t.io)).toBe(1);
    const body = t.json();
    expect(body.ok).toBe(false);
    expect(body.summary).toEqual({ proved: 0, violated: 1, undecided: 0 });
    expect(body.verdicts[0].status).toBe('violated');
    expect(body.verdicts[0].events[0]).toMatchObject({ t: 0, event: { type: 'force' } });
  });
  it('exits 0 when every rule is proved; options and --rules are read', () => {
    const t = io({ 'cell.json': JSON.stringify(cellWithSheet(estopWiredNc)), 'r.json': rules });
    expect(proveCommand(['cell.json', '--rules', 'r.json', '--max-depth', '5', '--budget', '100000'], t.io)).toBe(0);
    expect(t.json()).toMatchObject({ ok: true, summary: { proved: 1, violated: 0, undecided: 0 } });
  });
  it('exits 1 with paths for invalid rules, 2 for usage errors and unreadable or non-JSON files', () => {
    const bad = io({ 'cell.json': JSON.stringify(cellWithSheet(estopWiredNc)), 'rules.json': '[{"id":"x","kind":"never"}]' });
    expect(proveCommand(['cell.json', 'rules.json'], bad.io)).toBe(1);
    expect(bad.json().problems.map((p: { at: string }) => p.at)).toEqual(expect.arrayContaining(['rules.0.title', 'rules.0.what', 'rules.0.while']));
    expect(proveCommand(['cell.json'], io({}).io)).toBe(2);
    expect(proveCommand(['cell.json', 'rules.json', '--max-depth', 'deep'], io({}).io)).toBe(2);
    expect(proveCommand(['cell.json', 'rules.json', '--frobnicate', '1'], io({}).io)).toBe(2);
    const missing = io({ 'rules.json': rules });
    expect(proveCommand(['cell.json', 'rules.json'], missing.io)).toBe(2);
    expect(missing.json().problems[0].code).toBe('unreadable_file');
    const notJson = io({ 'cell.json': '{', 'rules.json': rules });
    expect(proveCommand(['cell.json', 'rules.json'], notJson.io)).toBe(2);
    expect(notJson.json().problems[0].code).toBe('invalid_json');
  });
});
