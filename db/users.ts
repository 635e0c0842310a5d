import 'server-only';
import type { Knex } from 'knex';
import type { Role, User } from './types/users';
import { db } from './knex';
import { writeAudit } from './audit';

export type { User };

interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  organization: string | null;
  disabled: boolean;
  last_sign_in_at: Date | null;
  created_at: Date;
  password_hash: string;
  session_generation: number;
}

const PUBLIC_COLUMNS = ['id', 'email', 'name', 'role', 'organization', 'disabled', 'last_sign_in_at', 'created_at'];

function toUser(r: Omit<UserRow, 'password_hash'>): User {
  return {
    id: r.id,
    email: r.email,
    name: r.name,
    role: r.role,
    organization: r.organization,
    disabled: r.disabled,
    lastSignInAt: r.last_sign_in_at ? new Date(r.last_sign_in_at).toISOString() : null,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

export function normalizeEmail(email: string): string {
  return email.trim().toLowerCase();
}

const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export function isUuid(value: string): boolean {
  return UUID_RE.test(value);
}

export async function findUserById(id: string): Promise<User | null> {
  if (!isUuid(id)) return null;
  const row = await db()('users').select(PUBLIC_COLUMNS).where({ id }).first();
  return row ? toUser(row) : null;
}

export async function findUserByEmail(email: string): Promise<User | null> {
  const row = await db()('users').select(PUBLIC_COLUMNS).where({ email: normalizeEmail(email) }).first();
  return row ? toUser(row) : null;
}

/**
 * The user behind a session, with the account's session generation: a token minted under
 * another generation (before a password reset) no longer signs anybody in.
 */
export async function findSessionUser(id: string): Promise<{ user: User; sessionGeneration: number } | null> {
  if (!isUuid(id)) return null;
  const row = await db()('users').select([...PUBLIC_COLUMNS, 'session_generation']).where({ id }).first();
  return row ? { user: toUser(row), sessionGeneration: row.session_generation } : null;
}

/** Only the sign-in and password paths may see the hash. */
export async function findCredentials(email: string): Promise<(User & { passwordHash: string; sessionGeneration: number }) | null> {
  const row: UserRow | undefined = await db()('users').where({ email: normalizeEmail(email) }).first();
  return row ? { ...toUser(row), passwordHash: row.password_hash, sessionGeneration: row.session_generation } : null;
}

export async function createUser(
  input: { email: string; name: string; passwordHash: string; role: Role; organization?: string | null },
  trx: Knex = db(),
): Promise<User> {
  const [row] = await trx('users')
    .insert({
      email: normalizeEmail(input.email),
      name: input.name.trim(),
      password_hash: input.passwordHash,
      role: input.role,
      organization: input.organization ?? null,
    })
    .returning(PUBLIC_COLUMNS);
  return toUser(row);
}

export async function setPasswordHash(userId: string, passwordHash: string, trx: Knex = db()): Promise<void> {
  await trx('users')
    .where({ id: userId })
    .update({ password_hash: passwordHash, session_generation: trx.raw('session_generation + 1'), updated_at: trx.fn.now() });
}

/**
 * Replace a password hash with one of the same password at a newer cost (upgrade on sign-in).
 * Unlike setPasswordHash this keeps the session generation: the password did not change.
 * Only when the stored hash is still `previousHash`, so a reset that landed in between wins.
 */
export async function upgradePasswordHash(userId: string, previousHash: string, newHash: string): Promise<boolean> {
  const changed = await db()('users').where({ id: userId, password_hash: previousHash }).update({ password_hash: newHash });
  return changed === 1;
}

/**
 * End every session of the account opened under `generation` (sign-out): raising the
 * generation makes requireApiUser / requirePageUser refuse those tokens, including copies of
 * the one signing out. A token of an older generation is already dead and changes nothing,
 * so a stale sign-out never ends sessions opened after it.
 */
export async function endSessions(userId: string, generation: number): Promise<boolean> {
  if (!isUuid(userId)) return false;
  const changed = await db()('users')
    .where({ id: userId, session_generation: generation })
    .update({ session_generation: db().raw('session_generation + 1'), updated_at: db().fn.now() });
  return changed === 1;
}

export async function markSignedIn(userId: string): Promise<void> {
  await db()('users').where({ id: userId }).update({ last_sign_in_at: db().fn.now() });
}

export const USER_SORT_KEYS = ['name', 'email', 'role', 'created_at', 'last_sign_in_at'] as const;
export type UserSortKey = (typeof USER_SORT_KEYS)[number];

export interface UserListQuery {
  q?: string;
  role?: Role;
  sort: UserSortKey;
  dir: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

/** One page of users with search (name or e-mail), role filter, sort, and the total count. */
export async function listUsers(query: UserListQuery): Promise<{ rows: User[]; total: number }> {
  const base = db()('users');
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    base.where((w) => w.whereILike('name', like).orWhereILike('email', like));
  }
  if (query.role) base.where('role', query.role);
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const rows = await base
    .clone()
    .select(PUBLIC_COLUMNS)
    .orderByRaw(`${query.sort} ${query.dir} nulls last, id asc`)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { rows: rows.map(toUser), total: Number(count) };
}

export async function countUsersByRole(): Promise<Record<Role, number> & { disabled: number }> {
  const rows = await db()('users').select('role').count<{ role: Role; count: string }[]>({ count: '*' }).groupBy('role');
  const out = { student: 0, trainer: 0, lead: 0, admin: 0, disabled: 0 };
  for (const r of rows) out[r.role] = Number(r.count);
  const [{ count }] = await db()('users').where({ disabled: true }).count<{ count: string }[]>({ count: '*' });
  out.disabled = Number(count);
  return out;
}

/** Change role and/or disabled flag; each change is written to the audit log in the same transaction. */
export async function updateUserAccess(
  actorId: string,
  userId: string,
  change: { role?: Role; disabled?: boolean },
): Promise<User | null> {
  return db().transaction(async (trx) => {
    const before: UserRow | undefined = await trx('users').where({ id: userId }).forUpdate().first();
    if (!before) return null;
    const patch: Record<string, unknown> = {};
    if (change.role !== undefined && change.role !== before.role) {
      patch.role = change.role;
      await writeAudit({ actorId, action: 'role.changed', targetUserId: userId, detail: { from: before.role, to: change.role } }, trx);
    }
    if (change.disabled !== undefined && change.disabled !== before.disabled) {
      patch.disabled = change.disabled;
      await writeAudit({ actorId, action: change.disabled ? 'user.disabled' : 'user.enabled', targetUserId: userId }, trx);
    }
    if (Object.keys(patch).length === 0) return toUser(before);
    const [row] = await trx('users')
      .where({ id: userId })
      .update({ ...patch, updated_at: trx.fn.now() })
      .returning(PUBLIC_COLUMNS);
    return toUser(row);
  });
}
