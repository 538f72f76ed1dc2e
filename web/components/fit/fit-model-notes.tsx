import type { FitResponse } from '../../../api/features/calculators/schemas';
import { fixed, sig, withUncertainty } from '../../lib/format';

const celsius = (k: number) => `${fixed(k - 273.15, 0)} °C`;

/** What a chemist needs to read the fit honestly: estimator, stated precision vs scatter, new-run scatter, T₀ with its interval. */
export function FitModelNotes({ fit }: { fit: FitResponse }) {
  const ls = fit.leastSquaresWithoutBounds;
  const check = fit.precisionCheck;
  const t0 = fit.zeroSelectivity;
  const limit = fit.quantitationLimit;
  return (
    <ul aria-label="How to read this fit" className="tnum flex list-none flex-col gap-1 text-sm text-ink-700">
      {fit.estimator === 'censored-ml' && (
        <li>
          <span className="font-medium text-ink-900">Bounds fitted, not dropped.</span> Runs reported only as bounds
          {limit ? ` (at or beyond ${sig(limit.value, 4)} ${limit.measure === 'ee' ? '% ee' : limit.measure})` : ''} enter by censored
          maximum likelihood (Tobit); the values above come from that fit.
          {ls && (
            <span className="block text-ink-600">
              {ls.label}: ΔΔH‡ {withUncertainty(ls.ddH['kJ/mol'], ls.ddH.se?.['kJ/mol'])} kJ/mol, ΔΔS‡{' '}
              {withUncertainty(ls.ddS['J/(mol*K)'], ls.ddS.se?.['J/(mol*K)'])} J/(mol·K), n = {ls.n}.
            </span>
          )}
        </li>
      )}
      {check && (
        <li className={check.verdict === 'consistent' ? '' : 'text-caution-700'}>
          <span className="font-medium">
            χ²/dof = {sig(check.reducedChiSquare, 3)} ({check.dof} dof).
          </span>{' '}
          {check.message}
        </li>
      )}
      {fit.newRun && (
        <li>
          <span className="font-medium text-ink-900">A new run’s interval:</span> {fit.newRun.note}
        </li>
      )}
      {t0 && (
        <li>
          <span className="font-medium text-ink-900">Selectivity would vanish</span> at {celsius(t0.kelvin)} ({fixed(t0.kelvin, 0)} K)
          {t0.farExtrapolation ? <span className="font-medium text-caution-700"> — a far extrapolation</span> : null}.{' '}
          {t0.interval ? <span>{t0.interval.note}</span> : <span className="text-ink-600">{t0.note}</span>}
        </li>
      )}
    </ul>
  );
}
