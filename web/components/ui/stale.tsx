import { useState, type ReactNode } from 'react';
import { ApiError } from '../../lib/api-client';

/**
 * Why a result on screen no longer answers the inputs beside it:
 * - `changed`: the inputs were edited after it was computed (nothing sent yet);
 * - `updating`: a new answer is on its way;
 * - `failed`: the last request failed, so this is the answer before it.
 */
export type StaleReason = 'changed' | 'updating' | 'failed';

/**
 * The last value that was not null or undefined, so a result can stay on screen (greyed) after the
 * request for the next one fails; the query itself forgets the old answer when a new key errors.
 */
export function useLastDefined<T>(value: T | null | undefined): T | null {
  const [last, setLast] = useState<T | null>(value ?? null);
  if (value !== null && value !== undefined && value !== last) setLast(value);
  return value ?? last;
}

/** Whether asking again could help: network trouble and server faults, not a rejected input. */
export function worthRetrying(error: unknown): boolean {
  return !(error instanceof ApiError) || error.status >= 500 || error.status === 429;
}

/** Inputs compared by value (form state is plain data). */
export function sameInputs(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * A result that may be out of date: greyed, with a "stale" label saying why, and a retry when the
 * request failed. With no reason the result shows as it is.
 */
export function StaleResult({
  reason,
  action,
  onRetry,
  retrying = false,
  className = '',
  children,
}: {
  reason: StaleReason | null;
  /** The button that brings the result up to date (e.g. "Forecast"), named in the label. */
  action: string;
  /** Offered when the request failed and asking again could help. */
  onRetry?: () => void;
  retrying?: boolean;
  className?: string;
  children: ReactNode;
}) {
  const stale = reason === 'changed' || reason === 'failed';
  return (
    <div className={`flex flex-col gap-2 ${className}`} data-stale={reason ?? undefined}>
      {stale && (
        <div
          role="status"
          className="flex flex-wrap items-center gap-2 rounded border border-slate-300 bg-slate-100 px-3 py-1.5 text-xs text-ink-800"
        >
          <span className="rounded bg-ink-700 px-1.5 py-0.5 font-semibold uppercase tracking-wide text-white">stale</span>
          <span>
            {reason === 'changed'
              ? `The inputs have changed since this was computed; press ${action} to update it.`
              : 'The last request failed; this is the result before it.'}
          </span>
          {reason === 'failed' && onRetry && (
            <button
              type="button"
              onClick={onRetry}
              disabled={retrying}
              className="rounded border border-slate-400 bg-white px-2 py-0.5 font-medium text-ink-800 hover:bg-slate-50 disabled:opacity-50"
            >
              {retrying ? 'Retrying…' : 'Retry'}
            </button>
          )}
        </div>
      )}
      {reason === 'updating' && (
        <p role="status" className="text-xs text-ink-600">
          Updating…
        </p>
      )}
      <div
        className={`flex flex-col gap-3 transition-opacity ${reason ? 'opacity-50 grayscale' : ''}`}
        aria-busy={reason === 'updating' || undefined}
      >
        {children}
      </div>
    </div>
  );
}
