import 'server-only';
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/lib/env';
import { log } from '@/lib/log';

const g = globalThis as unknown as { tropopassMailer?: Transporter };

function transporter(): Transporter {
  if (!g.tropopassMailer) {
    const e = env();
    g.tropopassMailer = nodemailer.createTransport({
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      secure: false,
      ignoreTLS: e.SMTP_HOST === '127.0.0.1' || e.SMTP_HOST === 'localhost',
      connectionTimeout: 5000,
    });
  }
  return g.tropopassMailer;
}

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
  /** The Message-ID header, e.g. `<key@host>` (a resend of the same message keeps it); made up when absent. */
  messageId?: string;
}

/** A Message-ID for a key: `<key@domain of MAIL_FROM>`. */
export function messageIdFor(key: string): string {
  const domain = /@([A-Za-z0-9.-]+)>?\s*$/.exec(env().MAIL_FROM)?.[1] ?? 'tropopass.invalid';
  return `<${key}@${domain}>`;
}

/** Sends one message over SMTP; returns the message id. */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  const info = await transporter().sendMail({ from: env().MAIL_FROM, ...mail });
  log.info({ subject: mail.subject, recipients: Array.isArray(mail.to) ? mail.to.length : 1 }, 'mail sent');
  return info.messageId;
}
