import 'server-only';
import { db } from './knex';

export interface StoredMail {
  envelopeFrom: string;
  envelopeTo: string[];
  fromHeader: string;
  toHeader: string;
  subject: string;
  textBody: string;
  htmlBody: string | null;
  sizeBytes: number;
}

export interface MailSummary {
  id: string;
  fromHeader: string;
  toHeader: string;
  subject: string;
  receivedAt: string;
}

export interface MailMessage extends MailSummary {
  envelopeFrom: string;
  envelopeTo: string[];
  textBody: string;
  htmlBody: string | null;
  sizeBytes: number;
}

export async function insertMail(m: StoredMail): Promise<string> {
  const [row] = await db()('mail_messages')
    .insert({
      envelope_from: m.envelopeFrom,
      envelope_to: m.envelopeTo,
      from_header: m.fromHeader,
      to_header: m.toHeader,
      subject: m.subject,
      text_body: m.textBody,
      html_body: m.htmlBody,
      size_bytes: m.sizeBytes,
    })
    .returning('id');
  return String(row.id);
}

export async function listMail(limit = 100): Promise<MailSummary[]> {
  const rows = await db()('mail_messages')
    .select('id', 'from_header', 'to_header', 'subject', 'received_at')
    .orderBy('id', 'desc')
    .limit(limit);
  return rows.map((r) => ({
    id: String(r.id),
    fromHeader: r.from_header,
    toHeader: r.to_header,
    subject: r.subject,
    receivedAt: new Date(r.received_at).toISOString(),
  }));
}

export async function countMail(): Promise<number> {
  const [{ count }] = await db()('mail_messages').count<{ count: string }[]>({ count: '*' });
  return Number(count);
}

export async function getMail(id: number): Promise<MailMessage | null> {
  const r = await db()('mail_messages').where({ id }).first();
  if (!r) return null;
  return {
    id: String(r.id),
    fromHeader: r.from_header,
    toHeader: r.to_header,
    subject: r.subject,
    receivedAt: new Date(r.received_at).toISOString(),
    envelopeFrom: r.envelope_from,
    envelopeTo: r.envelope_to,
    textBody: r.text_body,
    htmlBody: r.html_body,
    sizeBytes: r.size_bytes,
  };
}
