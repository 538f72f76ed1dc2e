import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppLayout } from './layout';
import { HomeRoute } from './routes/home';
import { NotFoundRoute } from './routes/not-found';
import { RouteErrorBoundary } from './routes/route-error';
import { ApiDocsRoute } from './routes/api-docs';
import { SignInRoute } from './routes/sign-in';
import { ProjectsRoute } from './routes/projects';
import { ProjectSettingsRoute } from './routes/project-settings';
import { ProjectHistoryRoute } from './routes/project-history';
import { TokensRoute } from './routes/tokens';
import { InvitationRoute } from './routes/invitation';
import { paths } from '../config/paths';
import { campaignLoader, compareLoader, comparisonLoader, projectLoader } from './loaders';

/**
 * The chart-heavy pages (visx) load on first visit, so the shell and sign-in stay small. Their
 * loaders start the pages' requests while that code is still on its way (see loaders.ts).
 */
export const createRoutes = (client: QueryClient): RouteObject[] => [
  {
    element: <AppLayout />,
    errorElement: <RouteErrorBoundary />,
    children: [
      { path: paths.home.path, element: <HomeRoute /> },
      { path: paths.apiDocs.path, element: <ApiDocsRoute /> },
      { path: paths.calculators.path, lazy: async () => ({ Component: (await import('./routes/calculators')).CalculatorsRoute }) },
      { path: paths.rateAndHold.path, lazy: async () => ({ Component: (await import('./routes/rate-and-hold')).RateAndHoldRoute }) },
      { path: paths.signIn.path, element: <SignInRoute /> },
      { path: paths.projects.path, element: <ProjectsRoute /> },
      {
        path: paths.project.path,
        loader: projectLoader(client),
        lazy: async () => ({ Component: (await import('./routes/project')).ProjectRoute }),
      },
      { path: paths.projectSettings.path, element: <ProjectSettingsRoute /> },
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
      { path: paths.projectHistory.path, element: <ProjectHistoryRoute /> },
      { path: paths.tokens.path, element: <TokensRoute /> },
      { path: paths.invitation.path, element: <InvitationRoute /> },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];

export function createAppRouter(client: QueryClient) {
  return createBrowserRouter(createRoutes(client));
}
