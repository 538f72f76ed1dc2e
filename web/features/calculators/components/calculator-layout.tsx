import type { ReactNode } from 'react';
import type { UseQueryResult } from '@tanstack/react-query';
import { Panel } from '../../../components/ui/page';
import type { FieldError } from '../../../lib/api-client';
import { UnplacedErrors } from '../../../components/ui/fields';
import { EmptyResult } from './kinetics-parts';

/**
 * A calculator panel: the form with its unplaced errors on the left, the result on the right
 * (an empty-state prompt until the first answer, dimmed while a new answer is on its way).
 */
export function CalculatorLayout<T>({
  title,
  form,
  query,
  clientErrors,
  serverErrors,
  leftover,
  prompt,
  children,
}: {
  title: string;
  form: ReactNode;
  query: UseQueryResult<T>;
  clientErrors: FieldError[];
  serverErrors: FieldError[];
  leftover: FieldError[];
  /** What to do to get a result, shown before the first one. */
  prompt: ReactNode;
  children: (data: T) => ReactNode;
}) {
  const data = query.data;
  return (
    <Panel title={title}>
      <div className="grid gap-6 lg:grid-cols-[minmax(0,24rem)_minmax(0,1fr)]">
        <div className="flex flex-col gap-3">
          {form}
          <UnplacedErrors error={query.error} clientErrors={clientErrors} serverErrors={serverErrors} leftover={leftover} />
        </div>
        <div className="flex min-w-0 flex-col gap-3" aria-live="polite">
          {data === undefined && !query.isFetching && <EmptyResult failed={Boolean(query.error)}>{prompt}</EmptyResult>}
          {data !== undefined && (
            <div className={`flex flex-col gap-3 ${query.isPlaceholderData ? 'opacity-60' : ''}`}>{children(data)}</div>
          )}
        </div>
      </div>
    </Panel>
  );
}
