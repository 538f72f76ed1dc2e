import { paths } from '../config/paths';

/** Main navigation, in order. Features add their entry here. */
export const navItems: { to: string; label: string; end?: boolean }[] = [
  { to: paths.home.getHref(), label: 'Overview', end: true },
  { to: paths.calculators.getHref(), label: 'Calculators' },
  { to: paths.rateAndHold.getHref(), label: 'Rate and hold' },
  { to: paths.projects.getHref(), label: 'Projects' },
  { to: paths.apiDocs.getHref(), label: 'API' },
];
