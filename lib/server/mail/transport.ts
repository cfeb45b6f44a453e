import nodemailer, { type Transporter } from 'nodemailer';
import { mailEnv } from '@/lib/server/env';

/** A message ready to send: plain text always, HTML as the richer alternative. */
export type MailMessage = { to: string; subject: string; text: string; html: string };

export class MailNotConfiguredError extends Error {
  constructor() {
    super('SMTP_URL is not set, so Switchback cannot send e-mail. Start the app with "npm start" (local test mail server) or set SMTP_URL.');
    this.name = 'MailNotConfiguredError';
  }
}

const transports = new Map<string, Transporter>();

/**
 * The current mail settings, read from the environment on every call (not cached), so a test can
 * point SMTP_URL at its own server and the running app follows a changed setting after a restart.
 */
export function mailSettings() {
  const env = mailEnv();
  return { smtpUrl: env.SMTP_URL ?? null, from: env.MAIL_FROM };
}

function transportFor(url: string): Transporter {
  let transport = transports.get(url);
  if (!transport) {
    // Timeouts keep a dead server from holding a request open for minutes.
    transport = nodemailer.createTransport(url, { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 20_000 });
    transports.set(url, transport);
  }
  return transport;
}

/**
 * Sends one message through the SMTP server named by SMTP_URL.
 * @throws MailNotConfiguredError when SMTP_URL is unset; the transport's error when the server refuses.
 */
export async function sendMail(message: MailMessage): Promise<void> {
  const { smtpUrl, from } = mailSettings();
  if (!smtpUrl) throw new MailNotConfiguredError();
  await transportFor(smtpUrl).sendMail({ from, ...message });
}

/**
 * Sends a message without making the caller wait; a failure is logged, never thrown. For mail whose
 * delivery must not change the reply (a password-reset request answers the same either way).
 */
export function queueMail(message: MailMessage, what: string): Promise<boolean> {
  return sendMail(message).then(
    () => true,
    (error: unknown) => {
      console.error(`[switchback] could not send ${what}:`, error instanceof Error ? error.message : error);
      return false;
    },
  );
}
