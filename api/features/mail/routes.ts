import { Router, type Request } from 'express';
import type { Knex } from 'knex';
import { escapeHtml, htmlPage } from '../../lib/html';
import { UnauthenticatedError } from '../../lib/errors';
import type { Mailbox, MailboxMessage } from './mailbox';

/**
 * The messages the signed-in person may read: those addressed to their own e-mail, and, for an owner,
 * those sent from their projects (an owner may check what an invitation said). Nobody sees anyone else's links.
 */
async function visibleMessages(knex: Knex, mailbox: Mailbox, req: Request): Promise<MailboxMessage[]> {
  const user = req.user!;
  const email = user.email?.toLowerCase() ?? null;
  const owned = new Set(
    (await knex('project_members').where({ userId: user.id, role: 'owner' }).select('projectId')).map(
      (r: { projectId: string }) => r.projectId,
    ),
  );
  return mailbox
    .list()
    .filter((m) => (email !== null && m.to.some((to) => to.toLowerCase() === email)) || (m.projectId !== null && owned.has(m.projectId)));
}

/** /dev/mailbox: what the local SMTP sink received, for the signed-in reader only. Mounted only when dev tools are on. */
export function mailboxRouter(deps: { mailbox: Mailbox; realSmtp: boolean; knex: Knex }): Router {
  const router = Router();
  const linkify = (text: string) => escapeHtml(text).replace(/https?:\/\/[^\s<]+/g, (url) => `<a href="${url}">${url}</a>`);

  router.get('/dev/mailbox', async (req, res) => {
    res.set('cache-control', 'no-store');
    if (!req.user) {
      res
        .status(401)
        .type('html')
        .send(
          htmlPage(
            'Mailbox · Eyrie',
            `<h1>Development mailbox</h1>
            <section><p>Sign in to read the mail sent to your address. The mailbox shows each person only their own messages
            (and, to a project's owners, what was sent from that project).</p>
            <p><a href="/sign-in?returnTo=%2Fdev%2Fmailbox">Sign in</a> · <a href="/">Back to Eyrie</a></p></section>`,
          ),
        );
      return;
    }
    const messages = await visibleMessages(deps.knex, deps.mailbox, req);
    const body = messages.length
      ? messages
          .map(
            (m) => `<section aria-label="Message: ${escapeHtml(m.subject)}">
              <h2>${escapeHtml(m.subject || '(no subject)')}</h2>
              <p class="note">To ${escapeHtml(m.to.join(', '))} · from ${escapeHtml(m.from)} · received <time datetime="${m.receivedAt}">${escapeHtml(m.receivedAt.replace('T', ' ').slice(0, 19))} UTC</time></p>
              <pre>${linkify(m.text)}</pre></section>`,
          )
          .join('')
      : `<section><p>No messages for ${escapeHtml(req.user.email ?? 'you')} yet. Invitations sent to this address, or from projects you own, appear here.</p></section>`;
    res.type('html').send(
      htmlPage(
        'Mailbox · Eyrie',
        `<h1>Development mailbox</h1>
          <p class="note">${
            deps.realSmtp
              ? 'SMTP_URL is set, so mail goes to that server and nothing is caught here.'
              : `Mail Eyrie sent to ${escapeHtml(req.user.email ?? 'your address')} or from your projects, caught by the local SMTP sink on this computer, newest first. Nothing is delivered anywhere else.`
          } <a href="/">Back to Eyrie</a></p>${body}`,
      ),
    );
  });

  router.get('/dev/mailbox.json', async (req, res) => {
    res.set('cache-control', 'no-store');
    if (!req.user) throw new UnauthenticatedError('Sign in to read the development mailbox; it shows each person only their own mail.');
    res.json({ messages: await visibleMessages(deps.knex, deps.mailbox, req) });
  });

  return router;
}
