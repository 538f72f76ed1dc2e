/** Every in-app link is built here, never by hand in a component. */
export const paths = {
  home: { path: '/', getHref: () => '/' },
  apiDocs: { path: '/api-docs', getHref: () => '/api-docs' },
  calculators: { path: '/calculators', getHref: () => '/calculators' },
  rateAndHold: { path: '/rate-and-hold', getHref: () => '/rate-and-hold' },
  signIn: {
    path: '/sign-in',
    getHref: (returnTo?: string) => (returnTo ? `/sign-in?returnTo=${encodeURIComponent(returnTo)}` : '/sign-in'),
  },
  projects: { path: '/projects', getHref: () => '/projects' },
  project: { path: '/projects/:projectId', getHref: (projectId: string) => `/projects/${projectId}` },
  campaign: { path: '/campaigns/:campaignId', getHref: (campaignId: string) => `/campaigns/${campaignId}` },
  /** Served by the API server: the campaign's spreadsheet report (a download, not a page). */
  campaignReport: {
    path: '/api/v1/campaigns/:campaignId/report.xlsx',
    getHref: (campaignId: string) => `/api/v1/campaigns/${campaignId}/report.xlsx`,
  },
  /** Served by the API server: the summary and charts as a PDF, and the runs and forecast grid as CSV. */
  campaignReportPdf: {
    path: '/api/v1/campaigns/:campaignId/report.pdf',
    getHref: (campaignId: string) => `/api/v1/campaigns/${campaignId}/report.pdf`,
  },
  campaignMeasurementsCsv: {
    path: '/api/v1/campaigns/:campaignId/measurements.csv',
    getHref: (campaignId: string) => `/api/v1/campaigns/${campaignId}/measurements.csv`,
  },
  campaignForecastCsv: {
    path: '/api/v1/campaigns/:campaignId/forecast.csv',
    getHref: (campaignId: string) => `/api/v1/campaigns/${campaignId}/forecast.csv`,
  },
  compare: { path: '/projects/:projectId/compare', getHref: (projectId: string) => `/projects/${projectId}/compare` },
  comparison: { path: '/comparisons/:comparisonId', getHref: (comparisonId: string) => `/comparisons/${comparisonId}` },
  projectSettings: { path: '/projects/:projectId/settings', getHref: (projectId: string) => `/projects/${projectId}/settings` },
  projectHistory: { path: '/projects/:projectId/history', getHref: (projectId: string) => `/projects/${projectId}/history` },
  tokens: { path: '/settings/tokens', getHref: () => '/settings/tokens' },
  invitation: { path: '/invitations/:token', getHref: (token: string) => `/invitations/${token}` },
  /** Served by the API server (development tools only), not by the web router. */
  devMailbox: { path: '/dev/mailbox', getHref: () => '/dev/mailbox' },
  /** Server route that starts the OAuth round trip. */
  oauthStart: {
    path: '/auth/github',
    getHref: (returnTo?: string) => (returnTo ? `/auth/github?returnTo=${encodeURIComponent(returnTo)}` : '/auth/github'),
  },
} as const;
