import type { ForecastResponse } from '../../../../api/features/calculators/schemas';
import { TemperatureCells, TemperatureTable } from '../../../components/charts/temperature-swatch';
import { fixed, percentColumn, sig } from '../../../lib/format';
import { Th } from './kinetics-parts';

type Point = ForecastResponse['points'][number];

/** The forecast as a table: one row per temperature, optional check against a specification. */
export function ForecastTable({ points, spec }: { points: Point[]; spec?: { value: number; measure: 'ee' | 'percentA' } | null }) {
  // One number of decimals per column (raised near 100 %), so the figures line up.
  const eeCell = percentColumn(points.map((p) => p.eePercent));
  const shareCell = percentColumn(points.map((p) => p.percentA));
  const beyondAssay = points.some((p) => Math.abs(p.eePercent) > 99.8);
  return (
    <div className="flex flex-col gap-1">
      <TemperatureTable
        caption="Forecast selectivity by temperature"
        headings={
          <>
            <Th>T (K)</Th>
            <Th>ee (%)</Th>
            <Th>A (%)</Th>
            <Th>er (A:B)</Th>
            <Th>r</Th>
            <Th>ΔΔG‡ (kJ/mol)</Th>
            <Th>ΔΔG‡ (kcal/mol)</Th>
            {spec && <Th>Meets spec</Th>}
          </>
        }
      >
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
      </TemperatureTable>
      {beyondAssay && (
        <p className="text-xs text-ink-600">
          Above about 99.8 % ee chiral chromatography is at its quantitation limit: a run there can confirm only “≥ 99.8 %”, not the
          forecast digits.
        </p>
      )}
    </div>
  );
}
