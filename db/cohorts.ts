import 'server-only';
import { db } from './knex';
import type { CohortDetail, CohortMember, CohortSummary, PendingInvitation } from './types/cohorts';
import { isUuid } from './users';

export type { CohortDetail, CohortMember, CohortSummary, PendingInvitation };

function summaryQuery() {
  const k = db();
  return k('cohorts as c')
    .join('users as t', 't.id', 'c.trainer_id')
    .select(
      'c.id',
      'c.name',
      'c.description',
      'c.trainer_id',
      't.name as trainer_name',
      'c.created_at',
      k.raw('(select count(*) from memberships m where m.cohort_id = c.id)::int as member_count'),
      k.raw(
        '(select count(*) from invitations i where i.cohort_id = c.id and i.accepted_at is null and i.revoked_at is null and i.expires_at > now())::int as pending_count',
      ),
    )
    .orderBy('c.created_at', 'desc');
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toSummary(r: any): CohortSummary {
  return {
    id: r.id,
    name: r.name,
    description: r.description,
    trainerId: r.trainer_id,
    trainerName: r.trainer_name,
    memberCount: r.member_count,
    pendingCount: r.pending_count,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

/** Cohorts a trainer owns, or all cohorts when trainerId is null (admins). */
export async function listCohorts(trainerId: string | null): Promise<CohortSummary[]> {
  const q = summaryQuery();
  if (trainerId) q.where('c.trainer_id', trainerId);
  return (await q).map(toSummary);
}

export async function listCohortsOfStudent(userId: string): Promise<CohortSummary[]> {
  const q = summaryQuery().join('memberships as mm', 'mm.cohort_id', 'c.id').where('mm.user_id', userId);
  return (await q).map(toSummary);
}

export async function findCohort(id: string): Promise<CohortSummary | null> {
  if (!isUuid(id)) return null;
  const row = await summaryQuery().where('c.id', id).first();
  return row ? toSummary(row) : null;
}

export async function getCohortDetail(id: string): Promise<CohortDetail | null> {
  const summary = await findCohort(id);
  if (!summary) return null;
  const members = await db()('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where('m.cohort_id', id)
    .select('u.id', 'u.name', 'u.email', 'm.joined_at')
    .orderBy('u.name');
  const invitations = await db()('invitations as i')
    .join('users as b', 'b.id', 'i.invited_by')
    .where('i.cohort_id', id)
    .whereNull('i.accepted_at')
    .whereNull('i.revoked_at')
    .where('i.expires_at', '>', db().fn.now())
    .select('i.id', 'i.email', 'b.name as invited_by_name', 'i.created_at', 'i.expires_at')
    .orderBy('i.created_at', 'desc');
  return {
    ...summary,
    members: members.map((m) => ({ userId: m.id, name: m.name, email: m.email, joinedAt: new Date(m.joined_at).toISOString() })),
    invitations: invitations.map((i) => ({
      id: i.id,
      email: i.email,
      invitedByName: i.invited_by_name,
      createdAt: new Date(i.created_at).toISOString(),
      expiresAt: new Date(i.expires_at).toISOString(),
    })),
  };
}

export type CreateCohortResult = { ok: true; cohort: CohortSummary } | { ok: false; reason: 'duplicate-name' };

export async function createCohort(trainerId: string, input: { name: string; description: string }): Promise<CreateCohortResult> {
  const inserted = await db()('cohorts')
    .insert({ trainer_id: trainerId, name: input.name.trim(), description: input.description.trim() })
    .onConflict(['trainer_id', 'name'])
    .ignore()
    .returning('id');
  if (inserted.length === 0) return { ok: false, reason: 'duplicate-name' };
  return { ok: true, cohort: (await findCohort(inserted[0].id))! };
}

export async function isMember(cohortId: string, userId: string): Promise<boolean> {
  return Boolean(await db()('memberships').where({ cohort_id: cohortId, user_id: userId }).first());
}

export async function removeMember(cohortId: string, userId: string): Promise<boolean> {
  if (!isUuid(userId)) return false;
  return (await db()('memberships').where({ cohort_id: cohortId, user_id: userId }).delete()) > 0;
}
