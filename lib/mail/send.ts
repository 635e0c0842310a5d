import 'server-only';
import nodemailer from 'nodemailer';
import type { Transporter } from 'nodemailer';
import { env } from '@/lib/env';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

const globalForMail = globalThis as unknown as { cellwrightMailer?: Transporter };

function transporter(): Transporter {
  const e = env();
  globalForMail.cellwrightMailer ??= nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASS ?? '' } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 10_000,
  });
  return globalForMail.cellwrightMailer;
}

/** Send one message through the configured SMTP server (the local catcher in development). */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transporter().sendMail({ from: env().MAIL_FROM, ...mail });
}
