// Runs the SMTP catcher: tsx --conditions=react-server scripts/mail-catcher.ts
// Port from CATCHER_PORT, else SMTP_PORT (the same variable the app sends to).
import { startCatcher, stopCatcher } from '@/lib/mail/catcher';
import { env } from '@/lib/env';
import { closeDb } from '@/db/knex';

async function main(): Promise<void> {
  const port = Number(process.env.CATCHER_PORT ?? env().SMTP_PORT);
  const server = await startCatcher({ port, log: (line) => console.log(`[mail-catcher] ${line}`) });
  console.log(`[mail-catcher] listening on 127.0.0.1:${port}`);
  const shutdown = async () => {
    await stopCatcher(server);
    await closeDb();
    process.exit(0);
  };
  process.on('SIGTERM', shutdown);
  process.on('SIGINT', shutdown);
}

main().catch((err) => {
  console.error(`[mail-catcher] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
