import { Link } from 'react-router-dom';
import { Page } from '../../components/ui/page';
import { paths } from '../../config/paths';

export function NotFoundRoute() {
  return (
    <Page title="Page not found" lead="Nothing lives at this address. It may have moved, or the link was mistyped.">
      <Link className="text-fjord-700 underline" to={paths.home.getHref()}>
        Back to the overview
      </Link>
    </Page>
  );
}
