import type { ComponentProps } from 'react';
import { UnreadyPage } from '../../../components/ui/page';

/** A project's page while the project loads, or when it cannot be read. */
export function UnreadyProjectPage({ query, title }: Pick<ComponentProps<typeof UnreadyPage>, 'query' | 'title'>) {
  return (
    <UnreadyPage
      query={query}
      title={title}
      missingTitle="Project not found"
      missing={<p className="text-sm text-ink-600">Either it does not exist or you are not a member of it.</p>}
    />
  );
}
