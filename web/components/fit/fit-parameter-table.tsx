import type { FitResponse } from '../../../api/features/calculators/schemas';
import { decimalsFor, fixed, signed, withUncertainty } from '../../lib/format';
import { FitModelNotes } from './fit-model-notes';
import { SidewaysScroll } from '../ui/page';
import { celsiusFromKelvin } from '../../../api/science/quantities';

type Interval = [number, number] | undefined;

function Row({ name, unit, value, se, ci }: { name: string; unit: string; value: number; se: number | null | undefined; ci: Interval }) {
  const d = decimalsFor(se, 2);
  return (
    <tr className="border-b border-slate-100 last:border-0">
      <th scope="row" className="whitespace-nowrap px-2 py-1 text-left font-medium text-ink-800">
        {name}
      </th>
      <td className="whitespace-nowrap px-2 py-1 text-right text-ink-950">
        {se ? (value > 0 ? '+' : '') + withUncertainty(value, se) : signed(value, d)}
      </td>
      <td className="whitespace-nowrap px-2 py-1 text-left text-ink-600">{unit}</td>
      <td className="whitespace-nowrap px-2 py-1 text-right text-ink-700">{ci ? `${fixed(ci[0], d)} to ${fixed(ci[1], d)}` : '—'}</td>
    </tr>
  );
}

/** ΔΔH‡, ΔΔS‡ and ΔΔG‡(25 °C) with ± SE and the confidence interval, then the fit statistics. */
export function FitParameterTable({ fit }: { fit: FitResponse }) {
  const level = `${fixed(fit.confidence * 100, 0)} %`;
  const { ddH, ddS, ddGAt25C: ddG } = fit;
  return (
    <div className="flex min-w-0 flex-col gap-2">
      {/* On a phone the four columns are wider than the screen: the table scrolls in its own box. */}
      <SidewaysScroll label="Fitted activation parameters, scrolls sideways">
        <table className="tnum w-full border-collapse text-sm" aria-label="Fitted activation parameters">
          <thead className="text-xs text-ink-600">
            <tr className="border-b border-slate-200">
              <th scope="col" className="px-2 py-1 text-left font-medium">
                Parameter (B − A)
              </th>
              <th scope="col" className="px-2 py-1 text-right font-medium">
                Value ± SE
              </th>
              <th scope="col" className="px-2 py-1 text-left font-medium">
                Unit
              </th>
              <th scope="col" className="px-2 py-1 text-right font-medium">
                {level} CI
              </th>
            </tr>
          </thead>
          <tbody>
            <Row name="ΔΔH‡" unit="kJ/mol" value={ddH['kJ/mol']} se={ddH.se?.['kJ/mol']} ci={ddH.ci?.['kJ/mol']} />
            <Row name="ΔΔH‡" unit="kcal/mol" value={ddH['kcal/mol']} se={ddH.se?.['kcal/mol']} ci={ddH.ci?.['kcal/mol']} />
            <Row name="ΔΔS‡" unit="J/(mol·K)" value={ddS['J/(mol*K)']} se={ddS.se?.['J/(mol*K)']} ci={ddS.ci?.['J/(mol*K)']} />
            <Row name="ΔΔS‡" unit="cal/(mol·K)" value={ddS['cal/(mol*K)']} se={ddS.se?.['cal/(mol*K)']} ci={ddS.ci?.['cal/(mol*K)']} />
            <Row name="ΔΔG‡ at 25 °C" unit="kJ/mol" value={ddG['kJ/mol']} se={ddG.se?.['kJ/mol']} ci={ddG.ci?.['kJ/mol']} />
            <Row name="ΔΔG‡ at 25 °C" unit="kcal/mol" value={ddG['kcal/mol']} se={ddG.se?.['kcal/mol']} ci={ddG.ci?.['kcal/mol']} />
          </tbody>
        </table>
      </SidewaysScroll>
      <dl className="tnum grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-sm sm:grid-cols-[auto_1fr_auto_1fr]">
        <dt className="text-ink-600">Correlation of ΔΔH‡ and ΔΔS‡</dt>
        <dd className="text-ink-950">{fit.correlation === null ? '—' : fixed(fit.correlation, 4)}</dd>
        <dt className="text-ink-600">R²</dt>
        <dd className="text-ink-950">{fit.rSquared === null ? '—' : fixed(fit.rSquared, 4)}</dd>
        <dt className="text-ink-600">Runs fitted (n) / dof</dt>
        <dd className="text-ink-950">
          {fit.n} / {fit.dof}
        </dd>
        <dt className="text-ink-600">Residual SD of ln r</dt>
        <dd className="text-ink-950">{fit.residualSD === null ? '—' : fixed(fit.residualSD, 3)}</dd>
        <dt className="text-ink-600">Weighting</dt>
        <dd className="text-ink-950">{fit.weighting === 'none' ? 'none (ordinary least squares)' : 'by uncertainty (weighted)'}</dd>
        <dt className="text-ink-600">Screened range</dt>
        <dd className="text-ink-950">
          {fixed(celsiusFromKelvin(fit.temperatureRange.minKelvin), 1)} to {fixed(celsiusFromKelvin(fit.temperatureRange.maxKelvin), 1)} °C
        </dd>
      </dl>
      <FitModelNotes fit={fit} />
      <p className="text-xs text-ink-500">
        ΔΔH‡ and ΔΔS‡ are estimated together and are strongly correlated; their SEs are not independent, so every derived value above and
        every band uses the full covariance.
      </p>
    </div>
  );
}
