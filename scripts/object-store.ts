// The local S3 fake for development and tests: tsx scripts/object-store.ts
// Serves the S3 API on loopback (s3rver) for the bucket in S3_BUCKET, at the port of
// S3_ENDPOINT (or S3_FAKE_PORT), keeping objects in S3_FAKE_DIR (default .local/s3, git-ignored).
// S3_FAKE_RESET=1 empties that folder first and again on exit (the test runs' own buckets).
import { mkdirSync, rmSync } from 'node:fs';
import path from 'node:path';
import S3rver from 's3rver';
import { env } from '@/lib/env';

async function main(): Promise<void> {
  const { S3_ENDPOINT, S3_BUCKET } = env();
  const endpoint = S3_ENDPOINT ? new URL(S3_ENDPOINT) : null;
  if (!endpoint || !['127.0.0.1', 'localhost', '[::1]'].includes(endpoint.hostname)) {
    throw new Error(`S3_ENDPOINT must be a loopback address for the local fake (got ${S3_ENDPOINT ?? 'none'})`);
  }
  const port = Number(process.env.S3_FAKE_PORT ?? (endpoint.port || 80));
  const directory = path.resolve(process.env.S3_FAKE_DIR ?? '.local/s3');
  const reset = process.env.S3_FAKE_RESET === '1';
  if (reset) rmSync(directory, { recursive: true, force: true });
  mkdirSync(directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port,
    directory,
    silent: true,
    resetOnClose: reset,
    configureBuckets: [{ name: S3_BUCKET }],
  });
  await server.run();
  console.log(`[object-store] bucket "${S3_BUCKET}" on http://127.0.0.1:${port} (files in ${path.relative(process.cwd(), directory) || '.'})`);
  const shutdown = async () => {
    await server.close().catch(() => undefined);
    process.exit(0);
  };
  process.on('SIGTERM', shutdown);
  process.on('SIGINT', shutdown);
}

main().catch((err) => {
  console.error(`[object-store] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
