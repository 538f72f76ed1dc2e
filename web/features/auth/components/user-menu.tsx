import { Link, useLocation, useNavigate } from 'react-router-dom';
import { paths } from '../../../config/paths';
import { useSession } from '../../../lib/session';
import { useSignOut } from '../../../lib/sign-out';

/** Header slot: the signed-in person with their links and sign-out, or a Sign in link. */
export function UserMenu() {
  const session = useSession();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const location = useLocation();
  const user = session.data?.user;

  if (!user) {
    return (
      <Link
        to={paths.signIn.getHref(location.pathname === paths.signIn.path ? undefined : location.pathname)}
        className="rounded border border-slate-500 px-3 py-1 text-sm text-slate-100 hover:bg-ink-800"
      >
        Sign in
      </Link>
    );
  }
  return (
    <details className="relative">
      <summary className="flex cursor-pointer list-none items-center gap-2 rounded px-2 py-1 text-sm text-slate-100 hover:bg-ink-800">
        <span aria-hidden="true" className="grid h-6 w-6 place-items-center rounded-full bg-fjord-600 text-xs font-semibold">
          {(user.displayName ?? user.login).slice(0, 1).toUpperCase()}
        </span>
        <span className="sr-only">Account: </span>
        {/* On a phone the name is read out but not shown: the initial stands for it. */}
        <span className="sr-only sm:not-sr-only sm:max-w-[12rem] sm:truncate">{user.displayName ?? user.login}</span>
        <span aria-hidden="true" className="text-slate-400">
          ▾
        </span>
      </summary>
      <div className="absolute right-0 z-10 mt-1 w-56 rounded-md border border-slate-200 bg-white py-1 text-sm text-ink-800 shadow-lg">
        <p className="border-b border-slate-100 px-3 py-2 text-xs text-ink-500">
          Signed in as <span className="font-mono">{user.login}</span>
          {user.email && <span className="block truncate">{user.email}</span>}
        </p>
        <Link className="block px-3 py-1.5 hover:bg-slate-50" to={paths.projects.getHref()}>
          Projects
        </Link>
        <Link className="block px-3 py-1.5 hover:bg-slate-50" to={paths.tokens.getHref()}>
          API tokens
        </Link>
        {session.data?.devTools && (
          <a className="block px-3 py-1.5 hover:bg-slate-50" href={paths.devMailbox.getHref()}>
            Dev mailbox
          </a>
        )}
        <button
          type="button"
          className="block w-full border-t border-slate-100 px-3 py-1.5 text-left hover:bg-slate-50"
          disabled={signOut.isPending}
          onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate(paths.home.getHref()) })}
        >
          Sign out
        </button>
      </div>
    </details>
  );
}
