import { NextResponse } from 'next/server';
import type { NextRequest } from 'next/server';

/**
 * First gate only: signed-in areas need a session cookie, else go to sign-in.
 * Every page, route handler and server action still checks the session and
 * role itself (the cookie is not verified here).
 */
export function proxy(request: NextRequest) {
  const hasSession =
    request.cookies.has('next-auth.session-token') || request.cookies.has('__Secure-next-auth.session-token');
  if (!hasSession) {
    const url = request.nextUrl.clone();
    url.pathname = '/sign-in';
    url.search = `?callbackUrl=${encodeURIComponent(request.nextUrl.pathname + request.nextUrl.search)}`;
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = {
  matcher: ['/dashboard/:path*', '/cohorts/:path*', '/admin/:path*', '/cells/:path*', '/drills/:path*', '/runs/:path*', '/gradebook/:path*'],
};
