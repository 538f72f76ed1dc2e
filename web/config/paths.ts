/** Every in-app link is built here, never by hand in a component. */
export const paths = {
  home: { path: '/', getHref: () => '/' },
  apiDocs: { path: '/api-docs', getHref: () => '/api-docs' },
  calculators: { path: '/calculators', getHref: () => '/calculators' },
  signIn: { path: '/sign-in', getHref: (returnTo?: string) => (returnTo ? `/sign-in?returnTo=${encodeURIComponent(returnTo)}` : '/sign-in') },
} as const;
