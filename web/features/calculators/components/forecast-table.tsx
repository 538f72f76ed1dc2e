import type { ForecastResponse } from '../../../../api/features/calculators/schemas';
import { TemperatureCells } from '../../../components/charts/temperature-swatch';
import { fixed, percentColumn, sig } from '../../../lib/format';

type Point = ForecastResponse['points'][number];

/** The forecast as a table: one row per temperature, optional check against a specification. */
export function ForecastTable({ points, spec }: { points: Point[]; spec?: { value: number; measure: 'ee' | 'percentA' } | null }) {
  // One number of decimals per column (raised near 100 %), so the figures line up.
  const eeCell = percentColumn(points.map((p) => p.eePercent));
  const shareCell = percentColumn(points.map((p) => p.percentA));
  const beyondAssay = points.some((p) => Math.abs(p.eePercent) > 99.8);
  return (
    <div className="flex flex-col gap-1">
      <div className="max-h-[26rem] overflow-auto rounded border border-slate-200">
        <table className="tnum w-full border-collapse text-right text-sm">
          <caption className="sr-only">Forecast selectivity by temperature</caption>
          <thead className="sticky top-0 bg-slate-50 text-xs text-ink-600">
            <tr className="border-b border-slate-200">
              <th scope="col" className="w-4 px-0 py-1.5">
                <span className="sr-only">Temperature colour</span>
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                T (°C)
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                T (K)
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                ee (%)
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                A (%)
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                er (A:B)
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                r
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                ΔΔG‡ (kJ/mol)
              </th>
              <th scope="col" className="px-2 py-1.5 font-medium">
                ΔΔG‡ (kcal/mol)
              </th>
              {spec && (
                <th scope="col" className="px-2 py-1.5 font-medium">
                  Meets spec
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {points.map((p) => {
              const meets = spec ? (spec.measure === 'ee' ? p.eePercent : p.percentA) >= spec.value : null;
              return (
                <tr key={p.kelvin} className="border-b border-slate-100 last:border-0 hover:bg-slate-50">
                  <TemperatureCells celsius={p.celsius} />
                  <td className="px-2 py-1 text-ink-600">{fixed(p.kelvin, 2)}</td>
                  <td className="px-2 py-1 font-medium text-ink-950">{eeCell(p.eePercent)}</td>
                  <td className="px-2 py-1">{shareCell(p.percentA)}</td>
                  <td className="px-2 py-1">{`${shareCell(p.percentA)}:${shareCell(100 - p.percentA)}`}</td>
                  <td className="px-2 py-1">{sig(p.ratio, 3)}</td>
                  <td className="px-2 py-1">{fixed(p.ddG['kJ/mol'], 2)}</td>
                  <td className="px-2 py-1">{fixed(p.ddG['kcal/mol'], 2)}</td>
                  {spec && <td className={`px-2 py-1 ${meets ? 'text-fjord-700' : 'text-ink-500'}`}>{meets ? '✓ yes' : '✗ no'}</td>}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {beyondAssay && (
        <p className="text-xs text-ink-600">
          Above about 99.8 % ee chiral chromatography is at its quantitation limit: a run there can confirm only “≥ 99.8 %”, not the
          forecast digits.
        </p>
      )}
    </div>
  );
}
