import 'server-only';
import { db } from './knex';

/**
 * Sign-in attempts, one row each, written *before* the password is checked (lib/auth/credentials.ts).
 * A row stays when the password was wrong (a failure), and goes when the attempt was refused
 * by the limit, was not a guess (a disabled account), or succeeded (which clears the account).
 */
export interface AttemptCounts {
  /** The new attempt's row. */
  id: string;
  /** Attempts in the window for this e-mail, this one included. */
  byEmail: number;
  /** Attempts in the window from this client address, this one included (0 when the address is unknown). */
  byAddress: number;
  /** The oldest attempt in the window for this e-mail, and from this address: a limit lifts when it leaves the window. */
  emailOldest: Date | null;
  addressOldest: Date | null;
}

/**
 * Insert an attempt, then count the window *including it*. Why this order holds under a
 * parallel burst: each attempt's row is committed before its count starts, and the rows of
 * attempts that were let through are never deleted while they count, so the (k+1)-th of any
 * k+1 admitted attempts would see k+1 rows. With a limit of `max`, at most `max` attempts per
 * e-mail (and per address) are let through in a window, however many arrive at once.
 * A null address (not known, see lib/auth/client-address.ts) is stored as null and not counted.
 */
export async function recordAttempt(email: string, address: string | null, windowMinutes: number): Promise<AttemptCounts> {
  const k = db();
  const [row] = await k('sign_in_failures').insert({ email, address }).returning('id');
  const since = k.raw(`now() - make_interval(mins => ?)`, [windowMinutes]);
  // `address = null` matches nothing, so an unknown address counts 0.
  const [counts] = (await k.select(
    k.raw(
      `(select count(*)::int from sign_in_failures where email = ? and created_at > ?) as by_email,
       (select min(created_at) from sign_in_failures where email = ? and created_at > ?) as email_oldest,
       (select count(*)::int from sign_in_failures where address = ? and created_at > ?) as by_address,
       (select min(created_at) from sign_in_failures where address = ? and created_at > ?) as address_oldest`,
      [email, since, email, since, address, since, address, since],
    ),
  )) as { by_email: number; email_oldest: Date | null; by_address: number; address_oldest: Date | null }[];
  return {
    id: String(row.id),
    byEmail: Number(counts.by_email),
    byAddress: Number(counts.by_address),
    emailOldest: counts.email_oldest ? new Date(counts.email_oldest) : null,
    addressOldest: counts.address_oldest ? new Date(counts.address_oldest) : null,
  };
}

/** Drop one attempt (refused by the limit, or not a guess): it should not count as a failure. */
export async function forgetAttempt(id: string): Promise<void> {
  await db()('sign_in_failures').where({ id }).delete();
}

/** A successful sign-in clears the account's failures (not the address's: another account may be under attack from it). */
export async function clearFailuresForEmail(email: string): Promise<void> {
  await db()('sign_in_failures').where({ email }).delete();
}
