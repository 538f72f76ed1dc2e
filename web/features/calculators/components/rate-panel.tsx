import type { RateResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { LineChart, type LineChartSeries } from '../../../components/charts/line-chart';
import { TemperatureCells, TemperatureTable } from '../../../components/charts/temperature-swatch';
import { SafetyCaution } from '../../../components/ui/caution';
import { fixed, sig } from '../../../lib/format';
import { useRate } from '../api/post-rate';
import { unmatchedErrors } from '../../../lib/field-errors';
import { useCalculator } from '../lib/use-calculator';
import { CalculatorLayout } from './calculator-layout';
import { initialRateForm, toRateRequest } from '../lib/rate-form';
import { durationTick, durationTicks, kUnitText, ResultNotes, sci, Th } from './kinetics-parts';
import { RateForm, rateFieldPaths } from './rate-form';

const SOURCE_TEXT: Record<RateResponse['activation']['source'], string> = {
  given: 'as given',
  assumed: 'assumed, not measured',
  derived: 'derived from the two runs',
};

function signedKJ(v: number) {
  return `${v > 0 ? '+' : ''}${fixed(v, 0)}`;
}

/** Time to finish: rate constants and times to a target conversion across a temperature range. */
export function RatePanel() {
  const { form, submit, query, clientErrors, serverErrors, errors } = useCalculator({
    initial: initialRateForm,
    toRequest: toRateRequest,
    useResult: useRate,
  });
  const leftover = unmatchedErrors(errors, rateFieldPaths);

  return (
    <CalculatorLayout
      title="Time to finish"
      form={<RateForm form={form} onSubmit={submit} errors={errors} busy={query.isFetching} />}
      query={query}
      clientErrors={clientErrors}
      serverErrors={serverErrors}
      leftover={leftover}
      prompt="Describe a run (or a barrier), the order and a range, then press Calculate times."
    >
      {(data) => <RateResult data={data} />}
    </CalculatorLayout>
  );
}

function RateResult({ data }: { data: RateResponse }) {
  const target = fixed(data.targetConversionPercent, data.targetConversionPercent % 1 === 0 ? 0 : 1);
  const kUnit = kUnitText(data.kUnit);
  const variants = data.sensitivity?.variants ?? [];
  const a = data.activation;
  const series: LineChartSeries[] = [
    {
      key: 'main',
      label: data.sensitivity ? `ΔH‡ ${fixed(a.dH['kJ/mol'], 0)} kJ/mol (${SOURCE_TEXT[a.source]})` : `time to ${target} %`,
      points: data.points.map((p) => ({ x: p.celsius, y: p.timeToTarget.s })),
    },
    ...variants
      .filter((v) => v.points)
      .map((v) => ({
        key: `dH-${v.dH['kJ/mol']}`,
        label: `ΔH‡ ${fixed(v.dH['kJ/mol'], 0)} kJ/mol`,
        points: v.points!.map((p) => ({ x: p.celsius, y: p.timeToTarget.s })),
        secondary: true,
      })),
  ];
  const variantAt = (variant: (typeof variants)[number], kelvin: number) =>
    variant.points?.find((p) => Math.abs(p.kelvin - kelvin) < 1e-6)?.timeToTarget.text ?? '—';

  return (
    <>
      <dl className="tnum grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 rounded border border-slate-200 bg-slate-50 px-3 py-2 text-sm">
        <dt className="text-ink-600">ΔH‡</dt>
        <dd className="text-ink-950">
          {fixed(a.dH['kJ/mol'], 1)} kJ/mol ({fixed(a.dH['kcal/mol'], 2)} kcal/mol),{' '}
          <span className="text-ink-600">{SOURCE_TEXT[a.source]}</span>
        </dd>
        <dt className="text-ink-600">ΔS‡</dt>
        <dd className="text-ink-950">
          {fixed(a.dS['J/(mol*K)'], 1)} J/(mol·K) ({fixed(a.dS['cal/(mol*K)'], 2)} cal/(mol·K))
        </dd>
        <dt className="text-ink-600">Arrhenius Ea</dt>
        <dd className="text-ink-950">
          {fixed(a.ea['kJ/mol'], 1)} kJ/mol at {fixed(a.ea.kelvin, 2)} K <span className="text-ink-600">(Ea = ΔH‡ + RT)</span>
        </dd>
        {data.runs.map((r, i) => (
          <div key={i} className="contents">
            <dt className="text-ink-600">{data.runs.length > 1 ? `Run ${i + 1}` : 'Run'}</dt>
            <dd className="text-ink-950">
              k = {sig(r.k, 3)} {kUnit} at {fixed(r.celsius, 1)} °C
              {r.kObsPerS !== null && data.order === 'pseudo-first' ? ` (k_obs = ${sig(r.kObsPerS, 3)} s⁻¹)` : ''}
            </dd>
          </div>
        ))}
      </dl>

      <LineChart
        title={`Time to ${target} % conversion against temperature`}
        series={series}
        yLabel={`Time to ${target} % (log scale)`}
        yScale="log"
        yTicks={durationTicks}
        formatY={durationTick}
        testId="rate-chart"
      />
      {data.sensitivity && <p className="text-xs text-ink-600">{data.sensitivity.note}</p>}

      <TemperatureTable
        caption="Rate constant, half-life and time to the target conversion by temperature"
        headings={
          <>
            <Th>k ({kUnit})</Th>
            {data.order === 'pseudo-first' && <Th>k_obs (s⁻¹)</Th>}
            <Th>t½</Th>
            <Th className="text-ink-950">Time to {target} %</Th>
            {variants.map((v) => (
              <Th key={v.dH['kJ/mol']}>if ΔH‡ {signedKJ(v.dH['kJ/mol'] - a.dH['kJ/mol'])} kJ/mol</Th>
            ))}
            <Th>ΔG‡ (kJ/mol)</Th>
            <Th>Ea (kJ/mol)</Th>
          </>
        }
      >
        {data.points.map((p) => (
          <tr key={p.kelvin} className="border-b border-slate-100 last:border-0 hover:bg-slate-50">
            <TemperatureCells celsius={p.celsius} />
            <td className="px-2 py-1">{sci(p.k)}</td>
            {data.order === 'pseudo-first' && <td className="px-2 py-1">{p.kObsPerS === null ? '—' : sci(p.kObsPerS)}</td>}
            <td className="px-2 py-1">{p.halfLife.text}</td>
            <td className="px-2 py-1 font-medium text-ink-950">{p.timeToTarget.text}</td>
            {variants.map((v) => (
              <td key={v.dH['kJ/mol']} className="px-2 py-1 text-ink-600">
                {variantAt(v, p.kelvin)}
              </td>
            ))}
            <td className="px-2 py-1">{fixed(p.dG['kJ/mol'], 1)}</td>
            <td className="px-2 py-1">{fixed(p.ea['kJ/mol'], 1)}</td>
          </tr>
        ))}
      </TemperatureTable>
      {data.order === 'second' && (
        <p className="text-xs text-ink-600">Second order: t½ is the time to 50 % conversion from the given c₀ (it depends on c₀).</p>
      )}
      <ResultNotes warnings={data.warnings} assumptions={data.assumptions} />
      <p className="text-xs text-ink-600">{data.caution}</p>
      <SafetyCaution compact />
    </>
  );
}
