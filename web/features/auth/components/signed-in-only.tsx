import type { ReactNode } from 'react';
import { Link, useLocation } from 'react-router-dom';
import { Page, Panel } from '../../../components/ui/page';
import { paths } from '../../../config/paths';
import { useSession, type SessionUser } from '../../../lib/session';

/** Renders its children for a signed-in person; otherwise asks them to sign in and come back here. */
export function SignedInOnly({ title, children }: { title: string; children: (user: SessionUser) => ReactNode }) {
  const session = useSession();
  const location = useLocation();
  if (session.isPending)
    return (
      <Page title={title}>
        <p className="text-sm text-ink-500">Loading…</p>
      </Page>
    );
  if (!session.data?.user) {
    return (
      <Page title={title}>
        <Panel>
          <p className="text-sm text-ink-700">Sign in to see this page.</p>
          <Link
            className="mt-3 inline-block rounded border border-fjord-700 bg-fjord-600 px-3 py-1.5 text-sm font-medium text-white"
            to={paths.signIn.getHref(location.pathname + location.search)}
          >
            Sign in
          </Link>
        </Panel>
      </Page>
    );
  }
  return <>{children(session.data.user)}</>;
}
