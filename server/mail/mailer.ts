import nodemailer, { type Transporter } from 'nodemailer';

/** One outgoing e-mail. */
export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/** Sends e-mail; the app only knows this interface. */
export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

/** A mailer over SMTP (the local fake in development and tests, a real relay in production). */
export function createSmtpMailer(smtpUrl: string, from: string): Mailer {
  // pool: the fake SMTP server waits ~100 ms per new connection; reuse them.
  const url = new URL(smtpUrl);
  const transport: Transporter = nodemailer.createTransport({
    pool: true,
    host: url.hostname,
    port: Number(url.port) || (url.protocol === 'smtps:' ? 465 : 587),
    secure: url.protocol === 'smtps:',
    auth: url.username
      ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) }
      : undefined,
  });
  return {
    async send(message) {
      await transport.sendMail({ from, ...message });
    },
    close() {
      transport.close();
    },
  };
}
