import 'server-only';
import { db } from './knex';
import { findTokenRow, newToken, tokenRefusal } from './tokens';
import { writeAudit } from './audit';

export const RESET_TTL_MINUTES = 60;

/** A reset token for an active account, or null (unknown or disabled: the caller says the same thing either way). */
export async function createPasswordReset(email: string): Promise<{ token: string; userId: string; name: string } | null> {
  const user = await db()('users').where({ email: email.trim().toLowerCase() }).first();
  if (!user || user.disabled) return null;
  const { token, hash } = newToken();
  await db()('password_resets').insert({
    user_id: user.id,
    token_hash: hash,
    expires_at: db().raw(`now() + interval '${RESET_TTL_MINUTES} minutes'`),
  });
  return { token, userId: user.id, name: user.name };
}

export type ResetState = 'valid' | 'invalid' | 'used' | 'expired';

export async function lookupPasswordReset(token: string): Promise<ResetState> {
  return tokenRefusal(await findTokenRow(db(), 'password_resets', token), 'used_at') ?? 'valid';
}

/** Use a reset token once; also retires the account's other open reset tokens. */
export async function completePasswordReset(
  token: string,
  passwordHash: string,
): Promise<{ ok: true; userId: string } | { ok: false; reason: Exclude<ResetState, 'valid'> }> {
  return db().transaction(async (trx) => {
    const row = await findTokenRow(trx, 'password_resets', token, { forUpdate: true });
    const refusal = tokenRefusal(row, 'used_at');
    if (refusal) return { ok: false, reason: refusal };
    // A new generation ends every session opened with the old password (lib/auth/session.ts).
    await trx('users')
      .where({ id: row.user_id })
      .update({ password_hash: passwordHash, session_generation: trx.raw('session_generation + 1'), updated_at: trx.fn.now() });
    await trx('password_resets').where({ user_id: row.user_id }).whereNull('used_at').update({ used_at: trx.fn.now() });
    await trx('sign_in_failures').where({ email: trx('users').select('email').where({ id: row.user_id }) }).delete();
    await writeAudit({ actorId: row.user_id, action: 'password.reset', targetUserId: row.user_id }, trx);
    return { ok: true, userId: row.user_id };
  });
}

export type ResetAdmission =
  | { admitted: true }
  /** The client address had its share of requests in the window; the limit lifts when its oldest leaves. */
  | { admitted: false; limit: 'address'; oldestRequest: Date | null }
  /** The e-mail address had its share of requests in the window. */
  | { admitted: false; limit: 'email' };

/**
 * Admit a reset request (known account or not: the same work either way) under the
 * per-address and per-e-mail limits, or refuse it. Counting and recording happen under
 * advisory locks on the e-mail and the address (e-mail first, always, so two requests cannot
 * deadlock), so a parallel burst is decided one request at a time and cannot pass a limit.
 * A request refused by the address limit is not recorded, so hammering does not stretch that
 * window; one held by the e-mail limit is recorded as not mailed (it counts against its address,
 * not against the e-mail). Kept in PostgreSQL so the limits hold across app processes and
 * restarts. A null address (not known) limits nothing.
 */
export async function admitResetRequest(
  email: string,
  address: string | null,
  { maxPerEmail, maxPerAddress, windowMinutes }: { maxPerEmail: number; maxPerAddress: number; windowMinutes: number },
): Promise<ResetAdmission> {
  const normalized = email.trim().toLowerCase();
  return db().transaction(async (trx) => {
    await trx.raw('select pg_advisory_xact_lock(hashtextextended(?, 0))', [`reset:email:${normalized}`]);
    if (address) await trx.raw('select pg_advisory_xact_lock(hashtextextended(?, 0))', [`reset:address:${address}`]);
    const since = trx.raw(`now() - make_interval(mins => ?)`, [windowMinutes]);
    if (address) {
      const [byAddress] = (await trx('password_reset_requests')
        .where({ address })
        .andWhere('created_at', '>', since)
        .select(trx.raw('count(*)::int as count, min(created_at) as oldest'))) as { count: number; oldest: Date | null }[];
      if (Number(byAddress.count) >= maxPerAddress) {
        return { admitted: false, limit: 'address', oldestRequest: byAddress.oldest ? new Date(byAddress.oldest) : null };
      }
    }
    const [byEmail] = (await trx('password_reset_requests')
      .where({ email: normalized, mailed: true })
      .andWhere('created_at', '>', since)
      .select(trx.raw('count(*)::int as count'))) as { count: number }[];
    const mailed = Number(byEmail.count) < maxPerEmail;
    // Recorded either way, so it counts against the address; only mailed ones count against the e-mail.
    await trx('password_reset_requests').insert({ email: normalized, address, mailed });
    return mailed ? { admitted: true } : { admitted: false, limit: 'email' };
  });
}
