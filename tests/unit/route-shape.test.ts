/**
 * Every route handler has the one shape (DEVELOPERS.md, "Route handlers"): it is wrapped in
 * `apiRoute`, so every failure it throws becomes `{ error, fields?, ...extra }`, and it never
 * builds an error answer by hand. Read from the source text, so a new route cannot slip past.
 * tests/integration/error-shape.test.ts checks the answers themselves.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '../..');
const METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS'];

/**
 * Handlers that answer outside the error shape on purpose: health reports its own state (a
 * 503 there is a report for load balancers, not a refused request); next-auth's GET is
 * next-auth's own (its POST goes through apiRoute for the body cap and the cross-site check).
 */
const OUTSIDE = new Set(['app/api/health/route.ts GET', 'app/api/auth/[...nextauth]/route.ts GET']);

function routeFiles(): string[] {
  return (readdirSync(join(ROOT, 'app/api'), { recursive: true }) as string[]).filter((f) => f.endsWith('route.ts')).map((f) => `app/api/${f}`);
}

function sourceFiles(dir: string): string[] {
  return (readdirSync(join(ROOT, dir), { recursive: true }) as string[]).filter((f) => /\.tsx?$/.test(f) && !/\.test\.tsx?$/.test(f)).map((f) => `${dir}/${f}`);
}

const text = (f: string) => readFileSync(join(ROOT, f), 'utf8').replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');

describe('route handlers', () => {
  const files = routeFiles();

  it('are all read', () => {
    expect(files.length).toBeGreaterThan(70);
  });

  it('are each wrapped in apiRoute', () => {
    const bare: string[] = [];
    for (const f of files) {
      const src = text(f);
      for (const m of METHODS) {
        const declared = new RegExp(`export (const|async function|function) ${m}\\b`).test(src);
        if (!declared || OUTSIDE.has(`${f} ${m}`)) continue;
        if (!new RegExp(`export const ${m} = apiRoute\\(`).test(src)) bare.push(`${f} ${m}`);
      }
    }
    expect(bare).toEqual([]);
  });

  it('read params, query and body only through the shared parsers', () => {
    const raw: string[] = [];
    for (const f of files) {
      const src = text(f);
      for (const [what, re] of [
        ['the query string', /searchParams/],
        ['the body', /\breq\.(json|text|formData|arrayBuffer|blob)\(/],
      ] as const) {
        if (re.test(src)) raw.push(`${f} reads ${what} itself`);
      }
    }
    expect(raw).toEqual([]);
  });

  it('never build an error answer by hand (throw ApiError instead)', () => {
    const handBuilt: string[] = [];
    for (const f of [...files, ...sourceFiles('lib')]) {
      const src = text(f);
      if (f === 'lib/api/errors.ts') continue; // errorResponse: the one place the shape is written
      if (/Response\.json\(\s*\{\s*error\s*:/.test(src)) handBuilt.push(`${f}: Response.json({ error … })`);
      if (/status:\s*(4\d\d|5\d\d)\b/.test(src) && !OUTSIDE.has(`${f} GET`)) handBuilt.push(`${f}: an error status set by hand`);
    }
    expect(handBuilt).toEqual([]);
  });
});
