import 'server-only';
import { db } from './knex';

/** Failed sign-ins inside the window, per account e-mail and per client address. */
export async function countRecentFailures(
  email: string,
  address: string,
  windowMinutes: number,
): Promise<{ byEmail: number; byAddress: number; oldestRelevant: Date | null }> {
  const since = db().raw(`now() - make_interval(mins => ?)`, [windowMinutes]);
  const [byEmail]: { count: number; min: Date | null }[] = await db()('sign_in_failures')
    .where('email', email)
    .andWhere('created_at', '>', since)
    .select(db().raw('count(*)::int as count, min(created_at) as min'));
  const [byAddress]: { count: number; min: Date | null }[] = await db()('sign_in_failures')
    .where('address', address)
    .andWhere('created_at', '>', since)
    .select(db().raw('count(*)::int as count, min(created_at) as min'));
  const mins = [byEmail.min, byAddress.min].filter((d): d is Date => d !== null);
  return {
    byEmail: Number(byEmail.count),
    byAddress: Number(byAddress.count),
    oldestRelevant: mins.length ? new Date(Math.min(...mins.map((d) => new Date(d).getTime()))) : null,
  };
}

export async function recordFailure(email: string, address: string): Promise<void> {
  await db()('sign_in_failures').insert({ email, address });
}

/** A successful sign-in clears the account's failures (not the address's: another account may be under attack from it). */
export async function clearFailuresForEmail(email: string): Promise<void> {
  await db()('sign_in_failures').where({ email }).delete();
}
