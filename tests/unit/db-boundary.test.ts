/**
 * The data layer sits below lib/ (DEVELOPERS.md, "Layout and boundaries"; ESLint's dataLayer and
 * storedTypes blocks say the same for the editor): db/ takes no type or rule from lib/, stored
 * shapes live in db/types/, and the two lib/ modules db/ may read (the configuration and the
 * object-store client) are leaves that reach nothing else of the app, so no arrow runs from
 * db/ through lib/ and back.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '../..');

function files(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(join(ROOT, dir))) {
    const p = join(dir, name);
    if (statSync(join(ROOT, p)).isDirectory()) files(p, out);
    else if (/\.ts$/.test(name) && !name.endsWith('.d.ts')) out.push(p);
  }
  return out;
}

/** Module specifiers a file imports or re-exports (type-only ones too), comments left out. */
function imports(file: string): string[] {
  const text = readFileSync(join(ROOT, file), 'utf8').replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
  const re = /(?:^|[\s;])(?:import|export)\s[^'"`;]*?from\s*['"]([^'"]+)['"]|import\s*\(\s*['"]([^'"]+)['"]\s*\)|^import\s+['"]([^'"]+)['"]/gm;
  return [...text.matchAll(re)].map((m) => m[1] ?? m[2] ?? m[3]);
}

/** What db/ may read from lib/: the configuration and the object store (lib/storage/, also used by a migration that moves stored bytes). */
const ALLOWED_FROM_LIB = /^(@\/|(\.\.\/)+)lib\/(env|storage\/[\w-]+)$/;

/** The repository path an `@/` or relative specifier of `from` names (without extension), or null for a package. */
function target(from: string, spec: string): string | null {
  if (spec.startsWith('@/')) return spec.slice(2);
  if (spec.startsWith('.')) return relative(ROOT, resolve(ROOT, from, '..', spec));
  return null;
}

describe('db/ sits below lib/', () => {
  const dataFiles = files('db').filter((f) => !f.startsWith('db/seeds/') && !f.startsWith('db/scripts/'));

  it('reads the whole data layer', () => {
    expect(dataFiles.length).toBeGreaterThan(20);
    expect(dataFiles).toContain('db/types/users.ts');
  });

  it('takes nothing from lib/ but the configuration and the object store', () => {
    const upward = dataFiles.flatMap((f) => imports(f).filter((s) => /^@\/lib(\/|$)|^(\.\.\/)+lib\//.test(s) && !ALLOWED_FROM_LIB.test(s)).map((s) => `${f} → ${s}`));
    expect(upward).toEqual([]);
  });

  it('keeps db/types/ below both: only its own files and the engine', () => {
    const out = files('db/types').flatMap((f) => imports(f).filter((s) => !s.startsWith('./') && s !== '@/simulator').map((s) => `${f} → ${s}`));
    expect(out).toEqual([]);
  });

  it('lets db/ read only lib/ modules that reach nothing else of the app', () => {
    const leaves = ['lib/env.ts', ...files('lib/storage').filter((f) => !f.endsWith('.test.ts'))];
    const out = leaves.flatMap((f) =>
      imports(f)
        .filter((s) => {
          const to = target(f, s);
          return to !== null && to !== 'lib/env' && !to.startsWith('lib/storage/');
        })
        .map((s) => `${f} → ${s}`),
    );
    expect(out).toEqual([]);
  });
});
