import { NextResponse } from 'next/server';
import type { NextRequest } from 'next/server';
import { env } from '@/lib/env';
import { newNonce, pageSecurityHeaders } from '@/lib/security-headers';

/** Signed-in areas: without a session cookie, go to sign-in first. */
const SIGNED_IN_AREAS = ['/dashboard', '/cohorts', '/admin', '/cells', '/drills', '/runs', '/gradebook'];

function inSignedInArea(pathname: string): boolean {
  return SIGNED_IN_AREAS.some((area) => pathname === area || pathname.startsWith(`${area}/`));
}

/**
 * Every page passes here:
 * - security headers with a fresh CSP nonce per request (lib/security-headers.ts). The nonce
 *   also goes on the *request* (`content-security-policy`, `x-nonce`): Next.js reads it from
 *   there while rendering and puts it on its own scripts (Next.js 16 CSP guide);
 * - a first gate for the signed-in areas: no session cookie, go to sign-in. The cookie is not
 *   verified here; every page, route handler and server action checks the session itself.
 */
export function proxy(request: NextRequest) {
  const { NODE_ENV, NEXTAUTH_URL } = env();
  const hasSession =
    request.cookies.has('next-auth.session-token') || request.cookies.has('__Secure-next-auth.session-token');
  const nonce = newNonce();
  const headers = pageSecurityHeaders(request.nextUrl.pathname, {
    nonce,
    dev: NODE_ENV === 'development',
    engine: hasSession,
    https: NEXTAUTH_URL.startsWith('https://'),
  });

  let response: NextResponse;
  if (!hasSession && inSignedInArea(request.nextUrl.pathname)) {
    const url = request.nextUrl.clone();
    url.pathname = '/sign-in';
    url.search = `?callbackUrl=${encodeURIComponent(request.nextUrl.pathname + request.nextUrl.search)}`;
    response = NextResponse.redirect(url);
  } else {
    const requestHeaders = new Headers(request.headers);
    requestHeaders.set('x-nonce', nonce);
    requestHeaders.set('content-security-policy', headers['content-security-policy']);
    response = NextResponse.next({ request: { headers: requestHeaders } });
  }
  for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
  return response;
}

export const config = {
  // Every page; not route handlers (they get static headers from next.config.mjs, and their
  // bodies must reach the capped reader untouched) nor built assets.
  matcher: ['/((?!api/|_next/static/|_next/image|favicon.ico).*)'],
};
