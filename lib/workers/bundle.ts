/**
 * Worker-thread code that the server loads by path, built by esbuild (already installed as
 * tsx's compiler) into one ES module each. Next.js bundles the app's server code but not a file
 * a worker thread loads by path, so each worker gets this small build step: the engine's pool
 * (lib/runs/engine-worker.ts) and a PLC link's thread (lib/plc-link/link-worker.ts). Used by
 * scripts/build-engine-worker.ts (run by start.sh and test.sh before `next build`) and by the
 * hosts, which build a bundle when it is missing (and once per process outside production).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';

export interface WorkerBundle {
  /** Source entry, relative to the checkout. */
  entry: string;
  /** Output file name in `.local/build/`. */
  file: string;
  /** Environment variable that overrides the output path (tests). */
  envPath?: string;
  /** Packages loaded from node_modules at run time instead of bundled. */
  external?: string[];
}

export const ENGINE_WORKER: WorkerBundle = { entry: 'lib/runs/engine-worker.ts', file: 'engine-worker.mjs', envPath: 'ENGINE_WORKER_FILE' };
// modbus-serial stays outside: its optional serial-port binding is never needed for Modbus TCP.
export const PLC_LINK_WORKER: WorkerBundle = { entry: 'lib/plc-link/link-worker.ts', file: 'plc-link-worker.mjs', external: ['modbus-serial'] };

/** Where a bundle is written: its override variable, else `.local/build/<file>` in the checkout. */
export function bundlePath(b: WorkerBundle, cwd = process.cwd()): string {
  return (b.envPath && process.env[b.envPath]) || path.join(cwd, '.local', 'build', b.file);
}

/** Builds a bundle (about 0.1 s); returns its path. */
export function buildBundle(b: WorkerBundle, cwd = process.cwd()): string {
  const out = bundlePath(b, cwd);
  mkdirSync(/*turbopackIgnore: true*/ path.dirname(out), { recursive: true });
  execFileSync(
    /*turbopackIgnore: true*/ path.join(cwd, 'node_modules', 'esbuild', 'bin', 'esbuild'),
    [
      path.join(cwd, b.entry),
      '--bundle',
      '--platform=node',
      '--format=esm',
      '--target=node20',
      ...(b.external ?? []).map((x) => `--external:${x}`),
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

/** The bundle's path, building it first when it is missing or `rebuild` asks. */
export function ensureBundle(b: WorkerBundle, rebuild = false, cwd = process.cwd()): string {
  const out = bundlePath(b, cwd);
  return !rebuild && existsSync(/*turbopackIgnore: true*/ out) ? out : buildBundle(b, cwd);
}
