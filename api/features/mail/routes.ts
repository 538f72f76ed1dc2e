import { Router } from 'express';
import { escapeHtml, htmlPage } from '../../lib/html';
import type { Mailbox } from './mailbox';

/** /dev/mailbox: what the local SMTP sink received. Mounted only when dev tools are on. */
export function mailboxRouter(deps: { mailbox: Mailbox; realSmtp: boolean }): Router {
  const router = Router();
  const linkify = (text: string) => escapeHtml(text).replace(/https?:\/\/[^\s<]+/g, (url) => `<a href="${url}">${url}</a>`);

  router.get('/dev/mailbox', (_req, res) => {
    const messages = deps.mailbox.list();
    const body = messages.length
      ? messages
          .map(
            (m) => `<section aria-label="Message: ${escapeHtml(m.subject)}">
              <h2>${escapeHtml(m.subject || '(no subject)')}</h2>
              <p class="note">To ${escapeHtml(m.to.join(', '))} · from ${escapeHtml(m.from)} · received <time datetime="${m.receivedAt}">${escapeHtml(m.receivedAt.replace('T', ' ').slice(0, 19))} UTC</time></p>
              <pre>${linkify(m.text)}</pre></section>`,
          )
          .join('')
      : `<section><p>No messages yet. Invite someone from a project's settings and the e-mail appears here.</p></section>`;
    res
      .set('cache-control', 'no-store')
      .type('html')
      .send(
        htmlPage(
          'Mailbox · Eyrie',
          `<h1>Development mailbox</h1>
          <p class="note">${
            deps.realSmtp
              ? 'SMTP_URL is set, so mail goes to that server and nothing is caught here.'
              : 'Every e-mail Eyrie sends is caught by the local SMTP sink on this computer and shown here, newest first. Nothing is delivered anywhere else.'
          } <a href="/">Back to Eyrie</a></p>${body}`,
        ),
      );
  });

  router.get('/dev/mailbox.json', (_req, res) => {
    res.set('cache-control', 'no-store').json({ messages: deps.mailbox.list() });
  });

  return router;
}
