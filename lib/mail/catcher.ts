import 'server-only';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressObject } from 'mailparser';
import { insertMail } from '@/db/mail';

function addressText(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return '';
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', ');
}

/**
 * A local SMTP server that accepts every message over a real SMTP
 * conversation and stores it in `mail_messages` for the admin Mailbox.
 * Loopback only, no TLS, no auth: it is a development and test catcher.
 */
export function startCatcher(opts: { host?: string; port: number; log?: (line: string) => void }): Promise<SMTPServer> {
  const log = opts.log ?? (() => {});
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    banner: 'Cellwright mail catcher',
    size: 10 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      let size = 0;
      stream.on('data', (chunk: Buffer) => (size += chunk.length));
      simpleParser(stream)
        .then(async (parsed) => {
          const id = await insertMail({
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            envelopeTo: session.envelope.rcptTo.map((r) => r.address),
            fromHeader: addressText(parsed.from),
            toHeader: addressText(parsed.to),
            subject: parsed.subject ?? '',
            textBody: parsed.text ?? '',
            htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
            sizeBytes: size,
          });
          log(`stored message ${id}: ${parsed.subject ?? ''}`);
          callback();
        })
        .catch((err: unknown) => {
          log(`could not store message: ${err instanceof Error ? err.message : String(err)}`);
          callback(new Error('message could not be stored'));
        });
    },
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => {
      server.off('error', reject);
      server.on('error', (err) => log(`smtp error: ${err.message}`));
      resolve(server);
    });
  });
}

export function stopCatcher(server: SMTPServer): Promise<void> {
  return new Promise((resolve) => server.close(() => resolve()));
}
