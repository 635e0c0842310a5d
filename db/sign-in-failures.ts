import 'server-only';
import type { Knex } from 'knex';
import { db } from './knex';

/**
 * Sign-in attempts, one row each, written *before* the password is checked
 * (lib/auth/credentials.ts). A row is `pending` while its password is being checked and
 * becomes `failed` when the password was wrong; it is deleted when the attempt succeeded (with
 * the account's other failures) or was not a guess (a disabled account).
 *
 * A pending row older than PENDING_STALE_SECONDS counts as a failure: its process died before
 * it could say (a check takes well under a second), and a guess must not vanish that way.
 */
const PENDING_STALE_SECONDS = 30;

/**
 * While other checks for the same account or address are in flight, look again when one of
 * this process's checks finishes, or after this long (checks running in another process).
 */
const IN_FLIGHT_POLL_MS = 250;

/** Decisions are made one at a time per key; another attempt deciding right now: look again after a few ms. */
const LOCK_RETRY_MS = [5, 25] as const;

/** Attempts of this process waiting for checks in flight; woken whenever one of this process's checks ends. */
const waiters = new Set<() => void>();

function wakeWaiters(): void {
  for (const wake of [...waiters]) wake();
}

function nap(ms: number, wakeable: boolean): Promise<void> {
  return new Promise((resolve) => {
    const done = () => {
      clearTimeout(timer);
      waiters.delete(done);
      resolve();
    };
    const timer = setTimeout(done, ms);
    if (wakeable) waiters.add(done);
  });
}

export type Admission =
  | { admitted: true; id: string }
  /** The window holds `max` failures for the e-mail or the address: no check until the oldest leaves it. */
  | { admitted: false; reason: 'limit'; oldestFailure: Date | null }
  /** Other checks for the same e-mail or address stayed in flight past the wait budget. */
  | { admitted: false; reason: 'busy' };

interface Counts {
  failed: number;
  pending: number;
  oldest: Date | null;
}

/**
 * Try a transaction-scoped advisory lock on a text key (hashtextextended: PostgreSQL ≥ 11).
 * Never blocks: a burst must not park every pooled connection on one lock while the checks
 * that would release the waiters need a connection to report.
 */
async function tryLockKey(trx: Knex.Transaction, key: string): Promise<boolean> {
  const { rows } = await trx.raw('select pg_try_advisory_xact_lock(hashtextextended(?, 0)) as locked', [key]);
  return rows[0].locked === true;
}

async function countWindow(trx: Knex.Transaction, column: 'email' | 'address', value: string, windowMinutes: number): Promise<Counts> {
  const { rows } = await trx.raw(
    `select count(*) filter (where status = 'failed' or created_at <= now() - make_interval(secs => ?))::int as failed,
            count(*) filter (where status = 'pending' and created_at > now() - make_interval(secs => ?))::int as pending,
            min(created_at) filter (where status = 'failed' or created_at <= now() - make_interval(secs => ?)) as oldest
       from sign_in_failures
      where ${column} = ? and created_at > now() - make_interval(mins => ?)`,
    [PENDING_STALE_SECONDS, PENDING_STALE_SECONDS, PENDING_STALE_SECONDS, value, windowMinutes],
  );
  const r = rows[0] as { failed: number; pending: number; oldest: Date | null };
  return { failed: Number(r.failed), pending: Number(r.pending), oldest: r.oldest ? new Date(r.oldest) : null };
}

/**
 * Admit one sign-in attempt for checking, or refuse it, so that however many attempts arrive
 * at once, at most `max` passwords per e-mail and per client address are checked in the
 * window. Counting and inserting happen under advisory locks on the e-mail and the address,
 * so attempts are decided one after the other and each sees the ones admitted before it,
 * including those still being checked.
 *
 * - `max` failures in the window: refused at once (`limit`).
 * - fewer failures, but failures plus checks in flight reach `max`: for the e-mail, refused
 *   at once too (one account's attempts in parallel are a script); for the address, the
 *   attempt waits for those checks instead, since they may well succeed (a class behind one
 *   address signing in together), and gives up past `waitMs` (`busy`).
 * - otherwise its `pending` row is inserted and it is admitted.
 *
 * The locks are only ever tried, never waited for, so two attempts cannot deadlock. A null
 * address (not known, see lib/auth/client-address.ts) is stored as null and limits nothing.
 */
export async function admitAttempt(
  email: string,
  address: string | null,
  { max, windowMinutes, waitMs }: { max: number; windowMinutes: number; waitMs: number },
): Promise<Admission> {
  const deadline = Date.now() + waitMs;
  for (;;) {
    const decision = await db().transaction(async (trx): Promise<Admission | 'locked' | 'in-flight'> => {
      if (!(await tryLockKey(trx, `signin:email:${email}`))) return 'locked';
      if (address && !(await tryLockKey(trx, `signin:address:${address}`))) return 'locked';
      const byEmail = await countWindow(trx, 'email', email, windowMinutes);
      const byAddress = address ? await countWindow(trx, 'address', address, windowMinutes) : { failed: 0, pending: 0, oldest: null };
      const full = [byEmail, byAddress].filter((c) => c.failed >= max);
      if (full.length > 0) {
        // The limit lifts when the oldest failure of the *latest* full window leaves it.
        const oldest = full.map((c) => c.oldest?.getTime() ?? Date.now()).reduce((a, b) => Math.max(a, b));
        return { admitted: false, reason: 'limit', oldestFailure: new Date(oldest) };
      }
      // One account's guesses in parallel come from a script, not a person: refused like failures.
      if (byEmail.failed + byEmail.pending >= max) return { admitted: false, reason: 'limit', oldestFailure: byEmail.oldest };
      // Many people behind one address (a class, a plant's NAT) do sign in together: wait for their checks.
      if (byAddress.failed + byAddress.pending >= max) return 'in-flight';
      const [row] = await trx('sign_in_failures').insert({ email, address, status: 'pending' }).returning('id');
      return { admitted: true, id: String(row.id) };
    });
    if (typeof decision === 'object') return decision;
    if (Date.now() >= deadline) return { admitted: false, reason: 'busy' };
    if (decision === 'locked') await nap(LOCK_RETRY_MS[0] + Math.random() * (LOCK_RETRY_MS[1] - LOCK_RETRY_MS[0]), false);
    else await nap(IN_FLIGHT_POLL_MS, true);
  }
}

/** The password was wrong: the attempt stays as a failure. */
export async function markAttemptFailed(id: string): Promise<void> {
  await db()('sign_in_failures').where({ id }).update({ status: 'failed' });
  wakeWaiters();
}

/** Drop one attempt that was not a guess (the right password for a disabled account). */
export async function forgetAttempt(id: string): Promise<void> {
  await db()('sign_in_failures').where({ id }).delete();
  wakeWaiters();
}

/**
 * A successful sign-in clears the account's failures and its own attempt (not the address's
 * failures: another account may be under attack from it). Other attempts for the account
 * still being checked keep their rows and are counted when they finish.
 */
export async function clearFailuresForEmail(email: string, ownAttemptId?: string): Promise<void> {
  await db()('sign_in_failures')
    .where({ email })
    .andWhere((w) => {
      w.where('status', 'failed').orWhereRaw(`created_at <= now() - make_interval(secs => ?)`, [PENDING_STALE_SECONDS]);
      if (ownAttemptId) w.orWhere('id', ownAttemptId);
    })
    .delete();
  wakeWaiters();
}
