/**
 * The import graph's shape (shared/STYLE.md): no import circles anywhere in the source, and
 * no arrow from simulator/ up into the app (lib/, db/, components/, app/, scripts/, tests/).
 * In the UI (components/, app/) folders are modules too: no circle between folders either, and
 * the cell workspace keeps its layers (base → areas → shell, see WORKSPACE_AREAS below).
 * Imports are read from the source text (static `import … from`, `export … from` and
 * `import('…')`), type-only ones included: a circle of types is still a circle for a reader.
 */
import { readdirSync, readFileSync, statSync, existsSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '../..');
const DIRS = ['app', 'components', 'lib', 'db', 'simulator', 'scripts', 'tests'];
const SKIP = /(^|\/)(node_modules|\.next[^/]*|test-results|playwright-report)(\/|$)/;

function sources(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (SKIP.test(relative(ROOT, p))) continue;
    if (statSync(p).isDirectory()) sources(p, out);
    else if (/\.(ts|tsx|mjs)$/.test(name) && !name.endsWith('.d.ts')) out.push(relative(ROOT, p));
  }
  return out;
}

function resolveImport(from: string, spec: string): string | null {
  let base: string;
  if (spec.startsWith('@/')) base = join(ROOT, spec.slice(2));
  else if (spec.startsWith('.')) base = resolve(ROOT, dirname(from), spec);
  else return null;
  for (const cand of [base, `${base}.ts`, `${base}.tsx`, `${base}.mjs`, join(base, 'index.ts'), join(base, 'index.tsx')]) {
    if (existsSync(cand) && statSync(cand).isFile()) return relative(ROOT, cand);
  }
  return null;
}

/** File → the files it imports. */
function graph(): Map<string, string[]> {
  const g = new Map<string, string[]>();
  const files = DIRS.filter((d) => existsSync(join(ROOT, d))).flatMap((d) => sources(join(ROOT, d)));
  const re = /(?:^|[\s;])(?:import|export)\s[^'"`;]*?from\s*['"]([^'"]+)['"]|import\s*\(\s*['"]([^'"]+)['"]\s*\)|^import\s+['"]([^'"]+)['"]/gm;
  for (const f of files) {
    const text = readFileSync(join(ROOT, f), 'utf8').replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
    const deps = new Set<string>();
    for (const m of text.matchAll(re)) {
      const to = resolveImport(f, m[1] ?? m[2] ?? m[3]);
      if (to) deps.add(to);
    }
    g.set(f, [...deps]);
  }
  return g;
}

/** Every strongly connected component with more than one file (or a file importing itself). */
function circles(g: Map<string, string[]>): string[][] {
  let index = 0;
  const idx = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const on = new Set<string>();
  const out: string[][] = [];
  const visit = (v: string) => {
    idx.set(v, index);
    low.set(v, index++);
    stack.push(v);
    on.add(v);
    for (const w of g.get(v) ?? []) {
      if (!idx.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (on.has(w)) low.set(v, Math.min(low.get(v)!, idx.get(w)!));
    }
    if (low.get(v) === idx.get(v)) {
      const comp: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        on.delete(w);
        comp.push(w);
      } while (w !== v);
      if (comp.length > 1 || (g.get(v) ?? []).includes(v)) out.push(comp.sort());
    }
  };
  for (const v of g.keys()) if (!idx.has(v)) visit(v);
  return out;
}

/** Folder → the other folders its files import (a file's folder is its module). */
function folderGraph(g: Map<string, string[]>, keep: (file: string) => boolean): Map<string, string[]> {
  const out = new Map<string, Set<string>>();
  for (const [f, deps] of g) {
    if (!keep(f)) continue;
    const from = dirname(f);
    if (!out.has(from)) out.set(from, new Set());
    for (const d of deps) if (keep(d) && dirname(d) !== from) out.get(from)!.add(dirname(d));
  }
  return new Map([...out].map(([k, v]) => [k, [...v]]));
}

/**
 * The workspace's layers (DEVELOPERS.md, "Workspace"): the base (components/workspace/) under
 * the six areas, each area in its own folder, and the shell (components/workspace/shell/) over them.
 */
const WORKSPACE_BASE = 'components/workspace';
const WORKSPACE_SHELL = 'components/workspace/shell';
const WORKSPACE_AREAS = ['panel', 'field', 'logic', 'controller', 'monitor', 'scope'].map((a) => `components/${a}`);

describe('import graph', () => {
  const g = graph();

  it('has no circles', () => {
    expect(g.size).toBeGreaterThan(300); // the whole source was read
    expect(circles(g)).toEqual([]);
  });

  it('has no arrow from simulator/ upward into the app', () => {
    const upward: string[] = [];
    for (const [f, deps] of g) if (f.startsWith('simulator/')) for (const d of deps) if (!d.startsWith('simulator/')) upward.push(`${f} → ${d}`);
    expect(upward).toEqual([]);
  });

  it('reaches the engine only through simulator/index.ts from outside it', () => {
    const past: string[] = [];
    for (const [f, deps] of g) if (!f.startsWith('simulator/')) for (const d of deps) if (d.startsWith('simulator/') && d !== 'simulator/index.ts') past.push(`${f} → ${d}`);
    expect(past).toEqual([]);
  });

  it('has no circles between UI folders (components/, app/)', () => {
    const ui = (f: string) => f.startsWith('components/') || f.startsWith('app/');
    expect(circles(folderGraph(g, ui))).toEqual([]);
  });

  it('keeps the workspace base below the areas and the shell, and the areas apart', () => {
    const wrong: string[] = [];
    for (const [f, deps] of g) {
      const from = dirname(f);
      for (const d of deps) {
        const to = dirname(d);
        if (from === WORKSPACE_BASE && (to === WORKSPACE_SHELL || WORKSPACE_AREAS.includes(to))) wrong.push(`base ${f} → ${d}`);
        if (WORKSPACE_AREAS.includes(from) && (to === WORKSPACE_SHELL || (WORKSPACE_AREAS.includes(to) && to !== from))) wrong.push(`area ${f} → ${d}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('gives every workspace area the same shape: a layout, one use-<area> hook, its leaves', () => {
    const missing: string[] = [];
    for (const area of WORKSPACE_AREAS) {
      const name = area.slice('components/'.length);
      for (const file of [`${area}/${name}-area.tsx`, `${area}/use-${name}.ts`]) if (!g.has(file)) missing.push(file);
    }
    expect(missing).toEqual([]);
  });

  it('reads the store in an area through its use-<area> hook only', () => {
    // The base modules that read the workspace store: the contract's hooks and the hooks built on them.
    const storeReaders = ['contract.ts', 'store.ts', 'use-related.ts', 'use-signal-labels.ts', 'use-area-problems.ts'].map((f) => `${WORKSPACE_BASE}/${f}`);
    const direct: string[] = [];
    for (const area of WORKSPACE_AREAS) {
      const hook = `${area}/use-${area.slice('components/'.length)}.ts`;
      for (const [f, deps] of g) if (dirname(f) === area && f !== hook && deps.some((d) => storeReaders.includes(d))) direct.push(`${f} → ${deps.filter((d) => storeReaders.includes(d)).join(', ')}`);
    }
    expect(direct).toEqual([]);
  });
});
