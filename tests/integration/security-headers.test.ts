/**
 * Security headers (hardening issue #9, point 8): what proxy.ts sets on pages, the static
 * API headers in next.config.mjs, and the proxy's sign-in gate, which now runs on every page
 * but redirects only in the signed-in areas. The browser side (no CSP violation on real
 * pages) is tests/e2e/security-headers.spec.ts.
 */
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { NextConfig } from 'next';
import { NextRequest } from 'next/server';
import { config, proxy } from '@/proxy';
import { API_SECURITY_HEADERS, HSTS_VALUE, pageSecurityHeaders } from '@/lib/security-headers';
import { TEST_ENV } from './test-env';

function page(path: string, cookie?: string): Response {
  return proxy(new NextRequest(`${TEST_ENV.APP_URL}${path}`, { headers: cookie ? { cookie } : {} }));
}

function directives(csp: string | null): Map<string, string> {
  return new Map(
    (csp ?? '')
      .split(';')
      .map((d) => d.trim())
      .filter(Boolean)
      .map((d) => [d.split(' ')[0], d.slice(d.indexOf(' ') + 1)] as [string, string]),
  );
}

describe('page headers from proxy.ts', () => {
  it('a public page gets a nonce CSP that forbids framing, plugins and <base>, and the other headers', () => {
    const res = page('/sign-in');
    expect(res.status).toBe(200);
    const csp = directives(res.headers.get('content-security-policy'));
    expect(csp.get('frame-ancestors')).toBe("'none'");
    expect(csp.get('object-src')).toBe("'none'");
    expect(csp.get('base-uri')).toBe("'self'");
    expect(csp.get('default-src')).toBe("'self'");
    expect(csp.get('script-src')).toMatch(/^'self' 'nonce-[A-Za-z0-9+/=]{24}' 'strict-dynamic'$/);
    expect(csp.get('worker-src')).toBe("'self' blob:");
    expect(csp.get('img-src')).toBe("'self' data: blob:");
    expect(csp.get('font-src')).toBe("'self'");
    expect(csp.get('style-src-attr')).toBe("'unsafe-inline'");
    expect(csp.get('style-src-elem')).toMatch(/^'self' 'nonce-/);
    expect(csp.has('upgrade-insecure-requests')).toBe(false); // http here
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('x-frame-options')).toBe('DENY');
    expect(res.headers.get('referrer-policy')).toBe('same-origin');
    expect(res.headers.get('strict-transport-security')).toBeNull();
  });

  it('hands the same nonce to the render (request headers), fresh on every request', () => {
    const a = page('/sign-in');
    const b = page('/sign-in');
    const nonceOf = (r: Response) => /'nonce-([^']+)'/.exec(r.headers.get('content-security-policy') ?? '')?.[1];
    expect(nonceOf(a)).toBeTruthy();
    expect(nonceOf(a)).not.toBe(nonceOf(b));
    // NextResponse.next({ request: { headers } }) carries the overridden request headers this way.
    expect(a.headers.get('x-middleware-request-x-nonce')).toBe(nonceOf(a));
    expect(a.headers.get('x-middleware-request-content-security-policy')).toBe(a.headers.get('content-security-policy'));
  });

  it.each(['/invite/some-token', '/reset-password/some-token'])('token page %s sends no Referer at all', (path) => {
    expect(page(path).headers.get('referrer-policy')).toBe('no-referrer');
  });

  it('keeps the sign-in gate for the signed-in areas only, with the headers on the redirect too', () => {
    const gated = page('/cells/abc?area=logic');
    expect(gated.status).toBe(307);
    const location = new URL(gated.headers.get('location')!);
    expect(`${location.pathname}${location.search}`).toBe(`/sign-in?callbackUrl=${encodeURIComponent('/cells/abc?area=logic')}`);
    expect(gated.headers.get('content-security-policy')).toContain("frame-ancestors 'none'");
    expect(page('/cells', 'next-auth.session-token=x').status).toBe(200);
    for (const path of ['/', '/sign-in', '/forgot-password', '/invite/t', '/reset-password/t', '/cellsx', '/no-such-page']) {
      expect(page(path).status, path).toBe(200);
    }
  });

  it('runs on pages, not on route handlers or built assets', () => {
    const [matcher] = config.matcher;
    const re = new RegExp(`^${matcher}$`);
    for (const path of ['/', '/sign-in', '/cells/1', '/runs/2/replay', '/invite/abc']) expect(re.test(path), path).toBe(true);
    for (const path of ['/api/health', '/api/auth/session', '/_next/static/chunks/a.js', '/_next/image', '/favicon.ico']) {
      expect(re.test(path), path).toBe(false);
    }
  });

  it('adds HSTS and upgrade-insecure-requests when the app is served over https', () => {
    const https = pageSecurityHeaders('/dashboard', { nonce: 'n', dev: false, engine: false, https: true });
    expect(https['strict-transport-security']).toBe(HSTS_VALUE);
    expect(directives(https['content-security-policy']).has('upgrade-insecure-requests')).toBe(true);
    const plain = pageSecurityHeaders('/dashboard', { nonce: 'n', dev: false, engine: false, https: false });
    expect(plain['strict-transport-security']).toBeUndefined();
  });

  it('allows eval (the engine compiles logic sheets to JavaScript) only on a signed-in visitor\'s pages', () => {
    expect(directives(page('/sign-in').headers.get('content-security-policy')).get('script-src')).not.toContain('unsafe-eval');
    expect(directives(page('/reset-password/t').headers.get('content-security-policy')).get('script-src')).not.toContain('unsafe-eval');
    const signedIn = page('/runs/x/replay', 'next-auth.session-token=x');
    expect(directives(signedIn.headers.get('content-security-policy')).get('script-src')).toMatch(/'strict-dynamic' 'unsafe-eval'$/);
  });

  it("allows React's development tooling only in development", () => {
    const dev = directives(pageSecurityHeaders('/', { nonce: 'n', dev: true, engine: false, https: false })['content-security-policy']);
    expect(dev.get('script-src')).toContain("'unsafe-eval'");
    const prod = directives(pageSecurityHeaders('/', { nonce: 'n', dev: false, engine: false, https: false })['content-security-policy']);
    expect(prod.get('script-src')).not.toContain('unsafe-eval');
    expect(prod.get('style-src-elem')).not.toContain('unsafe-inline');
  });
});

describe('API headers from next.config.mjs', () => {
  it('are the ones lib/security-headers.ts documents, on every /api path', async () => {
    // Loaded the way Next.js loads it (a plain .mjs file, no types of its own).
    const loaded = (await import(pathToFileURL('next.config.mjs').href)) as { default: NextConfig; API_SECURITY_HEADERS: Record<string, string> };
    const nextConfig = loaded.default;
    expect(loaded.API_SECURITY_HEADERS).toEqual(API_SECURITY_HEADERS);
    const rules = await nextConfig.headers!();
    expect(rules).toEqual([{ source: '/api/:path*', headers: Object.entries(API_SECURITY_HEADERS).map(([key, value]) => ({ key, value })) }]);
    expect(API_SECURITY_HEADERS['content-security-policy']).toContain("frame-ancestors 'none'");
    expect(API_SECURITY_HEADERS['x-content-type-options']).toBe('nosniff');
  });
});
