/**
 * How the build splits the pages' code (a rolldown code-splitting group, read by vite.config.ts).
 *
 * Left to itself, the bundler gives each set of pages that shares some modules a chunk of its own,
 * so the campaign page arrived as 25 files, most under 10 kB. Each file is a separate trip through
 * the browser's cache and network service, and on a busy machine those trips, not the bytes, held
 * the page back. Two chunks take their place:
 *
 * - `campaign-page`: what the campaign page loads and no light page does (charts, fit tables, the
 *   planner, forms). The project, comparison and calculator pages load it too; they use most of it.
 * - `pages-common`: what the campaign page shares with the light pages (project list and settings,
 *   tokens, invitation, history, API docs), so a light page loads little it does not use.
 *
 * The first page's code (every module a build entry reaches through static imports) is never
 * captured, so the first page's JavaScript stays as it was; `npm run bench -- bundle` measures it.
 */

interface ModuleGraph {
  getModuleInfo(id: string): { importers: readonly string[]; isEntry: boolean } | null;
}

const ROUTES = '/web/app/routes/';
const HEAVY_PAGE = `${ROUTES}campaign.tsx`;
const LIGHT_PAGES = ['projects', 'project-settings', 'tokens', 'api-docs', 'invitation', 'project-history'].map(
  (name) => `${ROUTES}${name}.tsx`,
);

/** Whether a module whose id passes `isRoot` imports `id`, directly or through other static imports. */
function importedBy(graph: ModuleGraph, id: string, isRoot: (id: string, isEntry: boolean) => boolean): boolean {
  const seen = new Set<string>();
  const stack = [id];
  while (stack.length) {
    const current = stack.pop()!;
    if (seen.has(current)) continue;
    seen.add(current);
    const info = graph.getModuleInfo(current);
    if (!info) continue;
    if (isRoot(current, info.isEntry)) return true;
    stack.push(...info.importers);
  }
  return false;
}

/** The chunk a module goes to, or null to leave it to the bundler's own splitting. */
export function pageChunkOf(id: string, graph: ModuleGraph): string | null {
  if (importedBy(graph, id, (_, isEntry) => isEntry)) return null;
  if (!importedBy(graph, id, (m) => m.endsWith(HEAVY_PAGE))) return null;
  return importedBy(graph, id, (m) => LIGHT_PAGES.some((page) => m.endsWith(page))) ? 'pages-common' : 'campaign-page';
}
