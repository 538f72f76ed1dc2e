import type { UseFormReturn } from 'react-hook-form';
import { TEMPERATURE_UNIT_LABEL as UNIT_TEXT } from '../../../../api/science/quantities';
import { ApiError } from '../../../lib/api-client';
import { errorAt, FORM_ERROR } from '../../../lib/form';
import { normalisePath } from '../../../lib/field-errors';
import type { FitInputs, mapFitErrors } from '../lib/fit-view';
import type { parseScreen, SelectivityMeasure } from '../lib/parse-screen';
import {
  buttonClass,
  measureOptions,
  NumberField,
  ProblemAlert,
  Segmented,
  secondaryButtonClass,
  SelectField,
  temperatureUnitOptions,
} from '../../../components/ui/fields';
import { ScreenPasteBox } from './screen-paste-box';

export const MEASURE_TEXT: Record<SelectivityMeasure, string> = {
  ee: 'ee %',
  er: 'er (A:B)',
  dr: 'dr (A:B)',
  percentA: '% A',
  ratio: 'r = A/B',
};

/**
 * The fit panel's inputs: the pasted screen with its unit and measure, the weighting, and a proposed
 * temperature with the new run's assay SD. The values live in the panel's form; the API's errors
 * on a measurement land on its pasted line, the rest beside their field or under the button.
 */
export function FitInputsForm({
  form,
  parsed,
  mapped,
  error,
  fetching,
  onSend,
  onTextChange,
  onLoadExample,
}: {
  form: UseFormReturn<FitInputs>;
  parsed: ReturnType<typeof parseScreen>;
  mapped: ReturnType<typeof mapFitErrors>;
  error: Error | null;
  fetching: boolean;
  onSend: () => void;
  onTextChange: (text: string) => void;
  onLoadExample: () => void;
}) {
  const v = form.watch();
  const set =
    <K extends keyof FitInputs>(name: K) =>
    (value: FitInputs[K]) =>
      form.setValue(name, value as never);
  const formProblem = errorAt(form.formState.errors, FORM_ERROR);
  return (
    <form aria-label="Screen inputs" noValidate className="flex flex-col gap-3" onSubmit={form.handleSubmit(onSend)}>
      <div className="flex flex-wrap items-end gap-2">
        <div className="flex flex-col gap-1">
          <span className="text-xs font-medium text-ink-700">Temperature unit</span>
          <SelectField label="Temperature unit of the screen" value={v.unit} options={temperatureUnitOptions} onChange={set('unit')} />
        </div>
        <div className="flex flex-col gap-1">
          <span className="text-xs font-medium text-ink-700">Selectivity as</span>
          <SelectField label="Selectivity measure of the screen" value={v.measure} options={measureOptions} onChange={set('measure')} />
        </div>
        <button type="button" className={`${secondaryButtonClass} ml-auto`} onClick={onLoadExample}>
          Load invented example
        </button>
      </div>
      <ScreenPasteBox
        value={v.text}
        onChange={onTextChange}
        lineErrors={[...parsed.errors, ...mapped.lineErrors]}
        runCount={parsed.rows.length}
        headerLine={parsed.headerLine}
        unitLabel={UNIT_TEXT[v.unit]}
        selectivityLabel={MEASURE_TEXT[v.measure]}
      />
      <Segmented
        legend="Weighting"
        name="weighting"
        value={v.weighting}
        onChange={set('weighting')}
        options={[
          { value: 'none', label: 'None' },
          { value: 'uncertainty', label: 'By uncertainty (SD column)' },
        ]}
      />
      {v.weighting === 'uncertainty' && (
        <Segmented
          legend="The SDs are"
          name="uncertainty-scale"
          value={v.uncertaintyScale}
          onChange={set('uncertaintyScale')}
          options={[
            { value: 'absolute', label: 'Absolute (true SDs)' },
            { value: 'relative', label: 'Relative (only ratios matter)' },
          ]}
        />
      )}
      <NumberField
        label="Proposed temperature"
        path="predict.proposed"
        value={v.proposedText}
        onChange={set('proposedText')}
        errors={mapped.proposed.map((message) => ({ path: 'predict.proposed', message }))}
        placeholder="e.g. −50"
        unit={<span className="text-sm text-ink-600">{UNIT_TEXT[v.unit]}</span>}
        hint="Forecast with a 95 % prediction interval for one new run."
      />
      <NumberField
        label="Assay SD of the new run (optional)"
        path="newRunUncertainty"
        value={v.newRunText}
        onChange={set('newRunText')}
        errors={mapped.other.filter((e) => normalisePath(e.path) === 'newRunUncertainty')}
        placeholder="e.g. 0.2"
        unit={<span className="text-sm text-ink-600">{MEASURE_TEXT[v.measure]}</span>}
        hint="Propagated at the predicted value; blank: the median SD of the pasted runs, or their scatter."
      />
      <div>
        <button type="submit" className={buttonClass} disabled={fetching}>
          {fetching ? 'Fitting…' : 'Fit screen'}
        </button>
      </div>
      {formProblem && <ProblemAlert title="Not sent" detail={formProblem} />}
      {error && (mapped.other.length > 0 || mapped.lineErrors.length === 0) && (
        <ProblemAlert
          title={error instanceof ApiError ? error.problem.title : 'The fit failed'}
          detail={error.message}
          errors={mapped.other}
        />
      )}
    </form>
  );
}
