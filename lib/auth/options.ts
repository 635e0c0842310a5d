import 'server-only';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { env } from '@/lib/env';
import type { Role } from '@/lib/roles';
import { endSessions } from '@/db/users';
import { authenticate, requestAddress } from './credentials';
import { safeRedirectUrl } from './callback-url';
import type { AuthResult } from './credentials';
import { SIGN_IN_MESSAGES } from './messages';

export const SESSION_MAX_AGE_SECONDS = 8 * 60 * 60;

export function secureCookies(): boolean {
  return env().NEXTAUTH_URL.startsWith('https://');
}

/** next-auth's cookie name for the JWT session (depends on https like next-auth's own choice). */
export function sessionCookieName(): string {
  return secureCookies() ? '__Secure-next-auth.session-token' : 'next-auth.session-token';
}

/** next-auth v4 options: credentials only, JWT sessions carrying id and role. */
export function authOptions(): NextAuthOptions {
  // next-auth reads NEXTAUTH_URL itself; give it the parsed default when unset.
  process.env.NEXTAUTH_URL ??= env().NEXTAUTH_URL;
  return {
    secret: env().NEXTAUTH_SECRET,
    useSecureCookies: secureCookies(),
    session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_SECONDS },
    pages: { signIn: '/sign-in', error: '/sign-in' },
    providers: [
      CredentialsProvider({
        name: 'E-mail and password',
        credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
        async authorize(credentials, req) {
          let result: AuthResult;
          try {
            result = await authenticate({
              email: credentials?.email,
              password: credentials?.password,
              address: requestAddress(req?.headers as Record<string, string> | undefined),
            });
          } catch (err) {
            // next-auth shows a thrown message to the visitor: never let SQL or internals through.
            console.error('[auth] sign-in check failed', err);
            throw new Error(SIGN_IN_MESSAGES.unavailable);
          }
          if (result.ok) {
            const { id, email, name, role } = result.user;
            return { id, email, name, role, sessionGeneration: result.sessionGeneration };
          }
          // Thrown messages reach the form as `error`; null gives next-auth's generic code.
          if (result.reason === 'rate-limited') throw new Error(SIGN_IN_MESSAGES.rateLimited(result.retryAfterMinutes));
          if (result.reason === 'disabled') throw new Error(SIGN_IN_MESSAGES.disabled);
          if (result.reason === 'busy') throw new Error(SIGN_IN_MESSAGES.unavailable);
          return null;
        },
      }),
    ],
    events: {
      // Sign-out ends the session for good, not only the cookie in this browser: the account's
      // session generation is raised, so the token (and any copy of it) is refused from now on.
      // The generation is per account, so this also ends the account's other open sessions.
      async signOut({ token }) {
        if (!token?.id) return;
        try {
          await endSessions(String(token.id), typeof token.gen === 'number' ? token.gen : 0);
        } catch (err) {
          // next-auth only logs a throw here and clears the cookie anyway; say what failed.
          console.error('[auth] sign-out could not end the session', err);
        }
      },
    },
    callbacks: {
      // After sign-in or sign-out, only a target on this app's own origin (lib/auth/callback-url.ts).
      async redirect({ url, baseUrl }) {
        return safeRedirectUrl(url, baseUrl);
      },
      async jwt({ token, user }) {
        if (user) {
          token.id = user.id;
          token.role = (user as { role: Role }).role;
          // Kept through every refresh of the token; see userFromSessionToken.
          token.gen = (user as { sessionGeneration?: number }).sessionGeneration ?? 0;
        }
        return token;
      },
      async session({ session, token }) {
        if (session.user) {
          session.user.id = token.id;
          session.user.role = token.role;
        }
        return session;
      },
    },
  };
}
