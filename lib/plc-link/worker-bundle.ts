/**
 * The PLC-link worker thread's bundle: lib/plc-link/link-worker.ts built by esbuild into one ES
 * module Node loads in a worker thread (Next.js does not bundle a file a worker loads by path;
 * lib/runs/worker-bundle.ts does the same for the engine's pool). modbus-serial stays outside
 * the bundle and is loaded from node_modules at run time (its optional serial-port binding is
 * never needed for Modbus TCP).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';

/** The bundled worker: `.local/build/plc-link-worker.mjs` in the checkout. */
export function linkWorkerPath(cwd = process.cwd()): string {
  return path.join(cwd, '.local', 'build', 'plc-link-worker.mjs');
}

/** Builds the bundle (about 0.1 s); returns its path. */
export function buildLinkWorker(cwd = process.cwd()): string {
  const out = linkWorkerPath(cwd);
  mkdirSync(/*turbopackIgnore: true*/ path.dirname(out), { recursive: true });
  execFileSync(
    /*turbopackIgnore: true*/ path.join(cwd, 'node_modules', 'esbuild', 'bin', 'esbuild'),
    [
      path.join(cwd, 'lib', 'plc-link', 'link-worker.ts'),
      '--bundle',
      '--platform=node',
      '--format=esm',
      '--target=node20',
      '--external:modbus-serial',
      "--banner:js=import { createRequire as __cellwrightRequire } from 'node:module'; const require = __cellwrightRequire(import.meta.url);",
      `--tsconfig=${path.join(cwd, 'tsconfig.json')}`,
      `--outfile=${out}`,
      '--log-level=warning',
    ],
    { cwd, stdio: ['ignore', 'inherit', 'inherit'] },
  );
  return out;
}

/** The bundle's path, building it when missing (and once per process outside production). */
export function ensureLinkWorker(rebuild: boolean, cwd = process.cwd()): string {
  const out = linkWorkerPath(cwd);
  return !rebuild && existsSync(/*turbopackIgnore: true*/ out) ? out : buildLinkWorker(cwd);
}
