import nodemailer from 'nodemailer';
import type { Mailbox } from './mailbox';

export interface MailAttachment {
  filename: string;
  content: Buffer;
  contentType: string;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  /** The project the mail is about; sent as a header so the development mailbox can show it to that project's owners. */
  projectId?: string;
  attachments?: MailAttachment[];
}

/** Header naming the project a message was sent from. */
export const PROJECT_HEADER = 'X-Eyrie-Project';

const toNodemailer = (from: string, { projectId, ...mail }: OutgoingMail) => ({
  from,
  ...mail,
  ...(projectId ? { headers: { [PROJECT_HEADER]: projectId } } : {}),
});

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
}

/** Send through an SMTP server: the local sink (smtp://127.0.0.1:port) or SMTP_URL. */
export function createSmtpMailer(smtpUrl: string, from: string): Mailer {
  const transport = nodemailer.createTransport(smtpUrl);
  return {
    async send(mail) {
      await transport.sendMail(toNodemailer(from, mail));
    },
  };
}

/**
 * Without any SMTP server (an app built in a test that needs no mail), messages
 * are rendered by nodemailer exactly as for SMTP and filed straight into the mailbox.
 */
export function createInProcessMailer(mailbox: Mailbox, from: string): Mailer {
  const transport = nodemailer.createTransport({ streamTransport: true, buffer: true });
  return {
    async send(mail) {
      const info = await transport.sendMail(toNodemailer(from, mail));
      await mailbox.add(info.message, [mail.to]);
    },
  };
}
