import { env } from '@/lib/env';
import { installPeerAddressHeader } from '@/lib/auth/client-address';

/**
 * What a Node.js server process does once at start-up, before it answers anything
 * (called from instrumentation.ts's `register`):
 *
 * - parse the configuration now, so `next start` in production with a missing, short or
 *   published NEXTAUTH_SECRET exits at once with the reason (lib/env.ts), instead of serving
 *   pages and failing on the first sign-in. Said plainly on stderr, then exit: `next start`
 *   only logs a failed `register()` ("Failed to prepare server") and keeps listening,
 *   answering every request with an error;
 * - stamp each request with its socket's peer address, the only client address a route
 *   handler can trust when no proxy is configured (lib/auth/client-address.ts).
 */
export function startServer(): void {
  try {
    env();
  } catch (err) {
    console.error(`\nCellwright cannot start: ${(err as Error).message}\n`);
    process.exit(1);
  }
  installPeerAddressHeader();
}
