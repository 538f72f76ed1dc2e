import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppLayout } from './layout';
import { HomeRoute } from './routes/home';
import { NotFoundRoute } from './routes/not-found';
import { RouteErrorBoundary } from './routes/route-error';
import { ApiDocsRoute } from './routes/api-docs';
import { CalculatorsRoute } from './routes/calculators';
import { paths } from '../config/paths';

export const routes: RouteObject[] = [
  {
    element: <AppLayout />,
    errorElement: <RouteErrorBoundary />,
    children: [
      { path: paths.home.path, element: <HomeRoute /> },
      { path: paths.apiDocs.path, element: <ApiDocsRoute /> },
      { path: paths.calculators.path, element: <CalculatorsRoute /> },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
