import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { Role } from '@/lib/roles';
import type { User } from '@/db/users';

/**
 * Whether an admin may make this change to an account: never to lock themselves out (disable
 * their own account, or give up their own admin role). Another admin has to do that, so the
 * app never loses its last way in by accident. 409: the request is well-formed, the account's
 * state forbids it.
 */
export function assertAccessChangeAllowed(admin: User, targetId: string, change: { role?: Role; disabled?: boolean }): void {
  if (targetId === admin.id && (change.disabled === true || (change.role !== undefined && change.role !== 'admin'))) {
    throw new ApiError(409, 'You cannot disable your own account or remove your own admin role.');
  }
}
