import { Navigate, useSearchParams } from 'react-router-dom';
import { Page, Panel } from '../../components/ui/page';
import { paths } from '../../config/paths';
import { useSession } from '../../lib/session';
import { safeReturnTo } from '../../../api/features/auth/schemas';

const problems: Record<string, string> = {
  unavailable:
    'Sign-in is not set up on this server: set GITHUB_CLIENT_ID and GITHUB_CLIENT_SECRET, or turn on the development tools (EYRIE_DEV_TOOLS=1) for the local sign-in page.',
  failed: 'Sign-in did not complete: the sign-in link may have expired or been used already. Please try again.',
  denied: 'Sign-in was cancelled at the provider.',
};

export function SignInRoute() {
  const [params] = useSearchParams();
  const session = useSession();
  const returnTo = params.get('returnTo') ?? undefined;
  const error = params.get('error');
  if (session.data?.user) return <Navigate to={safeReturnTo(returnTo) ?? paths.projects.getHref()} replace />;
  return (
    <Page title="Sign in" lead="Projects, campaigns and tokens need an account. The calculators work without one.">
      <div className="max-w-lg">
        <Panel>
          {error && (
            <p role="alert" className="mb-3 rounded border border-rose-300 bg-rose-50 px-3 py-2 text-sm text-rose-800">
              {problems[error] ?? 'Sign-in did not complete. Please try again.'}
            </p>
          )}
          <a
            href={paths.oauthStart.getHref(safeReturnTo(returnTo))}
            className="inline-flex items-center gap-2 rounded border border-ink-900 bg-ink-900 px-4 py-2 text-sm font-medium text-white hover:bg-ink-800"
          >
            Sign in with GitHub
          </a>
          {session.data?.devTools && (
            <p className="mt-3 text-sm text-ink-600">
              Development tools are on. Without GitHub credentials the button opens Eyrie’s local sign-in page, where you pick one of the
              invented Kestrelmoor Laboratories people (owner, editor, viewer, outsider) or type an identity.
            </p>
          )}
        </Panel>
      </div>
    </Page>
  );
}
