import nodemailer, { type SendMailOptions } from 'nodemailer';
import { describe, expect, it } from 'vitest';
import { Mailbox } from '../../../api/features/mail/mailbox';

/** Render a message with nodemailer exactly as it goes over SMTP (MIME, encoded words, base64/quoted-printable). */
async function render(mail: SendMailOptions): Promise<Buffer> {
  const transport = nodemailer.createTransport({ streamTransport: true, buffer: true });
  const info = await transport.sendMail(mail);
  return info.message as Buffer;
}

describe('development mailbox', () => {
  it('when a message has a non-ASCII subject, a long accented body and an attachment, then the mailbox shows them decoded', async () => {
    const body = `Réaction à −20 °C: ee 94,5 % (énantiomère majoritaire). ${'Ligne longue. '.repeat(20)}`;
    const csv = Buffer.from('temperature,ee\n−20,94.5\n', 'utf8');
    const raw = await render({
      from: 'Eyrie <no-reply@eyrie.example>',
      to: 'Ana Pérez <ana@example.test>, bo@example.test',
      subject: 'Écran de température — résumé',
      text: body,
      headers: { 'X-Eyrie-Project': 'p-123' },
      attachments: [{ filename: 'screen résumé.csv', content: csv, contentType: 'text/csv' }],
    });
    // nodemailer encodes all three: the check below means the decoding is done, not skipped.
    expect(raw.toString('latin1')).not.toContain('Écran');

    const box = new Mailbox();
    const message = await box.add(raw);
    expect(message.subject).toBe('Écran de température — résumé');
    expect(message.text).toBe(body.trim());
    expect(message.to).toEqual(['ana@example.test', 'bo@example.test']);
    expect(message.from).toContain('no-reply@eyrie.example');
    expect(message.projectId).toBe('p-123');
    expect(message.attachments).toEqual([{ filename: 'screen résumé.csv', contentType: 'text/csv', size: csv.length }]);
    expect(box.attachment(message, 0)?.equals(csv)).toBe(true);
  });

  it('when the envelope names recipients and the message is HTML only, then the envelope wins and the text is the HTML without tags', async () => {
    const raw = await render({ from: 'a@example.test', to: 'header@example.test', subject: 'Hi', html: '<p>Join <b>the</b> project</p>' });
    const box = new Mailbox();
    const message = await box.add(raw, ['envelope@example.test']);
    expect(message.to).toEqual(['envelope@example.test']);
    expect(message.text).toContain('Join the project');
    expect(message.text).not.toContain('<');
    expect(message.attachments).toEqual([]);
    expect(box.list().map((m) => m.id)).toEqual([message.id]);
  });

  it('when more messages arrive than it holds, then the oldest are dropped and the newest comes first', async () => {
    const box = new Mailbox(2);
    for (const subject of ['one', 'two', 'three'])
      await box.add(await render({ from: 'a@example.test', to: 'b@example.test', subject, text: subject }));
    expect(box.list().map((m) => m.subject)).toEqual(['three', 'two']);
  });
});
