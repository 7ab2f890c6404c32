import nodemailer from 'nodemailer';

export type MailMessage = { to: string; subject: string; text: string; html?: string };
export interface Mailer {
  send(message: MailMessage): Promise<{ messageId: string }>;
  close(): void;
}

/** SMTP through nodemailer: the local fake in development and tests, a hosted provider in production. */
export function createSmtpMailer(options: { host: string; port: number; from: string }): Mailer {
  const transport = nodemailer.createTransport({
    host: options.host,
    port: options.port,
    secure: false,
    ignoreTLS: true,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
  });
  return {
    async send(message) {
      const info = await transport.sendMail({ from: options.from, ...message });
      return { messageId: String(info.messageId) };
    },
    close() {
      transport.close();
    },
  };
}
