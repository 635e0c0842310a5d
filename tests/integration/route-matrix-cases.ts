/**
 * The shapes shared by the role × route matrix (route-matrix.test.ts) and the row files it
 * spreads into its table (cells-matrix-routes.ts, drills-matrix-routes.ts), so that a row
 * written in one file is type-checked against the table that runs it.
 */
import type { User } from '@/db/users';

export const ACTORS = ['anonymous', 'student', 'trainer', 'lead', 'admin', 'otherTrainer'] as const;
export type Actor = (typeof ACTORS)[number];

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
