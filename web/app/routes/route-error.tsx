import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { ApiError } from '../../lib/api-client';
import { paths } from '../../config/paths';

/** Error boundary for every route: says what failed without a stack trace. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  let title = 'Something went wrong';
  let detail = 'An unexpected error stopped this page. Reload to try again.';
  if (isRouteErrorResponse(error)) {
    title = error.status === 404 ? 'Not found' : `Error ${error.status}`;
    detail = typeof error.data === 'string' ? error.data : error.statusText;
  } else if (error instanceof ApiError) {
    title = error.problem.title;
    detail = error.problem.detail;
  }
  return (
    <div role="alert" className="mx-auto max-w-2xl px-6 py-12">
      <h1 className="text-xl font-semibold text-ink-950">{title}</h1>
      <p className="mt-2 text-ink-700">{detail}</p>
      <Link className="mt-4 inline-block text-fjord-700 underline" to={paths.home.getHref()}>
        Back to the overview
      </Link>
    </div>
  );
}
