import 'server-only';
import { db } from './knex';
import { writeAudit } from './audit';
import { findTokenRow, hashToken, newToken, tokenRefusal } from './tokens';
import { createUser, isUuid, normalizeEmail } from './users';

export const INVITATION_TTL_DAYS = 7;

export type InviteOutcome =
  | { email: string; status: 'invited'; token: string; invitationId: string }
  | { email: string; status: 'already-member' | 'already-invited' | 'not-a-student' };

/**
 * Create an invitation unless the address is already in the cohort, already
 * has an open invitation, or belongs to an account that is not a student.
 * An existing student account is invited too: accepting adds the membership.
 */
export async function createInvitation(cohortId: string, invitedBy: string, rawEmail: string): Promise<InviteOutcome> {
  const email = normalizeEmail(rawEmail);
  const k = db();
  const user = await k('users').select('id', 'role').where({ email }).first();
  if (user) {
    if (await k('memberships').where({ cohort_id: cohortId, user_id: user.id }).first()) return { email, status: 'already-member' };
    if (user.role !== 'student') return { email, status: 'not-a-student' };
  }
  // Expired open invitations block the partial unique index; retire them first.
  await k('invitations')
    .where({ cohort_id: cohortId, email })
    .whereNull('accepted_at')
    .whereNull('revoked_at')
    .where('expires_at', '<=', k.fn.now())
    .update({ revoked_at: k.fn.now() });
  const { token, hash } = newToken();
  const inserted = await k('invitations')
    .insert({
      cohort_id: cohortId,
      email,
      token_hash: hash,
      invited_by: invitedBy,
      expires_at: k.raw(`now() + interval '${INVITATION_TTL_DAYS} days'`),
    })
    .onConflict(k.raw('(cohort_id, email) where accepted_at is null and revoked_at is null'))
    .ignore()
    .returning('id');
  if (inserted.length === 0) return { email, status: 'already-invited' };
  return { email, status: 'invited', token, invitationId: inserted[0].id };
}

/**
 * Revokes an open invitation in one transaction: the row is locked, so an acceptance racing the
 * revoke either lands first (the revoke answers not-open) or finds the invitation revoked.
 */
export async function revokeInvitation(cohortId: string, invitationId: string): Promise<'revoked' | 'not-found' | 'not-open'> {
  if (!isUuid(invitationId)) return 'not-found';
  return db().transaction(async (trx) => {
    const row = await trx('invitations').where({ id: invitationId, cohort_id: cohortId }).forUpdate().first();
    if (!row) return 'not-found' as const;
    if (row.accepted_at || row.revoked_at) return 'not-open' as const;
    await trx('invitations').where({ id: invitationId }).update({ revoked_at: trx.fn.now() });
    return 'revoked' as const;
  });
}

export type TokenState<T> =
  | { state: 'valid'; value: T }
  | { state: 'invalid' | 'used' | 'expired' | 'revoked' };

export interface InvitationView {
  id: string;
  email: string;
  cohortName: string;
  trainerName: string;
  existingAccount: boolean;
}

/** What an invitation link points at, without changing anything. */
export async function lookupInvitation(token: string): Promise<TokenState<InvitationView>> {
  const row = await db()('invitations as i')
    .join('cohorts as c', 'c.id', 'i.cohort_id')
    .join('users as t', 't.id', 'c.trainer_id')
    .where('i.token_hash', hashToken(token))
    .select('i.*', 'c.name as cohort_name', 't.name as trainer_name', db().raw('i.expires_at <= now() as is_expired'))
    .first();
  const refusal = tokenRefusal(row, 'accepted_at');
  if (refusal) return { state: refusal };
  const existing = await db()('users').where({ email: row.email }).first();
  return {
    state: 'valid',
    value: { id: row.id, email: row.email, cohortName: row.cohort_name, trainerName: row.trainer_name, existingAccount: Boolean(existing) },
  };
}

export type AcceptResult =
  | { ok: true; userId: string; email: string; created: boolean }
  | { ok: false; reason: 'invalid' | 'used' | 'expired' | 'revoked' | 'account-exists' };

/**
 * Redeem an invitation once: create the student account (name + password hash)
 * or, for an existing student, only add the membership. Row lock makes a
 * double submit redeem it once.
 */
export async function acceptInvitation(token: string, input: { name: string; passwordHash: string }): Promise<AcceptResult> {
  return db().transaction(async (trx) => {
    const row = await findTokenRow(trx, 'invitations', token, { forUpdate: true });
    const refusal = tokenRefusal(row, 'accepted_at');
    if (refusal) return { ok: false, reason: refusal };
    const existing = await trx('users').where({ email: row.email }).first();
    if (existing) return { ok: false, reason: 'account-exists' };
    const user = await createUser({ email: row.email, name: input.name, passwordHash: input.passwordHash, role: 'student' }, trx);
    await trx('memberships').insert({ cohort_id: row.cohort_id, user_id: user.id }).onConflict(['cohort_id', 'user_id']).ignore();
    await trx('invitations').where({ id: row.id }).update({ accepted_at: trx.fn.now(), accepted_user_id: user.id });
    await writeAudit({ actorId: user.id, action: 'invitation.accepted', targetUserId: user.id, detail: { cohortId: row.cohort_id } }, trx);
    return { ok: true, userId: user.id, email: user.email, created: true };
  });
}

/** An existing (signed-in) student joins with the link; the caller checks the session e-mail matches. */
export async function joinWithInvitation(token: string, userId: string): Promise<AcceptResult> {
  return db().transaction(async (trx) => {
    const row = await findTokenRow(trx, 'invitations', token, { forUpdate: true });
    const refusal = tokenRefusal(row, 'accepted_at');
    if (refusal) return { ok: false, reason: refusal };
    const user = await trx('users').where({ id: userId }).first();
    if (!user || user.email !== row.email) return { ok: false, reason: 'invalid' };
    await trx('memberships').insert({ cohort_id: row.cohort_id, user_id: userId }).onConflict(['cohort_id', 'user_id']).ignore();
    await trx('invitations').where({ id: row.id }).update({ accepted_at: trx.fn.now(), accepted_user_id: userId });
    await writeAudit({ actorId: userId, action: 'invitation.accepted', targetUserId: userId, detail: { cohortId: row.cohort_id } }, trx);
    return { ok: true, userId, email: user.email, created: false };
  });
}
