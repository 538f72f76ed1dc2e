import type { FitResponse } from '../../../../api/features/compute/schemas';
import { TableHead } from '../../../components/ui/table-head';
import { fixed, percent, sig } from '../../../lib/format';
import { celsiusFromKelvin, eeFromLnRatio } from '../../../../api/science/quantities';

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
}: {
  fit: FitResponse;
  /** Paste-box line number of each measurement, by index. */
  lines: number[];
  excludedLines: number[];
  onToggleExclude: (line: number) => void;
}) {
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
            { label: 'Studentized' },
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
                <td className="px-2 py-1">{percent(eeFromLnRatio(r.lnRatio))}</td>
                <td className="px-2 py-1">{fixed(r.lnRatio, 3)}</td>
                <td className="px-2 py-1">{r.residual === null ? '—' : fixed(r.residual, 3)}</td>
                <td className="px-2 py-1">{r.studentized === null ? '—' : fixed(r.studentized, 2)}</td>
                <td className="px-2 py-1">{r.leverage === null ? '—' : fixed(r.leverage, 2)}</td>
                <td className="px-2 py-1 text-left">
                  {r.status === 'censored' ? 'lower bound (censored)' : r.status === 'excluded' ? 'excluded' : 'fitted'}
                  {flagged && (
                    <span className="ml-1 font-medium text-caution-700">⚑ {r.flags.map((f) => FLAG_TEXT[f] ?? f).join(', ')}</span>
                  )}
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

/** The two-branch comparison: which model is preferred, the branches and the isoinversion temperature. */
export function TwoBranchBox({ twoBranch }: { twoBranch: NonNullable<FitResponse['twoBranch']> }) {
  const preferTwo = twoBranch.preferred === 'two-branch';
  const branch = (name: string, b: typeof twoBranch.low) => (
    <li>
      {name}: {fixed(celsiusFromKelvin(b.fromKelvin), 0)} to {fixed(celsiusFromKelvin(b.toKelvin), 0)} °C, n = {b.n}, ΔΔH‡ = {fixed(b.ddH['kJ/mol'], 1)} kJ/mol
      ({fixed(b.ddH['kcal/mol'], 2)} kcal/mol), ΔΔS‡ = {fixed(b.ddS['J/(mol*K)'], 1)} J/(mol·K) ({fixed(b.ddS['cal/(mol*K)'], 2)}{' '}
      cal/(mol·K))
    </li>
  );
  return (
    <section
      aria-label="Two-branch check"
      className={`rounded-md border px-3 py-2 text-sm ${preferTwo ? 'border-fjord-600/50 bg-fjord-50' : 'border-slate-200 bg-slate-50'}`}
    >
      <p className="font-medium text-ink-900">
        Two-branch check: {preferTwo ? 'two straight branches describe the screen better than one line' : 'one straight line is preferred'}
      </p>
      <ul className="tnum mt-1 list-disc pl-5 text-ink-700">
        {branch('Low-temperature branch', twoBranch.low)}
        {branch('High-temperature branch', twoBranch.high)}
        <li>
          F test: F = {sig(twoBranch.fTest.F, 3)} on ({twoBranch.fTest.dof1}, {twoBranch.fTest.dof2}) dof,{' '}
          {twoBranch.fTest.p < 0.001 ? 'p < 0.001' : `p = ${fixed(twoBranch.fTest.p, 3)}`}; {twoBranch.informationCriterion.name} one line{' '}
          {fixed(twoBranch.informationCriterion.oneLine, 1)}, two branches {fixed(twoBranch.informationCriterion.twoBranch, 1)} (lower is
          better)
        </li>
        <li>
          Break between {fixed(celsiusFromKelvin(twoBranch.breakBetweenKelvin[0]), 0)} and {fixed(celsiusFromKelvin(twoBranch.breakBetweenKelvin[1]), 0)} °C
          {twoBranch.isoinversion
            ? preferTwo
              ? `; the branches cross at the isoinversion temperature ${fixed(twoBranch.isoinversion.celsius, 0)} °C (${fixed(twoBranch.isoinversion.kelvin, 0)} K)`
              : `; the trial branches would cross at ${fixed(twoBranch.isoinversion.celsius, 0)} °C, but the data do not support a break, so there is no isoinversion temperature to report`
            : '; the branches do not cross within reach'}
        </li>
      </ul>
      <p className="mt-1 text-xs text-ink-600">
        {twoBranch.note}
        {/extrapolate/i.test(twoBranch.note) ? '' : ' Never extrapolate a branch across the break.'}
      </p>
    </section>
  );
}
