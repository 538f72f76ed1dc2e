import { randomUUID } from 'node:crypto';
import { simpleParser, type AddressObject, type Source } from 'mailparser';

/** One message as the development mailbox shows it. */
export interface MailboxMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  /** The project the message was sent from (its X-Eyrie-Project header), if any. */
  projectId: string | null;
  /** Attached files (name, type, decoded size); their bytes through `Mailbox.attachment`. */
  attachments: { filename: string; contentType: string; size: number }[];
}

/**
 * Messages caught by the local SMTP sink, newest first, kept in memory only.
 * Development tool: it exists so invitations can be followed without a mail server.
 */
export class Mailbox {
  private messages: MailboxMessage[] = [];
  private contents = new WeakMap<MailboxMessage, Buffer[]>();
  constructor(private readonly capacity = 200) {}

  /** Store a raw RFC 5322 message (MIME decoded by mailparser); `envelopeTo` wins over the To header when given. */
  async add(raw: Source, envelopeTo: string[] = []): Promise<MailboxMessage> {
    const parsed = await simpleParser(raw);
    const attachments = parsed.attachments.filter((a) => a.contentDisposition === 'attachment');
    const project = parsed.headers.get('x-eyrie-project');
    const message: MailboxMessage = {
      id: randomUUID(),
      receivedAt: new Date().toISOString(),
      from: parsed.from?.text ?? '',
      to: envelopeTo.length ? envelopeTo : addressesOf(parsed.to),
      subject: parsed.subject ?? '',
      text: (parsed.text ?? '').trim(),
      projectId: typeof project === 'string' ? project : null,
      attachments: attachments.map((a) => ({ filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.content.length })),
    };
    this.contents.set(
      message,
      attachments.map((a) => a.content),
    );
    this.messages.unshift(message);
    this.messages.length = Math.min(this.messages.length, this.capacity);
    return message;
  }

  list(): MailboxMessage[] {
    return [...this.messages];
  }

  get(id: string): MailboxMessage | undefined {
    return this.messages.find((m) => m.id === id);
  }

  /** The bytes of a message's attachment, by its position in `attachments`. */
  attachment(message: MailboxMessage, index: number): Buffer | undefined {
    return this.contents.get(message)?.[index];
  }
}

const addressesOf = (field: AddressObject | AddressObject[] | undefined): string[] =>
  (Array.isArray(field) ? field : field ? [field] : []).flatMap((f) => f.value.map((a) => a.address ?? '')).filter(Boolean);
