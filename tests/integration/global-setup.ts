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
  for (let i = 0; i < 150 && !(await portOpen(port)); i++) await new Promise((r) => setTimeout(r, 100));
  if (!(await portOpen(port))) throw new Error('the mail catcher did not start');
}

export async function teardown(): Promise<void> {
  if (catcher?.pid && catcher.exitCode === null) {
    const exited = new Promise((r) => catcher!.once('exit', r));
    process.kill(-catcher.pid, 'SIGTERM');
    await exited;
  }
}
