import { SMTPServer } from 'smtp-server';
import type { AddressInfo } from 'node:net';
import type { Mailbox } from './mailbox';

export interface SmtpSink {
  /** smtp:// URL that nodemailer can send to. */
  url: string;
  close(): Promise<void>;
}

/**
 * A loopback SMTP server that accepts every message and files it in the
 * development mailbox. No TLS and no authentication: it never leaves 127.0.0.1.
 */
export async function startSmtpSink(mailbox: Mailbox, options: { host?: string; port?: number } = {}): Promise<SmtpSink> {
  const host = options.host ?? '127.0.0.1';
  const server = new SMTPServer({
    banner: 'Eyrie development mail sink',
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    hideSTARTTLS: true,
    // Room for a campaign report with its charts attached.
    size: 15 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const to = session.envelope.rcptTo.map((r) => r.address);
        mailbox.add(Buffer.concat(chunks), to).then(() => callback(), callback);
      });
      stream.on('error', callback);
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  return {
    url: `smtp://${host}:${port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
