import 'server-only';
import nodemailer, { type Transporter } from 'nodemailer';

declare global {
  var __tallyvatMail: Transporter | undefined;
}

function transport(): Transporter {
  return (globalThis.__tallyvatMail ??= nodemailer.createTransport({
    // Pooled: the worker sends many messages over a few kept-open connections.
    pool: true,
    maxConnections: Number(process.env.SMTP_MAX_CONNECTIONS ?? 5),
    maxMessages: 1000,
    host: process.env.SMTP_HOST ?? '127.0.0.1',
    port: Number(process.env.SMTP_PORT ?? 2525),
    secure: false,
    ignoreTLS: process.env.SMTP_TLS !== '1',
    auth: process.env.SMTP_USER ? { user: process.env.SMTP_USER, pass: process.env.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 10_000,
  }));
}

export interface OutgoingMail {
  to: string;
  subject: string;
  /** Plain text body; e-mails are plain and readable in any client. */
  text: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
  /** The Message-ID header, `<…@domain>` (lib/mail/once.ts gives each message a stable one). */
  messageId?: string;
}

/**
 * Sends one e-mail; throws when the SMTP server could not be reached or refused it (the job
 * queue then tries again later).
 */
export async function deliverMail(mail: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: process.env.MAIL_FROM ?? 'Tallyvat <no-reply@tallyvat.localhost>', ...mail });
}

/** An absolute link into the app for e-mails. */
export function appUrl(path: string): string {
  const base = (process.env.APP_URL ?? process.env.NEXTAUTH_URL ?? 'http://localhost:3000').replace(/\/$/, '');
  return `${base}${path}`;
}
