import type { ErosionResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { LineChart, type LineChartSeries } from '../../../components/charts/line-chart';
import { TemperatureCells, TemperatureTable } from '../../../components/charts/temperature-swatch';
import { SafetyCaution } from '../../../components/ui/caution';
import { fixed, percent, sig } from '../../../lib/format';
import { useErosion } from '../api/post-erosion';
import { initialErosionForm, toErosionRequest } from '../lib/erosion-form';
import { unmatchedErrors } from '../../../lib/field-errors';
import { useCalculator } from '../lib/use-calculator';
import { CalculatorLayout } from './calculator-layout';
import { ErosionForm, erosionFieldPaths } from './erosion-form';
import { durationTick, durationTicks, ResultNotes, sci, Th } from './kinetics-parts';

type Point = ErosionResponse['points'][number];

function holdCell(p: Point): string {
  if (p.floorStatus === 'already-below') return 'none: starts at or below the floor';
  if (p.floorStatus === 'never-reached') return 'unlimited: never falls to the floor';
  return p.longestHold?.text ?? '—';
}

/** Erosion during a hold: how fast ee is lost after the reaction, and how long material may wait. */
export function ErosionPanel() {
  const { form, submit, request, query, clientErrors, serverErrors, errors } = useCalculator({
    initial: initialErosionForm,
    toRequest: toErosionRequest,
    useResult: useErosion,
  });
  const leftover = unmatchedErrors(errors, erosionFieldPaths);

  return (
    <CalculatorLayout
      title="Erosion during a hold"
      form={<ErosionForm form={form} onSubmit={submit} errors={errors} busy={query.isFetching} />}
      query={query}
      clientErrors={clientErrors}
      serverErrors={serverErrors}
      leftover={leftover}
      prompt="Give the barrier, the initial ee and a range, then press Calculate erosion."
    >
      {(data) => <ErosionResult data={data} floorPercent={request?.eeFloorPercent ?? null} />}
    </CalculatorLayout>
  );
}

function ErosionResult({ data, floorPercent }: { data: ErosionResponse; floorPercent: number | null }) {
  const racemization = data.model === 'racemization';
  const hasHold = data.points.some((p) => p.eeAfterHoldPercent !== null);
  const hasFloor = data.points.some((p) => p.floorStatus !== null);
  const cls = data.atropisomerClass;
  const series: LineChartSeries[] = [
    { key: 'half-life', label: 'ee half-life', points: data.points.map((p) => ({ x: p.celsius, y: p.eeHalfLife.s })) },
    ...(hasFloor
      ? [
          {
            key: 'longest-hold',
            label: 'longest hold above the floor',
            points: data.points.filter((p) => p.longestHold && p.longestHold.s > 0).map((p) => ({ x: p.celsius, y: p.longestHold!.s })),
          },
        ]
      : []),
  ];

  return (
    <>
      <section
        aria-label="Stability class at 37 °C"
        className="tnum rounded border border-slate-200 bg-slate-50 px-3 py-2 text-sm text-ink-800"
      >
        <p>
          <span className="font-medium text-ink-950">Stability class {cls.class} at 37 °C</span> — ΔG‡ {fixed(cls.dG['kcal/mol'], 1)}{' '}
          kcal/mol ({fixed(cls.dG['kJ/mol'], 1)} kJ/mol), ee half-life {cls.eeHalfLife.text}. {cls.description}
        </p>
        <p className="mt-1 text-xs text-ink-600">{cls.definition}</p>
        <p className="mt-0.5 text-xs text-ink-600">Source: {cls.source}</p>
      </section>
      {data.equilibrium && (
        <p className="tnum text-sm text-ink-800">
          Epimerization towards K = [B]/[A] = {sig(data.equilibrium.ratio, 3)}: the excess relaxes to{' '}
          {fixed(data.equilibrium.excessPercent, 1)} %, not to 0.
        </p>
      )}

      <LineChart
        title="ee half-life against temperature"
        series={series}
        yLabel="Time (log scale)"
        yScale="log"
        yTicks={durationTicks}
        formatY={durationTick}
        testId="erosion-chart"
      />

      <TemperatureTable
        caption="Erosion of ee by temperature"
        headings={
          <>
            <Th>ΔG‡ (kJ/mol)</Th>
            <Th>{racemization ? 'k_e one-way (s⁻¹)' : 'k_f A→B (s⁻¹)'}</Th>
            {racemization ? <Th>k_rac = 2k_e (s⁻¹)</Th> : <Th>k_f + k_r (s⁻¹)</Th>}
            <Th className="text-ink-950">ee half-life</Th>
            {hasHold && <Th>ee after hold (%)</Th>}
            {hasFloor && <Th>Longest hold above floor</Th>}
          </>
        }
      >
        {data.points.map((p) => (
          <tr key={p.kelvin} className="border-b border-slate-100 last:border-0 hover:bg-slate-50">
            <TemperatureCells celsius={p.celsius} />
            <td className="px-2 py-1">{fixed(p.dG['kJ/mol'], 1)}</td>
            <td className="px-2 py-1">{sci(p.kePerS)}</td>
            <td className="px-2 py-1">{sci(racemization ? (p.kRacPerS ?? 2 * p.kePerS) : p.kRelaxationPerS)}</td>
            <td className="px-2 py-1 font-medium text-ink-950">{p.eeHalfLife.text}</td>
            {hasHold && (
              <td className="px-2 py-1">
                {p.eeAfterHoldPercent === null ? '—' : percent(p.eeAfterHoldPercent)}
                {p.eeAfterHoldPercent !== null && floorPercent !== null && p.eeAfterHoldPercent < floorPercent && (
                  <span className="ml-1 text-xs font-medium text-caution-700">✗ below floor</span>
                )}
              </td>
            )}
            {hasFloor && <td className="px-2 py-1">{holdCell(p)}</td>}
          </tr>
        ))}
      </TemperatureTable>
      <p className="text-xs text-ink-600">
        {racemization
          ? 'ee half-life here is the time for ee to halve: t½ = ln 2/(2k_e) = ln 2/k_rac.'
          : 'Half-life here is the time for the excess’s distance from its equilibrium value to halve: t½ = ln 2/(k_f + k_r).'}
      </p>
      <ResultNotes warnings={data.warnings} definitions={data.definitions} assumptions={data.assumptions} />
      <p className="text-xs text-ink-600">{data.caution}</p>
      <SafetyCaution compact />
    </>
  );
}
