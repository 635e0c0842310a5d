/**
 * Where a visitor may be sent after signing in: a path on this app, never another origin.
 * One rule for the sign-in page, its form and next-auth's `redirect` callback.
 *
 * Refused, and replaced by the fallback:
 * - anything that does not start with a single `/` (`https://evil.example`, `javascript:…`,
 *   `evil.example`, `` ``);
 * - protocol-relative `//evil.example`, and `/\evil.example`, which browsers read as `//`
 *   (the WHATWG URL parser treats `\` like `/` in special schemes);
 * - control characters and whitespace, which the URL parser strips (`/\t/evil.example`
 *   becomes `//evil.example`);
 * - anything whose resolved origin is not `origin`.
 */
export const DEFAULT_AFTER_SIGN_IN = '/dashboard';

// C0 controls, space, DEL and the backslash: none belongs in a path we hand to a browser.
const FORBIDDEN = /[\u0000-\u0020\u007f\\]/;

/**
 * `candidate` as a same-origin path (`/cells/1?x=2#y`) when it is one, else `fallback`.
 * Absolute URLs on `origin` itself are accepted and reduced to their path.
 */
export function safeCallbackPath(candidate: string | null | undefined, origin: string, fallback = DEFAULT_AFTER_SIGN_IN): string {
  if (typeof candidate !== 'string' || candidate.length === 0 || candidate.length > 2000) return fallback;
  if (FORBIDDEN.test(candidate)) return fallback;
  let base: URL;
  try {
    base = new URL(origin);
  } catch {
    return fallback;
  }
  const isPath = candidate.startsWith('/') && !candidate.startsWith('//');
  const isAbsolute = /^https?:\/\//i.test(candidate);
  if (!isPath && !isAbsolute) return fallback;
  let resolved: URL;
  try {
    resolved = new URL(candidate, base);
  } catch {
    return fallback;
  }
  if (resolved.origin !== base.origin) return fallback;
  return `${resolved.pathname}${resolved.search}${resolved.hash}`;
}

/** next-auth's `redirect` callback rule: a same-origin target as an absolute URL, else the app's base URL. */
export function safeRedirectUrl(url: string, baseUrl: string): string {
  const path = safeCallbackPath(url, baseUrl, '');
  return path ? new URL(path, baseUrl).toString() : baseUrl;
}
