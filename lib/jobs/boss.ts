import 'server-only';
import PgBoss from 'pg-boss';
import type { Knex } from 'knex';
import { JOB_KINDS } from './types';
import { QUEUE_SCHEMA, expireInSeconds, settingsOf } from './settings';

/**
 * pg-boss, the queue's delivery: it hands each job to exactly one worker at a time (FOR UPDATE
 * SKIP LOCKED, so any number of worker processes on any number of machines can share it),
 * retries failed attempts and takes a job back from a worker that died. It keeps its own
 * tables in the `pgboss` schema and installs or upgrades them itself on start.
 */

/** What pg-boss carries for each job: our row's id, and the budget the worker applies. */
export interface Delivery {
  jobId: string;
  budgetSeconds: number;
}

/**
 * Creates the queues pg-boss needs for `kinds` (idempotent: an existing queue is left as it is).
 * Expiry and retries are set per job when it is sent, so a queue's own settings never matter.
 */
export async function ensureQueues(boss: PgBoss, kinds: readonly string[]): Promise<void> {
  for (const kind of kinds) await boss.createQueue(kind, { name: kind, policy: 'standard' });
}

/**
 * pg-boss's SQL (with `$1`-style parameters, some used twice) run on a Knex connection, so a
 * job's delivery is inserted in the same transaction as its row: both exist, or neither.
 */
function knexExecutor(k: Knex): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      if (text.includes('?')) throw new Error('pg-boss SQL with a "?" cannot be run through Knex bindings');
      const bindings: unknown[] = [];
      const sql = text.replace(/\$(\d+)/g, (_, n: string) => {
        bindings.push(values[Number(n) - 1] ?? null);
        return '?';
      });
      const out = await k.raw(sql, bindings as Knex.RawBinding[]);
      return { rows: (out as { rows: unknown[] }).rows };
    },
  };
}

/** Sends the delivery of job `jobId` in the Knex transaction `trx`; throws when the queue is missing. */
export async function sendDelivery(boss: PgBoss, trx: Knex, kind: string, delivery: Delivery, overrides: { retryLimit?: number; retryDelaySeconds?: number } = {}): Promise<void> {
  const s = settingsOf(kind);
  const sent = await boss.send(kind, delivery as unknown as object, {
    id: delivery.jobId,
    expireInSeconds: expireInSeconds(delivery.budgetSeconds),
    retryLimit: overrides.retryLimit ?? s.retryLimit,
    retryDelay: overrides.retryDelaySeconds ?? s.retryDelaySeconds,
    retryBackoff: true,
    db: knexExecutor(trx),
  });
  if (sent !== delivery.jobId) throw new Error(`pg-boss did not take job ${delivery.jobId} (is queue "${kind}" created?)`);
}

const g = globalThis as unknown as { cellwrightSendBoss?: Promise<PgBoss> };

/**
 * The app process's pg-boss, for sending only: no maintenance and no schedules (the workers
 * run those), a pool of two connections. Started once per process, on first use; it installs
 * pg-boss's schema if no worker has yet, and the queues of every kind.
 */
export function sendingBoss(databaseUrl: string): Promise<PgBoss> {
  g.cellwrightSendBoss ??= (async () => {
    const boss = new PgBoss({ connectionString: databaseUrl, schema: QUEUE_SCHEMA, supervise: false, schedule: false, migrate: true, max: 2, application_name: 'cellwright-app-queue' });
    boss.on('error', (err) => console.error('[jobs] queue error', err));
    await boss.start();
    await ensureQueues(boss, JOB_KINDS);
    return boss;
  })().catch((err) => {
    g.cellwrightSendBoss = undefined;
    throw err;
  });
  return g.cellwrightSendBoss;
}

/** Stops the sending pg-boss (tests and scripts); the next send starts a new one. */
export async function closeSendingBoss(): Promise<void> {
  const p = g.cellwrightSendBoss;
  g.cellwrightSendBoss = undefined;
  if (p) await (await p.catch(() => null))?.stop({ graceful: false, wait: true });
}
