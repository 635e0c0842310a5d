/**
 * Where the engine's worker thread code lives and how it is built: lib/runs/engine-worker.ts
 * bundled by esbuild (already installed as tsx's compiler) into one ES module that Node
 * loads in a worker thread. Next.js bundles the app's server code but not a file a worker
 * thread loads by path, so the worker gets its own small build step. Used by the build script
 * (scripts/build-engine-worker.ts, run by start.sh and test.sh before `next build`) and by the
 * engine host, which builds it when it is missing (development, tests).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';

/** The bundled worker: ENGINE_WORKER_FILE, else `.local/build/engine-worker.mjs` in the checkout. */
export function workerBundlePath(cwd = process.cwd()): string {
  return process.env.ENGINE_WORKER_FILE || path.join(cwd, '.local', 'build', 'engine-worker.mjs');
}

/** Builds the worker bundle (about 0.1 s); returns its path. */
export function buildWorkerBundle(cwd = process.cwd()): string {
  const out = workerBundlePath(cwd);
  mkdirSync(/*turbopackIgnore: true*/ path.dirname(out), { recursive: true });
  execFileSync(
    /*turbopackIgnore: true*/ path.join(cwd, 'node_modules', 'esbuild', 'bin', 'esbuild'),
    [
      path.join(cwd, 'lib', 'runs', 'engine-worker.ts'),
      '--bundle',
      '--platform=node',
      '--format=esm',
      '--target=node20',
      // CommonJS dependencies bundled into an ES module still call require() for Node's own
      // modules (url, path ...): give the bundle a real require.
      "--banner:js=import { createRequire as __cellwrightRequire } from 'node:module'; const require = __cellwrightRequire(import.meta.url);",
      `--tsconfig=${path.join(cwd, 'tsconfig.json')}`,
      `--outfile=${out}`,
      '--log-level=warning',
    ],
    { cwd, stdio: ['ignore', 'inherit', 'inherit'] },
  );
  return out;
}

/** The bundle's path, building it first when it is missing. */
export function ensureWorkerBundle(cwd = process.cwd()): string {
  const out = workerBundlePath(cwd);
  return existsSync(/*turbopackIgnore: true*/ out) ? out : buildWorkerBundle(cwd);
}
