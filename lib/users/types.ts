import type { Role } from '@/lib/roles';

/**
 * A person's account as db/users.ts returns it and the admin routes answer it (dates as ISO
 * strings; never the password hash). Here rather than in db/ so client components can import
 * it: db/ modules are server-only.
 */
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
