import type { FitResponse } from '../../../api/features/calculators/schemas';
import { TableHead } from '../ui/table-head';
import type { EyringBranchLine } from '../charts/eyring-plot';
import { fixed, leverageDecimals, measureColumn, sig, withUncertainty } from '../../lib/format';
import { celsiusFromKelvin } from '../../../api/science/quantities';

const FLAG_TEXT: Record<string, string> = {
  outlier: 'outlier (|studentized residual| > 3)',
  'high-leverage': 'high leverage',
  influential: "influential (Cook's distance > 1)",
};

/** Warnings from the API, always visible. */
export function FitWarnings({ warnings }: { warnings: FitResponse['warnings'] }) {
  if (warnings.length === 0) return null;
  return (
    <div role="status" className="rounded-md border border-amber-300 bg-caution-50 px-3 py-2 text-sm text-caution-700">
      <p className="font-medium">Warnings</p>
      <ul className="list-disc pl-5">
        {warnings.map((w) => (
          <li key={w.code + w.message}>{w.message}</li>
        ))}
      </ul>
    </div>
  );
}

/** One row per run: residual, diagnostics, flags, and a checkbox to exclude it (the fit keeps it visible). */
export function ResidualTable({
  fit,
  lines,
  excludedLines,
  onToggleExclude,
  assaySd = null,
}: {
  fit: FitResponse;
  /** SD of one assay result in % ee (when the screen gave ee with SDs): sets the decimals of the ee column. */
  assaySd?: number | null;
  /** Paste-box line number of each measurement, by index. */
  lines: number[];
  excludedLines: number[];
  onToggleExclude: (line: number) => void;
}) {
  const eeCell = measureColumn(
    'ee',
    fit.residuals.map((r) => r.lnRatio),
    assaySd,
  );
  const leverageDigits = leverageDecimals(fit.n);
  return (
    <div className="overflow-auto rounded border border-slate-200">
      <table className="tnum w-full border-collapse text-right text-sm">
        <caption className="sr-only">Residuals and flags for each run</caption>
        <TableHead
          columns={[
            { label: 'Line', align: 'left' },
            { label: 'T (°C)' },
            { label: 'ee (%)' },
            { label: 'ln r' },
            { label: 'Residual' },
            { label: 'Studentized (internal)' },
            { label: 'Leverage' },
            { label: 'Status and flags', align: 'left' },
            { label: 'Exclude', align: 'left' },
          ]}
        />
        <tbody>
          {fit.residuals.map((r) => {
            const line = lines[r.index];
            const flagged = r.flags.length > 0;
            return (
              <tr key={r.index} className={`border-b border-slate-100 last:border-0 ${flagged ? 'bg-caution-50' : ''}`}>
                <td className="px-2 py-1 text-left text-ink-600">{line ?? r.index + 1}</td>
                <td className="px-2 py-1">{fixed(celsiusFromKelvin(r.kelvin), 1)}</td>
                <td className="px-2 py-1">{eeCell(r.lnRatio)}</td>
                <td className="px-2 py-1">{fixed(r.lnRatio, 3)}</td>
                <td className="px-2 py-1">{r.residual === null ? '—' : fixed(r.residual, 3)}</td>
                <td className="px-2 py-1">{r.studentizedInternal == null ? '—' : fixed(r.studentizedInternal, 2)}</td>
                <td className="px-2 py-1">{r.leverage === null ? '—' : fixed(r.leverage, leverageDigits)}</td>
                <td className="px-2 py-1 text-left">
                  {r.status === 'censored' ? 'lower bound (censored)' : r.status === 'excluded' ? 'excluded' : 'fitted'}
                  {flagged && (
                    <span className="ml-1 font-medium text-caution-700">⚑ {r.flags.map((f) => FLAG_TEXT[f] ?? f).join(', ')}</span>
                  )}
                  <RunNote residual={r} />
                </td>
                <td className="px-2 py-1 text-left">
                  {line !== undefined && (
                    <input
                      type="checkbox"
                      aria-label={`Exclude the run on line ${line}`}
                      checked={excludedLines.includes(line)}
                      onChange={() => onToggleExclude(line)}
                    />
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/**
 * Why a run is flagged (one line); for a run that stands out from the others' scatter
 * (|internally studentized| ≥ 2), whether its residual is within the assay's own precision.
 */
export function RunNote({ residual }: { residual: FitResponse['residuals'][number] }) {
  if (residual.flagReason) return <span className="block text-xs text-caution-700">{residual.flagReason}</span>;
  const standsOut = residual.studentizedInternal != null && Math.abs(residual.studentizedInternal) >= 2;
  if (standsOut && residual.residualInAssaySigmas != null) {
    return (
      <span className="block text-xs text-ink-600">
        {residual.withinAssayPrecision ? 'within' : 'beyond'} the assay’s precision ({fixed(residual.residualInAssaySigmas, 1)} σ)
      </span>
    );
  }
  return null;
}

type Curvature = FitResponse['twoBranch'];

/** The branches of an accepted two-branch model as plot lines, each drawn up to the break. */
export function branchLines(twoBranch: Curvature | undefined): EyringBranchLine[] {
  if (!twoBranch?.checked || twoBranch.preferred !== 'two-branch' || !twoBranch.break || !twoBranch.low || !twoBranch.high) return [];
  const t = twoBranch.break.kelvin;
  return [
    {
      label: 'low-T branch',
      fromKelvin: twoBranch.low.fromKelvin,
      toKelvin: t,
      slope: twoBranch.low.slope,
      intercept: twoBranch.low.intercept,
    },
    {
      label: 'high-T branch',
      fromKelvin: t,
      toKelvin: twoBranch.high.toKelvin,
      slope: twoBranch.high.slope,
      intercept: twoBranch.high.intercept,
    },
  ];
}

const pText = (p: number) => (p < 0.001 ? 'p < 0.001' : `p = ${fixed(p, 3)}`);

/** The curvature check: one line or two branches meeting at a break, the break with its interval, the tests. */
export function TwoBranchBox({ twoBranch }: { twoBranch: Curvature }) {
  const preferTwo = twoBranch.preferred === 'two-branch';
  const help = (
    <p className="mt-1 text-xs text-ink-600">
      A curved Eyring plot can come from two competing pathways whose balance inverts (isoinversion; Buschmann, Scharf, Hoffmann &amp;
      Esser, 1991) or from a change of the selectivity-determining step (Gypser &amp; Norrby, 1997). The break test compares the best break
      with simulated straight-line screens of the same design, so it is not fooled by the search over break positions.
    </p>
  );
  if (!twoBranch.checked) {
    return (
      <section aria-label="Curvature check" className="rounded-md border border-slate-200 bg-slate-50 px-3 py-2 text-sm">
        <p className="font-medium text-ink-900">Curvature check: not enough data</p>
        <p className="mt-1 text-ink-700">{twoBranch.note}</p>
        {twoBranch.lackOfFit && <LackOfFit test={twoBranch.lackOfFit} />}
        {help}
      </section>
    );
  }
  const b = twoBranch.break;
  const branch = (name: string, br: NonNullable<typeof twoBranch.low>) => (
    <li>
      {name}: {fixed(celsiusFromKelvin(br.fromKelvin), 0)} to {fixed(celsiusFromKelvin(br.toKelvin), 0)} °C, n = {br.n}, ΔΔH‡ ={' '}
      {withUncertainty(br.ddH['kJ/mol'], br.ddH.se?.['kJ/mol'])} kJ/mol ({withUncertainty(br.ddH['kcal/mol'], br.ddH.se?.['kcal/mol'])}{' '}
      kcal/mol), ΔΔS‡ = {fixed(br.ddS['J/(mol*K)'], 1)} J/(mol·K)
    </li>
  );
  return (
    <section
      aria-label="Curvature check"
      className={`rounded-md border px-3 py-2 text-sm ${preferTwo ? 'border-fjord-600/50 bg-fjord-50' : 'border-slate-200 bg-slate-50'}`}
    >
      <p className="font-medium text-ink-900">
        Curvature check:{' '}
        {preferTwo
          ? 'two straight branches meeting at a break describe the screen better than one line; forecasts use them'
          : 'one straight line is adequate'}
      </p>
      {b && (
        <p className="tnum mt-1 font-medium text-ink-950" data-testid="break-temperature">
          {twoBranch.claim === 'isoinversion'
            ? `Isoinversion temperature, where r passes through a ${twoBranch.extremum}: ${fixed(b.celsius, 0)} °C (${fixed(b.kelvin, 0)} K)`
            : `Change of slope at ${fixed(b.celsius, 0)} °C (${fixed(b.kelvin, 0)} K)`}
          {b.ci && (
            <span className="font-normal text-ink-700">
              {' '}
              · {fixed(b.ci.level * 100, 0)} % CI {fixed(b.ci.celsius[0], 0)} to{' '}
              {b.ci.celsius[1] === null ? 'unbounded' : `${fixed(b.ci.celsius[1], 0)} °C`}
            </span>
          )}
        </p>
      )}
      <ul className="tnum mt-1 list-disc pl-5 text-ink-700">
        {twoBranch.low && branch('Low-temperature branch', twoBranch.low)}
        {twoBranch.high && branch('High-temperature branch', twoBranch.high)}
        <li>
          Break test: sup-F = {sig(twoBranch.breakTest.F, 3)}, {pText(twoBranch.breakTest.p)} against {twoBranch.breakTest.resamples}{' '}
          simulated straight-line screens (a break is accepted below p = {twoBranch.breakTest.alpha})
        </li>
        {twoBranch.lackOfFit && (
          <li>
            <LackOfFit test={twoBranch.lackOfFit} />
          </li>
        )}
      </ul>
      {preferTwo && <p className="mt-1 text-xs text-ink-600">Never carry a branch beyond the screened temperatures on its side.</p>}
      {help}
    </section>
  );
}

function LackOfFit({ test }: { test: NonNullable<Curvature['lackOfFit']> }) {
  return (
    <span>
      Lack of fit of one line against the replicates: F = {sig(test.F, 3)} on ({test.dof1}, {test.dof2}) dof, {pText(test.p)}
    </span>
  );
}
