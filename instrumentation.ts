/**
 * Runs once when a Next.js server starts, and must finish before it answers any request
 * (Next.js 16 docs, "instrumentation.js": `register` is "called once when a new Next.js
 * server instance is initiated, and must complete before the server is ready to handle
 * requests"). Two start-up duties live here:
 *
 * - parse the configuration now, so `next start` in production with a missing, short or
 *   published NEXTAUTH_SECRET exits at once with the reason (lib/env.ts), instead of
 *   serving pages and failing on the first sign-in;
 * - stamp each request with its socket's peer address, the only client address a route
 *   handler can trust when no proxy is configured (lib/auth/client-address.ts).
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { env } = await import('@/lib/env');
  try {
    env();
  } catch (err) {
    // Said plainly on stderr: the stack trace Next.js prints around it is long.
    console.error(`\nCellwright cannot start: ${(err as Error).message}\n`);
    throw err;
  }
  const { installPeerAddressHeader } = await import('@/lib/auth/client-address');
  installPeerAddressHeader();
}
