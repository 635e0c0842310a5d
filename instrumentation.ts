/**
 * Runs once when a Next.js server starts, and must finish before it answers any request
 * (Next.js 16 docs, node_modules/next/dist/docs/01-app/03-api-reference/03-file-conventions/
 * instrumentation.md: `register` "is called once when a new Next.js server instance is
 * initiated, and must complete before the server is ready to handle requests").
 * The start-up duties are Node.js-only (lib/server-startup.ts); the edge build drops them.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME === 'nodejs') {
    const { startServer } = await import('@/lib/server-startup');
    startServer();
  }
}
