import { describe, expect, it } from 'vitest';
import { pickAndPlaceCell } from '@/simulator/demo';
import { diffCommand, type DiffCliIo } from './cli';
import { diffCells, IO_CHANGE_COLUMNS, type CellDiff } from './index';
import { changeoverProposal, parsedCell } from './test-helpers';

/** An in-memory host: files by name, captured streams. */
function host(files: Record<string, string>) {
  const out: string[] = [];
  const err: string[] = [];
  const io: DiffCliIo = {
    readText: (p) => {
      if (!(p in files)) throw new Error(`ENOENT: no such file, open '${p}'`);
      return files[p];
    },
    stdout: (t) => out.push(t),
    stderr: (t) => err.push(t),
  };
  return { io, out: () => out.join(''), err: () => err.join('') };
}

const base = parsedCell();
const proposed = changeoverProposal(base);
const files = {
  // As written (defaults omitted): the command parses it like the runner does.
  'base.json': JSON.stringify(pickAndPlaceCell),
  'proposed.json': JSON.stringify(proposed),
  'broken.json': '{ "schemaVersion": 1,',
  'not-a-cell.json': JSON.stringify({ schemaVersion: 1, id: 'x', panel: 'none' }),
};

describe('diff command', () => {
  it('prints { ok, diff } as JSON and exits 0', () => {
    const h = host(files);
    expect(diffCommand(['base.json', 'proposed.json'], h.io)).toBe(0);
    const body = JSON.parse(h.out()) as { ok: boolean; diff: CellDiff };
    expect(body.ok).toBe(true);
    expect(body.diff).toEqual(JSON.parse(JSON.stringify(diffCells(base, proposed))));
    expect(body.diff.summary.identical).toBe(false);
    expect(h.err()).toBe('');
  });

  it('identical files: exit 0 with an empty diff', () => {
    const h = host(files);
    expect(diffCommand(['base.json', 'base.json'], h.io)).toBe(0);
    expect((JSON.parse(h.out()) as { diff: CellDiff }).diff.summary).toMatchObject({ identical: true, total: 0 });
  });

  it('--io-sheet prints the change sheet CSV', () => {
    const h = host(files);
    expect(diffCommand(['base.json', 'proposed.json', '--io-sheet'], h.io)).toBe(0);
    const lines = h.out().trim().split('\r\n');
    expect(lines[0]).toBe(IO_CHANGE_COLUMNS.map((c) => c.title).join(','));
    expect(lines.some((l) => l.startsWith('add,DI7,Guards closed,'))).toBe(true);
  });

  it('exit 1 with every problem when a document is not a cell document', () => {
    const h = host(files);
    expect(diffCommand(['base.json', 'not-a-cell.json'], h.io)).toBe(1);
    const body = JSON.parse(h.out()) as { ok: boolean; problems: { document: string; at: string }[] };
    expect(body.ok).toBe(false);
    expect(new Set(body.problems.map((p) => p.document))).toEqual(new Set(['proposed']));
    expect(body.problems.map((p) => p.at)).toEqual(expect.arrayContaining(['panel', 'name', 'controller']));
  });

  it('exit 2 on a missing file, on a file that is not JSON, and on bad usage', () => {
    for (const argv of [['base.json', 'missing.json'], ['broken.json', 'base.json']]) {
      const h = host(files);
      expect(diffCommand(argv, h.io)).toBe(2);
      expect((JSON.parse(h.out()) as { problems: { code: string }[] }).problems[0].code).toMatch(/unreadable_file|invalid_json/);
    }
    for (const argv of [[], ['base.json'], ['a', 'b', 'c'], ['base.json', 'proposed.json', '--frobnicate']]) {
      const h = host(files);
      expect(diffCommand(argv, h.io)).toBe(2);
      expect(h.err()).toContain('usage:');
      expect(h.out()).toBe('');
    }
  });
});
