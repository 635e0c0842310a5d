/** Helpers of the job queue's tests: worker processes, waiting on a job row, reading a Server-Sent Events stream. */
import { spawn, type ChildProcess } from 'node:child_process';
import { getJob } from '@/lib/jobs/queue';
import type { JobRecord, JobState } from '@/lib/jobs/types';
import { TEST_ENV } from './test-env';

/** Waits until the job is in one of `states` (default: finished), reading its row; throws after `timeoutMs`. */
export async function waitForJob(id: string, states: readonly JobState[] = ['done', 'failed'], timeoutMs = 20_000): Promise<JobRecord> {
  const until = Date.now() + timeoutMs;
  let last: JobRecord | null = null;
  while (Date.now() < until) {
    last = await getJob(id);
    if (last && states.includes(last.state)) return last;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`job ${id} did not reach ${states.join('/')} within ${timeoutMs} ms (last: ${JSON.stringify(last)})`);
}

/** Waits until `check` holds for the job's row. */
export async function waitForJobWhere(id: string, check: (j: JobRecord) => boolean, timeoutMs = 20_000): Promise<JobRecord> {
  const until = Date.now() + timeoutMs;
  let last: JobRecord | null = null;
  while (Date.now() < until) {
    last = await getJob(id);
    if (last && check(last)) return last;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`job ${id} did not get there within ${timeoutMs} ms (last: ${JSON.stringify(last)})`);
}

export interface SseMessage {
  event: string;
  data: unknown;
}

/** Reads SSE messages from a response body as they arrive (comments and `retry:` lines skipped). */
export function sseReader(body: ReadableStream<Uint8Array>) {
  const reader = body.getReader();
  const decoder = new TextDecoder();
  let buffer = '';
  const queue: SseMessage[] = [];
  async function fill(): Promise<boolean> {
    const { done, value } = await reader.read();
    if (done) return false;
    buffer += decoder.decode(value, { stream: true });
    let cut: number;
    while ((cut = buffer.indexOf('\n\n')) >= 0) {
      const block = buffer.slice(0, cut);
      buffer = buffer.slice(cut + 2);
      let event = 'message';
      const data: string[] = [];
      for (const line of block.split('\n')) {
        if (line.startsWith('event: ')) event = line.slice(7);
        else if (line.startsWith('data: ')) data.push(line.slice(6));
      }
      if (data.length > 0) queue.push({ event, data: JSON.parse(data.join('\n')) });
    }
    return true;
  }
  return {
    /** The next message, waiting up to `timeoutMs`. */
    async next(timeoutMs = 20_000): Promise<SseMessage> {
      const until = Date.now() + timeoutMs;
      while (queue.length === 0) {
        const left = until - Date.now();
        if (left <= 0) throw new Error('no SSE message in time');
        const more = await Promise.race([fill(), new Promise<'timeout'>((r) => setTimeout(() => r('timeout'), left))]);
        if (more === false) throw new Error('the SSE stream ended');
      }
      return queue.shift()!;
    },
    /** Messages until `stop` holds for one (included). */
    async until(stop: (m: SseMessage) => boolean, timeoutMs = 30_000): Promise<SseMessage[]> {
      const until = Date.now() + timeoutMs;
      const out: SseMessage[] = [];
      for (;;) {
        const m = await this.next(Math.max(1, until - Date.now()));
        out.push(m);
        if (stop(m)) return out;
      }
    },
    cancel: () => reader.cancel().catch(() => undefined),
  };
}

/**
 * Starts a worker process in its own process group (so tsx and its node child stop together)
 * and resolves once it prints "[worker] ready". `script` is scripts/worker.ts (the real worker,
 * as start.sh and Playwright run it) or the tests' own jobs-test-worker.ts. Its log is shown
 * with TEST_WORKER_LOG=1.
 */
export async function startWorkerProcess(script: string, env: Record<string, string> = {}): Promise<ChildProcess> {
  const child = spawn('node_modules/.bin/tsx', ['--conditions=react-server', script], {
    env: { ...process.env, ...TEST_ENV, ...env },
    stdio: ['ignore', 'pipe', 'inherit'],
    detached: true,
  });
  let log = '';
  const ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${script} did not start within 60 s`)), 60_000);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`${script} exited during start-up (code ${code})`));
    });
    child.stdout!.on('data', (chunk: Buffer) => {
      // Read all along so the pipe never fills.
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
    await stopWorkerProcess(child, 'SIGKILL');
    throw err;
  }
  return child;
}

/** Sends `signal` to the worker's process group and waits for it to exit. */
export async function stopWorkerProcess(child: ChildProcess, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  if (!child.pid || child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  process.kill(-child.pid, signal);
  await exited;
}
