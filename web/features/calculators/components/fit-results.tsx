import type { FitResponse } from '../../../../api/features/calculators/schemas';
import { EyringPlot } from '../../../components/charts/eyring-plot';
import { SelectivityChart } from '../../../components/charts/selectivity-chart';
import { fixed } from '../../../lib/format';
import { medianUncertainty, type buildView, type Submitted } from '../lib/fit-view';
import { ChartControls, useChartControls } from '../../../components/charts/chart-controls';
import { FitParameterTable } from '../../../components/fit/fit-parameter-table';
import { FitWarnings, ResidualTable, TwoBranchBox, branchLines } from '../../../components/fit/fit-diagnostics';
import { PredictionBox } from '../../../components/fit/prediction-box';

/** What a fit shows: the Eyring plot, warnings, the prediction, the parameters, the selectivity chart and the residuals. */
export function FitResults({
  fit,
  view,
  submitted,
  excludedLines,
  onToggleExclude,
}: {
  fit: FitResponse;
  view: ReturnType<typeof buildView>;
  submitted: Submitted;
  excludedLines: number[];
  onToggleExclude: (line: number) => void;
}) {
  const chart = useChartControls('99');
  return (
    <>
      <EyringPlot
        title="Eyring plot of the screen: ln r against 1000/T with the fitted line and bands"
        points={view.points}
        curve={view.curve}
        branches={branchLines(fit.twoBranch)}
        mark={view.proposed ? { kelvin: view.proposed.kelvin, label: `proposed ${fixed(view.proposed.celsius, 0)} °C` } : null}
        confidenceLevel={fit.confidence}
      />
      <FitWarnings
        warnings={
          // The band grid runs past the data on purpose: keep the extrapolation warning only
          // when the proposed temperature itself lies outside the screen.
          [
            ...fit.warnings.filter((w) => w.code !== 'extrapolation'),
            ...(view.proposed?.extrapolated
              ? [
                  {
                    code: 'extrapolation',
                    message: `${fixed(view.proposed.celsius, 1)} °C lies outside the screened range: the forecast assumes the ${view.proposed.model === 'segmented' ? 'nearest branch' : 'same straight line'} continues, which a change of mechanism would break.`,
                  },
                ]
              : []),
          ]
        }
      />
      {view.proposed ? (
        <PredictionBox prediction={view.proposed} confidence={fit.confidence} measure={submitted.measure} />
      ) : (
        <p className="text-sm text-ink-500">Enter a proposed temperature to get a prediction with its interval.</p>
      )}
      <FitParameterTable fit={fit} />
      <TwoBranchBox twoBranch={fit.twoBranch} />
      <div className="flex flex-col gap-2">
        <h3 className="text-sm font-semibold text-ink-900">Selectivity against temperature from the fit</h3>
        <ChartControls name="fit" family={submitted.measure} {...chart.controls} />
        <SelectivityChart
          title="Fitted selectivity against temperature with the prediction band"
          curve={view.selectivityCurve}
          points={view.selectivityPoints}
          measure={chart.measure}
          family={submitted.measure}
          spec={chart.spec}
          curveLabel="fitted line"
          bandLabel={`${fixed(fit.confidence * 100, 0)} % prediction band (new run)`}
          mark={view.proposed ? { celsius: view.proposed.celsius, label: `proposed ${fixed(view.proposed.celsius, 0)} °C` } : null}
          height={260}
        />
      </div>
      <div className="flex flex-col gap-1">
        <h3 className="text-sm font-semibold text-ink-900">Runs and residuals</h3>
        <ResidualTable
          fit={fit}
          lines={submitted.rows.map((r) => r.line)}
          assaySd={submitted.measure === 'ee' ? medianUncertainty(submitted.rows) : null}
          excludedLines={excludedLines}
          onToggleExclude={onToggleExclude}
        />
        <p className="text-xs text-ink-500">
          Excluding a run refits at once; the run stays on the plot as a hollow circle. Note why you excluded it in your records.
        </p>
      </div>
    </>
  );
}
