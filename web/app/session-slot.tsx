import { Link } from 'react-router-dom';
import { paths } from '../config/paths';

/** Sign-in slot in the header. */
export function SessionSlot() {
  return (
    <Link to={paths.signIn.getHref()} className="rounded border border-slate-500 px-3 py-1 text-sm text-slate-100 hover:bg-ink-800">
      Sign in
    </Link>
  );
}
