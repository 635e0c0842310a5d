import 'server-only';
import { decode } from 'next-auth/jwt';
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { env } from '@/lib/env';
import { ApiError } from '@/lib/api/errors';
import type { Role } from '@/lib/roles';
import type { User } from '@/db/users';
import { findSessionUser } from '@/db/users';
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
 * User ids of session tokens already decoded, by token. Decoding derives the key (HKDF) and
 * decrypts the token on every call, a large share of a small API request's CPU time (a run
 * streams a batch every second); a token's content never changes, so it is decoded once and
 * remembered until it expires. Only the decoding is remembered: the user is still read from
 * the database on every request. Bounded; the oldest entries go first.
 */
const TOKEN_CACHE_MAX = 2000;
type TokenFacts = { userId: string; generation: number };
const tokenCache = globalThis as unknown as { cellwrightSessionTokens?: Map<string, TokenFacts & { secret: string; expiresAtMs: number }> };

async function factsOfToken(token: string): Promise<TokenFacts | null> {
  const secret = env().NEXTAUTH_SECRET;
  const cache = (tokenCache.cellwrightSessionTokens ??= new Map());
  const hit = cache.get(token);
  if (hit && hit.secret === secret && hit.expiresAtMs > Date.now()) return { userId: hit.userId, generation: hit.generation };
  if (hit) cache.delete(token);
  const payload = await decode({ token, secret });
  if (!payload?.id) return null;
  const facts = { userId: String(payload.id), generation: typeof payload.gen === 'number' ? payload.gen : 0 };
  // Remembered up to the token's own expiry; decode itself allows a little clock skew past it.
  if (typeof payload.exp === 'number') {
    if (cache.size >= TOKEN_CACHE_MAX) cache.delete(cache.keys().next().value as string);
    cache.set(token, { ...facts, secret, expiresAtMs: payload.exp * 1000 });
  }
  return facts;
}

/**
 * The signed-in user behind a session token, re-read from the database on every call so a
 * disabled account, a changed role or a password reset (which ends older sessions) takes
 * effect at once.
 */
export async function userFromSessionToken(token: string | null | undefined): Promise<User | null> {
  if (!token) return null;
  try {
    const facts = await factsOfToken(token);
    if (!facts) return null;
    const found = await findSessionUser(facts.userId);
    // A password reset raises the account's generation: sessions opened before it end here.
    if (!found || found.sessionGeneration !== facts.generation) return null;
    return found.user.disabled ? null : found.user;
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
