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

// The chart-heavy pages (visx) load on first visit, so the shell and sign-in stay small.
export const routes: RouteObject[] = [
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
      { path: paths.project.path, lazy: async () => ({ Component: (await import('./routes/project')).ProjectRoute }) },
      { path: paths.projectSettings.path, element: <ProjectSettingsRoute /> },
      { path: paths.campaign.path, lazy: async () => ({ Component: (await import('./routes/campaign')).CampaignRoute }) },
      { path: paths.compare.path, lazy: async () => ({ Component: (await import('./routes/comparison')).CompareRoute }) },
      { path: paths.comparison.path, lazy: async () => ({ Component: (await import('./routes/comparison')).ComparisonRoute }) },
      { path: paths.projectHistory.path, element: <ProjectHistoryRoute /> },
      { path: paths.tokens.path, element: <TokensRoute /> },
      { path: paths.invitation.path, element: <InvitationRoute /> },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
