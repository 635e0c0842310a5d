import 'server-only';
import { decode } from 'next-auth/jwt';
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { env } from '@/lib/env';
import { ApiError } from '@/lib/api/errors';
import type { Role } from '@/lib/roles';
import type { User } from '@/db/users';
import { findUserById } from '@/db/users';
import { sessionCookieName } from './options';

function readCookie(cookieHeader: string | null, name: string): string | null {
  if (!cookieHeader) return null;
  for (const part of cookieHeader.split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return decodeURIComponent(part.slice(eq + 1).trim());
  }
  return null;
}

/**
 * The signed-in user behind a session token, re-read from the database on
 * every call so a disabled account or a changed role takes effect at once.
 */
export async function userFromSessionToken(token: string | null | undefined): Promise<User | null> {
  if (!token) return null;
  try {
    const payload = await decode({ token, secret: env().NEXTAUTH_SECRET });
    if (!payload?.id) return null;
    const user = await findUserById(String(payload.id));
    return user && !user.disabled ? user : null;
  } catch {
    return null;
  }
}

export function userFromRequest(req: Request): Promise<User | null> {
  return userFromSessionToken(readCookie(req.headers.get('cookie'), sessionCookieName()));
}

/** For route handlers: 401 without a session, 403 when the role is not allowed. */
export async function requireApiUser(req: Request, roles?: readonly Role[]): Promise<User> {
  const user = await userFromRequest(req);
  if (!user) throw new ApiError(401, 'Sign in first.');
  if (roles && !roles.includes(user.role)) throw new ApiError(403, 'Your role may not do this.');
  return user;
}

/** For server components: the current user or null. */
export async function getPageUser(): Promise<User | null> {
  const jar = await cookies();
  return userFromSessionToken(jar.get(sessionCookieName())?.value);
}

/** For pages: redirect to sign-in without a session; `allowed` says whether the role may see the page. */
export async function requirePageUser(path: string, roles?: readonly Role[]): Promise<{ user: User; allowed: boolean }> {
  const user = await getPageUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  return { user, allowed: !roles || roles.includes(user.role) };
}
