import 'server-only';
import { newToken } from '@/lib/tokens';
import { db } from './knex';
import { findTokenRow, tokenRefusal } from './tokens';
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
