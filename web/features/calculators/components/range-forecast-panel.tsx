import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { Panel } from '../../../components/ui/page';
import { paths } from '../../../config/paths';
import { SafetyCaution } from '../../../components/ui/caution';
import { sameInputs, StaleResult, useLastDefined, worthRetrying, type StaleReason } from '../../../components/ui/stale';
import { SelectivityChart } from '../../../components/charts/selectivity-chart';
import { ApiError, type FieldError } from '../../../lib/api-client';
import { fixed } from '../../../lib/format';
import { useForecast } from '../api/post-forecast';
import { apiFieldErrors, unmatchedErrors } from '../../../lib/field-errors';
import { initialForecastForm, toForecastRequest, type ForecastFormState } from '../lib/forecast-form';
import { ChartControls, useChartControls } from '../../../components/charts/chart-controls';
import { ProblemAlert } from '../../../components/ui/fields';
import { ForecastForm, forecastFieldPaths } from './forecast-form';
import { ForecastTable } from './forecast-table';
import type { ForecastRequest } from '../../../../api/features/calculators/schemas';

/** Selectivity over a range of temperatures from one basis (ΔΔH‡/ΔΔS‡, a ΔΔG‡ or one observation): a chart and a table out. */
export function RangeForecastPanel() {
  const methods = useForm<ForecastFormState>({ defaultValues: initialForecastForm });
  const form = methods.watch();
  const [request, setRequest] = useState<ForecastRequest | null>(null);
  const [submittedForm, setSubmittedForm] = useState<ForecastFormState | null>(null);
  const [clientErrors, setClientErrors] = useState<FieldError[]>([]);
  const { measure, spec, controls } = useChartControls('99');
  const query = useForecast(request);

  const serverErrors = apiFieldErrors(query.error);
  const errors = clientErrors.length ? clientErrors : serverErrors;
  const leftover = unmatchedErrors(errors, forecastFieldPaths);
  // The last answer stays on screen, greyed and labelled, after a failed request or an edit.
  const data = useLastDefined(query.data);
  const reason: StaleReason | null =
    query.isError && !query.data
      ? 'failed'
      : query.isPlaceholderData
        ? 'updating'
        : submittedForm && !sameInputs(form, submittedForm)
          ? 'changed'
          : null;
  const celsiusShown = data ? data.points.map((p) => p.celsius) : [];
  const range = celsiusShown.length ? [Math.min(...celsiusShown), Math.max(...celsiusShown)] : null;

  const submit = () => {
    const values = methods.getValues();
    const { request: next, errors: found } = toForecastRequest(values);
    setClientErrors(found);
    if (next) {
      setRequest(next);
      setSubmittedForm({ ...values });
    }
  };

  return (
    <Panel title="Forecast selectivity across temperature">
      <div className="grid gap-6 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
        <div className="flex flex-col gap-3">
          <ForecastForm form={methods} onSubmit={submit} errors={errors} busy={query.isFetching} />
          {query.error && !clientErrors.length && (serverErrors.length === 0 || leftover.length > 0) && (
            <ProblemAlert
              title={query.error instanceof ApiError ? query.error.problem.title : 'The forecast failed'}
              detail={query.error.message}
              errors={leftover}
            />
          )}
          {clientErrors.length > 0 && leftover.length > 0 && <ProblemAlert title="Check the inputs" errors={leftover} />}
          <p className="text-xs text-ink-600">
            Selectivity gained on cooling costs rate: see{' '}
            <Link to={paths.rateAndHold.getHref()} className="font-medium text-fjord-700 underline">
              Rate and hold
            </Link>{' '}
            for the time to finish and ee erosion.
          </p>
        </div>

        <div className="flex min-w-0 flex-col gap-3" aria-live="polite">
          {!data && !query.isFetching && (
            <p className="rounded border border-dashed border-slate-300 px-3 py-6 text-center text-sm text-ink-500">
              {query.error ? 'No forecast: see the message beside the inputs.' : 'Enter a basis and a range, then press Forecast.'}
            </p>
          )}
          {data && (
            <StaleResult
              reason={reason}
              action="Forecast"
              onRetry={worthRetrying(query.error) ? () => void query.refetch() : undefined}
              retrying={query.isFetching}
            >
              <ChartControls name="forecast" {...controls} />
              <SelectivityChart
                title={`Forecast ${measure === 'ee' ? 'ee' : '% A'} against temperature`}
                curve={data.points}
                measure={measure}
                spec={spec}
              />
              {data.zeroSelectivity && (
                <p className="tnum rounded border border-slate-200 bg-slate-50 px-3 py-2 text-sm text-ink-800">
                  <span className="font-medium">Selectivity vanishes</span> at {fixed(data.zeroSelectivity.celsius, 0)} °C (
                  {fixed(data.zeroSelectivity.kelvin, 0)} K)
                  {range && (data.zeroSelectivity.celsius < range[0] || data.zeroSelectivity.celsius > range[1]) ? (
                    <span className="ml-1 font-medium text-caution-700">(outside the range shown)</span>
                  ) : null}{' '}
                  <span className="text-ink-600">{data.zeroSelectivity.note}</span>
                </p>
              )}
              <ForecastTable points={data.points} spec={spec !== null ? { value: spec, measure } : null} />
              {data.assumptions.length > 0 && (
                <div className="text-xs text-ink-600">
                  <p className="font-medium text-ink-800">Assumptions</p>
                  <ul className="list-disc pl-5">
                    {data.assumptions.map((a) => (
                      <li key={a}>{a}</li>
                    ))}
                  </ul>
                </div>
              )}
              <SafetyCaution />
            </StaleResult>
          )}
        </div>
      </div>
    </Panel>
  );
}
