import { execFileSync, spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { rmSync } from 'node:fs';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { resetTestDatabase } from '../../db/reset-test-database';
import { TEST_ENV, applyTestEnv } from './test-env';

function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = connect(port, '127.0.0.1');
    s.once('connect', () => {
      s.destroy();
      resolve(true);
    });
    s.once('error', () => resolve(false));
  });
}

let catcher: ChildProcess | undefined;
let worker: ChildProcess | undefined;
const WORKER_BUNDLE = path.join(tmpdir(), `cellwright-engine-worker-it-${process.pid}.mjs`);

/**
 * Starts the job worker (scripts/worker.ts) as its own process, as start.sh and Playwright do,
 * so route tests that queue work (a drill regrade) see it run in another process and reach the
 * browser's stream through LISTEN/NOTIFY. Tests of the queue's machinery (failures, retries,
 * a worker killed mid-job) run their own workers with their own job kinds (jobs.test.ts).
 * Resolves when it prints "[worker] ready".
 */
async function startWorkerProcess(): Promise<ChildProcess> {
  const child = spawn('node_modules/.bin/tsx', ['--conditions=react-server', 'scripts/worker.ts'], {
    env: {
      ...process.env,
      ...TEST_ENV,
      WORKER_POLL_SECONDS: '0.5',
      WORKER_MAINTENANCE_SECONDS: '2',
      WORKER_SHUTDOWN_GRACE_SECONDS: '2',
      // Its own engine bundle: the tests' process rebuilds the shared one while this one may load it.
      ENGINE_WORKER_FILE: WORKER_BUNDLE,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
    detached: true,
  });
  let log = '';
  const ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('the job worker did not start within 60 s')), 60_000);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the job worker exited during start-up (code ${code})`));
    });
    child.stdout!.on('data', (chunk: Buffer) => {
      // Read all along so the pipe never fills; shown only when asked (TEST_WORKER_LOG=1).
      if (process.env.TEST_WORKER_LOG) process.stderr.write(chunk);
      log = (log + chunk.toString()).slice(-4096);
      if (log.includes('[worker] ready')) {
        clearTimeout(timer);
        resolve();
      }
    });
  });
  try {
    await ready;
  } catch (err) {
    await stopGroup(child);
    throw err;
  }
  return child;
}

/**
 * Before all integration files: the cluster runs, the test database is emptied,
 * migrated and seeded with the demo, a real SMTP catcher process listens
 * on the test port and stores mail in the test database, and a job worker
 * process works the queue of the test database.
 */
export async function setup(): Promise<void> {
  applyTestEnv();
  execFileSync('bash', ['db/cluster.sh', 'start'], { stdio: 'ignore' });
  await resetTestDatabase(TEST_ENV.DATABASE_URL);

  const port = Number(TEST_ENV.SMTP_PORT);
  if (await portOpen(port)) throw new Error(`port ${port} is taken; the integration catcher needs it`);
  // Own process group, so teardown stops tsx and its node child together.
  catcher = spawn('node_modules/.bin/tsx', ['--conditions=react-server', 'scripts/mail-catcher.ts'], {
    env: { ...process.env, ...TEST_ENV },
    stdio: 'ignore',
    detached: true,
  });
  for (let i = 0; i < 150 && !(await portOpen(port)); i++) await new Promise((r) => setTimeout(r, 100));
  if (!(await portOpen(port))) throw new Error('the mail catcher did not start');
  try {
    worker = await startWorkerProcess();
  } catch (err) {
    await stopGroup(catcher);
    throw err;
  }
}

async function stopGroup(child: ChildProcess | undefined): Promise<void> {
  if (!child?.pid || child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise((r) => child.once('exit', r));
  process.kill(-child.pid, 'SIGTERM');
  await exited;
}

export async function teardown(): Promise<void> {
  await stopGroup(worker);
  await stopGroup(catcher);
  rmSync(WORKER_BUNDLE, { force: true });
}
