import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppLayout } from './layout';
import { HomeRoute } from './routes/home';
import { NotFoundRoute } from './routes/not-found';
import { RouteErrorBoundary } from './routes/route-error';
import { SignInRoute } from './routes/sign-in';
import { paths } from '../config/paths';
import { campaignLoader, compareLoader, comparisonLoader, projectLoader } from './loaders';

/**
 * Every page but home, sign-in and not-found loads on first visit (the forms library, the API
 * description and the charts are not in the first page's JavaScript), so the shell stays small. Their
 * loaders start the pages' requests while that code is still on its way (see loaders.ts).
 */
export const createRoutes = (client: QueryClient): RouteObject[] => [
  {
    element: <AppLayout />,
    errorElement: <RouteErrorBoundary />,
    // Until the first page's code and loaders are in, nothing is drawn: the page then appears whole
    // rather than the layout first and the page a moment later. Named, so the router does not warn
    // on every load that none was given (a console warning with a captured stack trace each time).
    HydrateFallback: BeforeFirstPage,
    children: [
      { path: paths.home.path, element: <HomeRoute /> },
      { path: paths.apiDocs.path, lazy: async () => ({ Component: (await import('./routes/api-docs')).ApiDocsRoute }) },
      { path: paths.calculators.path, lazy: async () => ({ Component: (await import('./routes/calculators')).CalculatorsRoute }) },
      { path: paths.rateAndHold.path, lazy: async () => ({ Component: (await import('./routes/rate-and-hold')).RateAndHoldRoute }) },
      { path: paths.signIn.path, element: <SignInRoute /> },
      { path: paths.projects.path, lazy: async () => ({ Component: (await import('./routes/projects')).ProjectsRoute }) },
      {
        path: paths.project.path,
        loader: projectLoader(client),
        lazy: async () => ({ Component: (await import('./routes/project')).ProjectRoute }),
      },
      {
        path: paths.projectSettings.path,
        lazy: async () => ({ Component: (await import('./routes/project-settings')).ProjectSettingsRoute }),
      },
      {
        path: paths.campaign.path,
        loader: campaignLoader(client),
        lazy: async () => ({ Component: (await import('./routes/campaign')).CampaignRoute }),
      },
      {
        path: paths.compare.path,
        loader: compareLoader(client),
        lazy: async () => ({ Component: (await import('./routes/comparison')).CompareRoute }),
      },
      {
        path: paths.comparison.path,
        loader: comparisonLoader(client),
        lazy: async () => ({ Component: (await import('./routes/comparison')).ComparisonRoute }),
      },
      {
        path: paths.projectHistory.path,
        lazy: async () => ({ Component: (await import('./routes/project-history')).ProjectHistoryRoute }),
      },
      { path: paths.tokens.path, lazy: async () => ({ Component: (await import('./routes/tokens')).TokensRoute }) },
      { path: paths.invitation.path, lazy: async () => ({ Component: (await import('./routes/invitation')).InvitationRoute }) },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];

function BeforeFirstPage() {
  return null;
}

export function createAppRouter(client: QueryClient) {
  return createBrowserRouter(createRoutes(client));
}
