import { execFileSync, spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { connect } from 'node:net';
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
let objectStore: ChildProcess | undefined;

async function waitForPort(port: number, what: string): Promise<void> {
  for (let i = 0; i < 150 && !(await portOpen(port)); i++) await new Promise((r) => setTimeout(r, 100));
  if (!(await portOpen(port))) throw new Error(`the ${what} did not start`);
}

async function stop(child: ChildProcess | undefined): Promise<void> {
  if (child?.pid && child.exitCode === null) {
    const exited = new Promise((r) => child.once('exit', r));
    process.kill(-child.pid, 'SIGTERM');
    await exited;
  }
}

/**
 * Before all integration files: the cluster runs, the test database is emptied,
 * migrated and seeded with the demo, and a real SMTP catcher process listens
 * on the test port and stores mail in the test database.
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
  await waitForPort(port, 'mail catcher');

  // The S3 fake (scripts/object-store.ts, as start.sh runs it) on the tests' own port, its
  // files in a git-ignored folder of their own, emptied now and when it stops.
  const s3Port = Number(new URL(TEST_ENV.S3_ENDPOINT).port);
  if (await portOpen(s3Port)) throw new Error(`port ${s3Port} is taken; the integration S3 fake needs it (TEST_S3_PORT picks another)`);
  objectStore = spawn('node_modules/.bin/tsx', ['--conditions=react-server', 'scripts/object-store.ts'], {
    env: { ...process.env, ...TEST_ENV, S3_FAKE_DIR: `.local/s3-integration-${s3Port}`, S3_FAKE_RESET: '1' },
    stdio: 'ignore',
    detached: true,
  });
  await waitForPort(s3Port, 'S3 fake');
}

export async function teardown(): Promise<void> {
  await stop(catcher);
  await stop(objectStore);
}
