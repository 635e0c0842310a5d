import 'server-only';
import type { Knex } from 'knex';
import { db } from './knex';

export type AuditAction =
  | 'role.changed'
  | 'user.disabled'
  | 'user.enabled'
  | 'signin.failed'
  | 'signin.blocked'
  | 'invitation.accepted'
  | 'password.reset'
  | 'grade.overridden';

export interface AuditEntry {
  id: string;
  actorId: string | null;
  actorName: string | null;
  action: AuditAction;
  targetUserId: string | null;
  targetEmail: string | null;
  detail: Record<string, unknown>;
  createdAt: string;
}

export async function writeAudit(
  entry: { actorId: string | null; action: AuditAction; targetUserId?: string | null; detail?: Record<string, unknown> },
  trx: Knex = db(),
): Promise<void> {
  await trx('audit_log').insert({
    actor_id: entry.actorId,
    action: entry.action,
    target_user_id: entry.targetUserId ?? null,
    detail: JSON.stringify(entry.detail ?? {}),
  });
}

export async function recentAudit(limit = 20, targetUserId?: string): Promise<AuditEntry[]> {
  const q = db()('audit_log as a')
    .leftJoin('users as actor', 'actor.id', 'a.actor_id')
    .leftJoin('users as target', 'target.id', 'a.target_user_id')
    .select(
      'a.id',
      'a.actor_id',
      'actor.name as actor_name',
      'a.action',
      'a.target_user_id',
      'target.email as target_email',
      'a.detail',
      'a.created_at',
    )
    .orderBy('a.id', 'desc')
    .limit(limit);
  if (targetUserId) q.where('a.target_user_id', targetUserId);
  const rows = await q;
  return rows.map((r) => ({
    id: String(r.id),
    actorId: r.actor_id,
    actorName: r.actor_name,
    action: r.action,
    targetUserId: r.target_user_id,
    targetEmail: r.target_email,
    detail: r.detail ?? {},
    createdAt: new Date(r.created_at).toISOString(),
  }));
}
