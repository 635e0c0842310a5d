/**
 * The shapes shared by the role × route matrix (route-matrix.test.ts) and the row files it
 * spreads into its table (cells-matrix-routes.ts, drills-matrix-routes.ts), so that a row
 * written in one file is type-checked against the table that runs it.
 */
import type { User } from '@/db/users';
import { may, type Ability, type Role } from '@/lib/roles';

export const ACTORS = ['anonymous', 'student', 'trainer', 'lead', 'admin', 'otherTrainer'] as const;
export type Actor = (typeof ACTORS)[number];

/** Each signed-in actor's role (otherTrainer is a second trainer, with a cohort of their own). */
export const ROLE_OF: Record<Exclude<Actor, 'anonymous'>, Role> = { student: 'student', trainer: 'trainer', lead: 'lead', admin: 'admin', otherTrainer: 'trainer' };

/**
 * A route's expected statuses read from the role table (lib/roles.ts): 401 without a session,
 * 403 for every actor whose role is outside `ROLE_TABLE[ability]`, `ok` for the rest, except
 * where `inside` says what an actor inside the row gets for a record that is not theirs (404,
 * or 403 for another owner's). An entry in `inside` for a role outside the row is a mistake in
 * the test: the table alone says who is refused by role.
 */
export function byRole(ability: Ability, ok: number, inside: Partial<Record<Exclude<Actor, 'anonymous'>, number>> = {}): Record<Actor, number> {
  const out = { anonymous: 401 } as Record<Actor, number>;
  for (const actor of ACTORS) {
    if (actor === 'anonymous') continue;
    const allowed = may(ROLE_OF[actor], ability);
    if (!allowed && actor in inside) throw new Error(`byRole('${ability}'): ${actor} is outside the role table's row, so it gets 403 by role`);
    out[actor] = allowed ? (inside[actor] ?? ok) : 403;
  }
  return out;
}

export interface World {
  users: Record<Exclude<Actor, 'anonymous'>, User>;
  cohortId: string; // owned by the demo trainer
  otherCohortId: string; // owned by otherTrainer
}

export interface Prepared {
  path: string;
  params?: Record<string, string>;
  body?: unknown;
}

export interface RouteCase {
  name: string;
  handler: unknown;
  method: string;
  prepare: (w: World, actor: Actor) => Promise<Prepared>;
  expect: Record<Actor, number>;
}

/** Route params for a `[id]` route, plus any further segments (`{ version: '1' }`). */
export const at = (id: string, extra: Record<string, string> = {}): Record<string, string> => ({ id, ...extra });
