import { describe, expect, it } from 'vitest';
import { pageChunkOf } from '../../../scripts/lib/page-chunks';

/** A module graph as rolldown describes it: each module with the modules that import it statically. */
function graph(importers: Record<string, string[]>, entries = ['/r/web/index.html']) {
  return {
    getModuleInfo: (id: string) =>
      id in importers || entries.includes(id) ? { importers: importers[id] ?? [], isEntry: entries.includes(id) } : null,
  };
}

const ROUTE = (name: string) => `/r/web/app/routes/${name}.tsx`;

describe('which chunk a page module goes to', () => {
  const g = graph({
    '/r/web/main.tsx': ['/r/web/index.html'],
    '/r/web/lib/api-client.ts': ['/r/web/main.tsx', '/r/web/features/plot.tsx'],
    [ROUTE('campaign')]: [],
    [ROUTE('projects')]: [],
    [ROUTE('calculators')]: [],
    '/r/web/features/plot.tsx': [ROUTE('campaign'), ROUTE('calculators')],
    '/r/node_modules/chart-lib/index.js': ['/r/web/features/plot.tsx'],
    '/r/web/lib/schemas.ts': ['/r/web/features/plot.tsx', ROUTE('projects')],
    '/r/web/features/calculator-form.tsx': [ROUTE('calculators')],
    // An import cycle between two page modules must not hang the walk.
    '/r/web/a.ts': ['/r/web/b.ts', ROUTE('campaign')],
    '/r/web/b.ts': ['/r/web/a.ts'],
  });

  it('when a module belongs to the first page (reached from an entry), then the bundler keeps placing it', () => {
    expect(pageChunkOf('/r/web/main.tsx', g)).toBeNull();
    expect(pageChunkOf('/r/web/lib/api-client.ts', g)).toBeNull();
  });

  it('when the campaign page reaches a module and no light page does, then it goes to the campaign-page chunk', () => {
    expect(pageChunkOf(ROUTE('campaign'), g)).toBe('campaign-page');
    expect(pageChunkOf('/r/web/features/plot.tsx', g)).toBe('campaign-page');
    expect(pageChunkOf('/r/node_modules/chart-lib/index.js', g)).toBe('campaign-page');
    expect(pageChunkOf('/r/web/a.ts', g)).toBe('campaign-page');
    expect(pageChunkOf('/r/web/b.ts', g)).toBe('campaign-page');
  });

  it('when a light page also reaches it, then it goes to pages-common', () => {
    expect(pageChunkOf('/r/web/lib/schemas.ts', g)).toBe('pages-common');
  });

  it('when the campaign page does not reach it, then the bundler keeps placing it', () => {
    expect(pageChunkOf('/r/web/features/calculator-form.tsx', g)).toBeNull();
    expect(pageChunkOf(ROUTE('projects'), g)).toBeNull();
    expect(pageChunkOf('/r/web/unknown.ts', g)).toBeNull();
  });
});
