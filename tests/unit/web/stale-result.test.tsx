// @vitest-environment happy-dom
import { useState } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/react';
import { StaleResult, sameInputs, useLastDefined, worthRetrying, type StaleReason } from '../../../web/components/ui/stale';
import { ApiError } from '../../../web/lib/api-client';

afterEach(cleanup);

const resultBox = (container: HTMLElement) => container.querySelector('[data-stale]') ?? container.firstElementChild;

describe('StaleResult', () => {
  it('when the result is current, then it shows plainly with no label', () => {
    const { container } = render(
      <StaleResult reason={null} action="Forecast">
        <p>ee 94.0 %</p>
      </StaleResult>,
    );
    expect(screen.queryByText('stale')).toBeNull();
    expect(container.querySelector('.opacity-50')).toBeNull();
  });

  it('when the inputs changed since it was computed, then it is greyed and labelled stale, naming the button that updates it, with no retry', () => {
    const { container } = render(
      <StaleResult reason="changed" action="Forecast" onRetry={() => undefined}>
        <p>ee 94.0 %</p>
      </StaleResult>,
    );
    expect(screen.getByText('stale')).toBeTruthy();
    expect(screen.getByRole('status').textContent).toContain('press Forecast to update it');
    expect(screen.getByText('ee 94.0 %').closest('.opacity-50')).not.toBeNull();
    expect(screen.queryByRole('button', { name: 'Retry' })).toBeNull();
    expect(resultBox(container)?.getAttribute('data-stale')).toBe('changed');
  });

  it('when the request failed, then it is greyed, labelled stale and offers a retry that calls back', () => {
    const onRetry = vi.fn();
    render(
      <StaleResult reason="failed" action="Forecast" onRetry={onRetry}>
        <p>ee 94.0 %</p>
      </StaleResult>,
    );
    expect(screen.getByText('stale')).toBeTruthy();
    expect(screen.getByRole('status').textContent).toContain('The last request failed');
    expect(screen.getByText('ee 94.0 %').closest('.opacity-50')).not.toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Retry' }));
    expect(onRetry).toHaveBeenCalledTimes(1);
  });

  it('when a retry is under way, then the button says so and cannot be pressed twice', () => {
    render(
      <StaleResult reason="failed" action="Forecast" onRetry={() => undefined} retrying>
        <p>x</p>
      </StaleResult>,
    );
    expect((screen.getByRole('button', { name: 'Retrying…' }) as HTMLButtonElement).disabled).toBe(true);
  });

  it('when a new answer is on its way, then it is greyed and marked busy but not called stale', () => {
    render(
      <StaleResult reason="updating" action="Forecast">
        <p>ee 94.0 %</p>
      </StaleResult>,
    );
    expect(screen.queryByText('stale')).toBeNull();
    expect(screen.getByRole('status').textContent).toBe('Updating…');
    expect(screen.getByText('ee 94.0 %').closest('[aria-busy="true"]')).not.toBeNull();
  });
});

describe('useLastDefined with StaleResult', () => {
  it('when the next request fails, then the last answer stays on screen, labelled stale', () => {
    const first = { ee: 94 };
    function Harness() {
      const [answer, setAnswer] = useState<{ ee: number } | undefined>(first);
      const [reason, setReason] = useState<StaleReason | null>(null);
      const shown = useLastDefined(answer);
      return (
        <>
          <button
            onClick={() => {
              setAnswer(undefined);
              setReason('failed');
            }}
          >
            fail
          </button>
          {shown && (
            <StaleResult reason={reason} action="Forecast" onRetry={() => undefined}>
              <p>ee {shown.ee} %</p>
            </StaleResult>
          )}
        </>
      );
    }
    render(<Harness />);
    expect(screen.getByText('ee 94 %')).toBeTruthy();
    act(() => fireEvent.click(screen.getByText('fail')));
    expect(screen.getByText('ee 94 %').closest('.opacity-50')).not.toBeNull();
    expect(screen.getByText('stale')).toBeTruthy();
  });
});

describe('helpers', () => {
  it('when a request was rejected for its input, then a retry is not offered; a server fault or a lost connection offers one', () => {
    const problem = (status: number) => new ApiError({ type: 'about:blank', title: 't', status, detail: 'd' });
    expect(worthRetrying(problem(422))).toBe(false);
    expect(worthRetrying(problem(503))).toBe(true);
    expect(worthRetrying(problem(429))).toBe(true);
    expect(worthRetrying(new TypeError('Failed to fetch'))).toBe(true);
  });

  it('when two form states hold the same values, then they are the same inputs; one changed field makes them differ', () => {
    expect(sameInputs({ a: '1', b: 'C' }, { a: '1', b: 'C' })).toBe(true);
    expect(sameInputs({ a: '1', b: 'C' }, { a: '2', b: 'C' })).toBe(false);
  });
});
