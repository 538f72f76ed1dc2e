import type { FitResponse } from '../../../api/features/calculators/schemas';
import {
  DISPLAY_LABEL,
  DISPLAY_MEASURES,
  formatMeasure,
  formatMeasureRange,
  type SelectivityMeasure,
} from '../../../api/science/quantities';
import { SafetyCaution } from '../ui/caution';
import { enantiomericRatio, fixed, percent, withUncertainty, lnRatioOf, lnRatioRange } from '../../lib/format';

type Prediction = FitResponse['predictions'][number];

/** The forecast at the proposed temperature with its prediction interval for a new run. */
export function PredictionBox({
  prediction,
  confidence,
  measure = 'ee',
}: {
  prediction: Prediction;
  confidence: number;
  /** The measure the runs are reported in: dr shows dr, % de and % major; ee shows ee, % A and er. */
  measure?: SelectivityMeasure;
}) {
  const level = `${fixed(confidence * 100, 0)} %`;
  const pi = prediction.predictionInterval;
  const ci = prediction.confidenceInterval;
  const lnR = lnRatioOf(prediction);
  const lnRange = (iv: Parameters<typeof lnRatioRange>[0]) => lnRatioRange(iv);
  const displays = DISPLAY_MEASURES[measure];
  return (
    <section
      aria-label="Prediction at the proposed temperature"
      className="grid gap-3 rounded-md border border-fjord-600/40 bg-fjord-50 p-3 xl:grid-cols-[minmax(0,1fr)_18rem]"
    >
      <div className="flex flex-col gap-2">
        <h3 className="text-sm font-semibold text-ink-900">
          At {fixed(prediction.celsius, 1)} °C <span className="font-normal text-ink-600">({fixed(prediction.kelvin, 2)} K)</span>
        </h3>
        <dl className="tnum grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          {measure === 'ee' ? (
            <>
              <dt className="text-ink-600">ee</dt>
              <dd>
                <span className="text-lg font-semibold text-ink-950">{percent(prediction.eePercent)} %</span>
                {pi && (
                  <span className="ml-2 text-ink-700">
                    {level} prediction interval {percent(pi.eePercent[0])} to {percent(pi.eePercent[1])} %
                  </span>
                )}
              </dd>
              <dt className="text-ink-600">% A</dt>
              <dd>
                <span className="font-medium text-ink-950">{percent(prediction.percentA)} %</span>
                {pi && (
                  <span className="ml-2 text-ink-700">
                    interval {percent(pi.percentA[0])} to {percent(pi.percentA[1])} %
                  </span>
                )}
                <span className="ml-2 text-ink-600">er {enantiomericRatio(prediction.percentA)}</span>
              </dd>
              {ci && (
                <>
                  <dt className="text-ink-600">Mean line</dt>
                  <dd className="text-ink-700">
                    {level} confidence interval {percent(ci.eePercent[0])} to {percent(ci.eePercent[1])} % ee
                  </dd>
                </>
              )}
            </>
          ) : (
            displays.map((d, i) => (
              <div key={d} className="contents">
                <dt className="text-ink-600">{DISPLAY_LABEL[d]}</dt>
                <dd>
                  <span className={i === 0 ? 'text-lg font-semibold text-ink-950' : 'font-medium text-ink-950'}>
                    {formatMeasure(d, lnR)}
                  </span>
                  {pi && (
                    <span className="ml-2 text-ink-700">
                      {i === 0 ? `${level} prediction interval` : 'interval'} {formatMeasureRange(d, ...lnRange(pi))}
                    </span>
                  )}
                </dd>
              </div>
            ))
          )}
          {measure !== 'ee' && ci && (
            <>
              <dt className="text-ink-600">Mean line</dt>
              <dd className="text-ink-700">
                {level} confidence interval {formatMeasureRange(displays[0], ...lnRange(ci))} {DISPLAY_LABEL[displays[0]]}
              </dd>
            </>
          )}
          <dt className="text-ink-600">ΔΔG‡</dt>
          <dd className="text-ink-700">
            {withUncertainty(prediction.ddG['kJ/mol'], prediction.ddGSe?.['kJ/mol'])} kJ/mol ·{' '}
            {withUncertainty(prediction.ddG['kcal/mol'], prediction.ddGSe?.['kcal/mol'])} kcal/mol
          </dd>
        </dl>
        {!pi && <p className="text-xs text-ink-600">No interval: the fit has no estimate of scatter (see the warnings).</p>}
        {prediction.outOfRange && (
          <p className="text-sm font-medium text-caution-700">
            <span aria-hidden="true">⚠ </span>So far from the data that r cannot be written as a number: ln r ={' '}
            {fixed(prediction.lnRatio ?? Number.NaN, 1)}, ee shown saturated. Treat it as a direction, not a value.
          </p>
        )}
        {prediction.extrapolated && (
          <p className="text-sm font-medium text-caution-700">
            <span aria-hidden="true">⚠ </span>Outside the screened temperatures: an extrapolation, trust it less than the interval suggests.
          </p>
        )}
        {prediction.model === 'segmented' && (
          <p className="text-sm text-ink-700" data-testid="forecast-branch">
            From the two-branch model: the{' '}
            {prediction.branch === 'low'
              ? 'low-temperature branch (colder than the break)'
              : 'high-temperature branch (warmer than the break)'}{' '}
            covers this temperature.
          </p>
        )}
        <p className="text-xs text-ink-600">
          The prediction interval is where a single new run is expected to fall, including that run’s own assay error
          {prediction.newRunSigmaLnR != null ? ` (σ of ln r ${fixed(prediction.newRunSigmaLnR, 3)} at this selectivity)` : ''}; the
          confidence interval is for the mean line only.
        </p>
      </div>
      <SafetyCaution />
    </section>
  );
}
