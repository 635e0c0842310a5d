/**
 * Response headers for pages (set per request by proxy.ts, with a fresh CSP nonce) and for
 * API responses (static, next.config.mjs keeps the same values in `API_SECURITY_HEADERS`
 * there, since a .mjs config cannot import TypeScript; tests/integration/security-headers
 * checks both agree). Pure functions: no Next.js, no environment reads.
 */

/** Pages that carry a single-use token in their path: no Referer may ever repeat it. */
const TOKEN_PAGE = /^\/(invite|reset-password)(\/|$)/;

export interface PageHeaderOptions {
  nonce: string;
  /** NODE_ENV === 'development': React's dev tools need eval and inject style elements. */
  dev: boolean;
  /**
   * The page may run the engine on the main thread: a visitor with a session (the engine's
   * pages are all signed-in ones). See `pageContentSecurityPolicy` for why that needs eval.
   */
  engine: boolean;
  /** NEXTAUTH_URL is https: HSTS and upgrade-insecure-requests. */
  https: boolean;
}

/**
 * The Content-Security-Policy of a page, following the nonce approach of the Next.js 16
 * guide ("How to set a Content Security Policy", node_modules/next/dist/docs/01-app/02-guides/
 * content-security-policy.md): Next.js reads the nonce from this header on the request and
 * puts it on its own scripts; 'strict-dynamic' lets those load the page's chunks.
 * What the app needs beyond the guide's example, and why:
 * - `style-src-attr 'unsafe-inline'`: server-rendered `style="…"` attributes (React Flow's
 *   node and edge positions on the logic sheet, widths of bars and meters). Attributes
 *   cannot carry a nonce; `<style>` elements still need one (`style-src-elem`).
 * - `worker-src 'self' blob:`: the engine runs in a Web Worker built from the app's own chunk
 *   (components/workspace/engine-connection.ts); a bundler may start it from a blob: URL.
 * - `img-src 'self' data: blob:`: drill brief images come from the app's own asset route;
 *   data: and blob: cover icons and exported pictures made in the browser.
 * - `font-src 'self'`: both faces are shipped with the app (app/fonts, next/font/local).
 * - `connect-src 'self'`: fetches and live updates go to the app's own origin only.
 * - `'unsafe-eval'` in `script-src` for a signed-in visitor only: the engine compiles a logic
 *   sheet to JavaScript with `new Function` (simulator/plc/compile.ts, its fast path by
 *   design), and besides the engine worker the replay, the rule editors and cell validation run
 *   it on the main thread. The generated code holds only numbers and parsed addresses, never
 *   text from a document. Anonymous pages (sign-in, reset and invitation links, the landing
 *   page) never run the engine and never get it. Keyed on the session cookie rather than the
 *   path because client-side navigation keeps the first document's policy: a signed-in user
 *   who lands on `/` and follows a link into a workspace must still be able to run it.
 * Everything else falls back to `default-src 'self'`; plugins and <base> tricks are off.
 */
export function pageContentSecurityPolicy({ nonce, dev, engine, https }: PageHeaderOptions): string {
  const directives: string[] = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev || engine ? " 'unsafe-eval'" : ''}`,
    // The guide's development variant: dev tooling injects <style> elements without a nonce.
    `style-src 'self' ${dev ? "'unsafe-inline'" : `'nonce-${nonce}'`}`,
    `style-src-elem 'self' ${dev ? "'unsafe-inline'" : `'nonce-${nonce}'`}`,
    "style-src-attr 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
    "media-src 'self'",
    "frame-src 'none'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ];
  // Only on https: on plain http it would send the app's own requests to an https port that is not there.
  if (https) directives.push('upgrade-insecure-requests');
  return directives.join('; ');
}

/**
 * HSTS: one year (31,536,000 s, the minimum the HSTS preload list asks for; common practice).
 * No includeSubDomains: a college or plant domain hosts other services we know nothing about.
 */
export const HSTS_VALUE = 'max-age=31536000';

/** Every security header of a page response, by lower-case name. */
export function pageSecurityHeaders(pathname: string, options: PageHeaderOptions): Record<string, string> {
  const headers: Record<string, string> = {
    'content-security-policy': pageContentSecurityPolicy(options),
    // Token pages: the token is in the path, so no Referer at all (also not to our own origin's
    // logs). Elsewhere only same-origin requests get one: the app has nothing to tell other sites.
    'referrer-policy': TOKEN_PAGE.test(pathname) ? 'no-referrer' : 'same-origin',
    'x-content-type-options': 'nosniff',
    // For browsers without CSP's frame-ancestors (OWASP Clickjacking Defense Cheat Sheet, from memory).
    'x-frame-options': 'DENY',
  };
  if (options.https) headers['strict-transport-security'] = HSTS_VALUE;
  return headers;
}

/**
 * Headers for every API response: JSON and CSV are never documents to render, frame or sniff.
 * `default-src 'none'` keeps a response opened directly in a tab from running anything
 * (OWASP REST Security Cheat Sheet, "Security headers", from memory).
 */
export const API_SECURITY_HEADERS: Readonly<Record<string, string>> = {
  'content-security-policy': "default-src 'none'; frame-ancestors 'none'",
  'x-content-type-options': 'nosniff',
  'x-frame-options': 'DENY',
  'referrer-policy': 'no-referrer',
};

/** A fresh CSP nonce: 128 random bits, base64 (the Next.js guide uses a random UUID; same idea). */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}
