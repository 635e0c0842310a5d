import 'server-only';
import { after } from 'next/server';

const pending = new Set<Promise<void>>();

/**
 * Run `task` once the response has been sent (Next.js `after()` from 'next/server', which
 * route handlers may call; docs: node_modules/next/dist/docs/.../functions/after.md), so
 * its duration never shows in the response time. A failure is logged, never thrown: the
 * response has already gone.
 *
 * `after()` needs Next.js's request scope. A handler called outside it (the integration
 * tests call handlers directly) runs the task at once in the background instead;
 * `settleAfterResponse()` waits for those.
 */
export function runAfterResponse(label: string, task: () => Promise<void>): void {
  const guarded = async () => {
    try {
      await task();
    } catch (err) {
      console.error(`[after] ${label} failed`, err);
    }
  };
  try {
    after(guarded);
    return;
  } catch {
    // Outside a request scope: see above.
  }
  const running: Promise<void> = guarded().finally(() => pending.delete(running));
  pending.add(running);
}

/** Resolves when every task started outside a request scope has finished (tests). */
export async function settleAfterResponse(): Promise<void> {
  while (pending.size > 0) await Promise.all([...pending]);
}
