/**
 * Stored shapes: what db/ returns and lib/, the routes and the browser pass around. db/types/
 * sits below both db/ and lib/ and imports nothing from the app (the engine's types only), so
 * db/ never reaches up into lib/ for a type; no `server-only`, so client components may import
 * them (usually through the lib/ module that re-exports them).
 */

export const ROLES = ['student', 'trainer', 'lead', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** A person's account as db/users.ts returns it and the admin routes answer it (dates as ISO strings; never the password hash). */
export interface User {
  id: string;
  email: string;
  name: string;
  role: Role;
  organization: string | null;
  disabled: boolean;
  lastSignInAt: string | null;
  createdAt: string;
}
