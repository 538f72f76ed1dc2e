import { randomUUID } from 'node:crypto';

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

  /** Store a raw RFC 5322 message; `envelopeTo` wins over the To header when given. */
  add(raw: string, envelopeTo: string[] = []): MailboxMessage {
    const parsed = parseMessage(raw);
    const message: MailboxMessage = {
      id: randomUUID(),
      receivedAt: new Date().toISOString(),
      from: parsed.headers.get('from') ?? '',
      to: envelopeTo.length ? envelopeTo : splitAddresses(parsed.headers.get('to') ?? ''),
      subject: parsed.headers.get('subject') ?? '',
      text: parsed.text,
      projectId: parsed.headers.get('x-eyrie-project') ?? null,
      attachments: parsed.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.content.length })),
    };
    this.contents.set(
      message,
      parsed.attachments.map((a) => a.content),
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

const splitAddresses = (value: string) =>
  value
    .split(',')
    .map((a) => (/<([^>]+)>/.exec(a)?.[1] ?? a).trim())
    .filter(Boolean);

/** Decode RFC 2047 encoded words (=?utf-8?Q?…?= / =?utf-8?B?…?=) in a header value. */
export function decodeHeaderWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([bBqQ])\?([^?]*)\?=/g, (_m, charset: string, enc: string, data: string) => {
      const bytes =
        enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64') : Buffer.from(decodeQuotedPrintable(data.replace(/_/g, ' ')), 'latin1');
      return new TextDecoder(charset.toLowerCase()).decode(bytes);
    });
}

/** Quoted-printable to a binary (latin1) string of the original bytes. */
function decodeQuotedPrintable(text: string): string {
  return text.replace(/=\r?\n/g, '').replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16)));
}

interface Part {
  headers: Map<string, string>;
  body: string;
}

function splitPart(raw: string): Part {
  const normalized = raw.replace(/\r\n/g, '\n');
  const cut = normalized.indexOf('\n\n');
  const head = cut === -1 ? normalized : normalized.slice(0, cut);
  const body = cut === -1 ? '' : normalized.slice(cut + 2);
  const headers = new Map<string, string>();
  for (const line of head.replace(/\n[ \t]+/g, ' ').split('\n')) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), decodeHeaderWords(line.slice(colon + 1).trim()));
  }
  return { headers, body };
}

function decodeBody(part: Part): string {
  const encoding = (part.headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  const charset = /charset="?([^";]+)"?/i.exec(part.headers.get('content-type') ?? '')?.[1] ?? 'utf-8';
  let bytes: Buffer;
  if (encoding === 'base64') bytes = Buffer.from(part.body.replace(/\s+/g, ''), 'base64');
  else if (encoding === 'quoted-printable') bytes = Buffer.from(decodeQuotedPrintable(part.body), 'latin1');
  else bytes = Buffer.from(part.body, 'utf8');
  return new TextDecoder(charset.toLowerCase()).decode(bytes);
}

/** Find the first text/plain part (multipart is walked); fall back to HTML stripped of tags. */
function textOf(part: Part): { text: string; html: boolean } | null {
  const type = (part.headers.get('content-type') ?? 'text/plain').toLowerCase();
  if (type.startsWith('multipart/')) {
    const boundary = /boundary="?([^";]+)"?/i.exec(part.headers.get('content-type') ?? '')?.[1];
    if (!boundary) return null;
    const pieces = part.body.split(`--${boundary}`).slice(1);
    let fallback: { text: string; html: boolean } | null = null;
    for (const piece of pieces) {
      if (piece.startsWith('--')) break;
      const found = textOf(splitPart(piece.replace(/^\n/, '')));
      if (found && !found.html) return found;
      fallback ??= found;
    }
    return fallback;
  }
  if (type.startsWith('text/plain')) return { text: decodeBody(part), html: false };
  if (type.startsWith('text/html')) return { text: decodeBody(part).replace(/<[^>]+>/g, ''), html: true };
  return null;
}

interface ParsedAttachment {
  filename: string;
  contentType: string;
  content: Buffer;
}

/** Parts sent as attachments (Content-Disposition: attachment), walking nested multiparts. */
function attachmentsOf(part: Part, out: ParsedAttachment[] = []): ParsedAttachment[] {
  const type = part.headers.get('content-type') ?? 'text/plain';
  if (type.toLowerCase().startsWith('multipart/')) {
    const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
    if (!boundary) return out;
    for (const piece of part.body.split(`--${boundary}`).slice(1)) {
      if (piece.startsWith('--')) break;
      attachmentsOf(splitPart(piece.replace(/^\n/, '')), out);
    }
    return out;
  }
  const disposition = part.headers.get('content-disposition') ?? '';
  if (!/^attachment/i.test(disposition)) return out;
  const filename = /filename="?([^";]+)"?/i.exec(disposition)?.[1] ?? /name="?([^";]+)"?/i.exec(type)?.[1] ?? 'attachment';
  const encoding = (part.headers.get('content-transfer-encoding') ?? '').toLowerCase();
  const content = encoding === 'base64' ? Buffer.from(part.body.replace(/\s+/g, ''), 'base64') : Buffer.from(part.body, 'latin1');
  out.push({ filename, contentType: type.split(';')[0]!.trim(), content });
  return out;
}

export function parseMessage(raw: string): { headers: Map<string, string>; text: string; attachments: ParsedAttachment[] } {
  const top = splitPart(raw);
  return { headers: top.headers, text: (textOf(top)?.text ?? '').trim(), attachments: attachmentsOf(top) };
}
