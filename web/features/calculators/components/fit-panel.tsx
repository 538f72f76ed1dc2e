import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Panel } from '../../../components/ui/page';
import { sameInputs, StaleResult, useLastDefined, worthRetrying, type StaleReason } from '../../../components/ui/stale';
import { ApiError } from '../../../lib/api-client';
import { FORM_ERROR } from '../../../lib/form';
import { useFit } from '../api/post-fit';
import { exampleScreen } from '../lib/example-screen';
import { buildFitRequest } from '../lib/fit-request';
import { buildView, mapFitErrors, numberOrNull, type FitInputs, type Submitted } from '../lib/fit-view';
import { parseScreen } from '../lib/parse-screen';
import { FitInputsForm } from './fit-inputs-form';
import { FitResults } from './fit-results';

const blankInputs: FitInputs = {
  text: '',
  unit: 'C',
  measure: 'ee',
  weighting: 'none',
  uncertaintyScale: 'absolute',
  proposedText: '',
  newRunText: '',
};

/** Fit panel: paste a screen, get the Eyring plot with bands, the parameters and a prediction. */
export function FitPanel() {
  const form = useForm<FitInputs>({ defaultValues: blankInputs });
  const inputs = form.watch();
  const { text, unit, measure, weighting, uncertaintyScale, proposedText, newRunText } = inputs;
  const [excludedLines, setExcludedLines] = useState<number[]>([]);
  const [submitted, setSubmitted] = useState<Submitted | null>(null);

  const parsed = useMemo(() => parseScreen(text, measure, unit), [text, measure, unit]);
  const query = useFit(submitted?.request ?? null);
  const apiErrors = query.error instanceof ApiError ? query.error.fieldErrors : [];
  const mapped = mapFitErrors(apiErrors, submitted);
  const proposed = numberOrNull(proposedText);

  /** Why the inputs cannot be sent yet, or null. */
  const problemOf = (): string | null => {
    if (parsed.errors.length > 0) return 'Fix the lines listed under the screen first.';
    if (parsed.rows.length < 2) return 'Paste at least two runs (three or more temperatures give intervals).';
    if (proposed === 'invalid') return 'The proposed temperature is not a number.';
    if (numberOrNull(newRunText) === 'invalid') return 'The assay SD for a new run is not a number.';
    return null;
  };

  const send = (excluded: number[]) => {
    form.clearErrors(FORM_ERROR);
    const problem = problemOf();
    if (problem) {
      form.setError(FORM_ERROR, { type: 'validate', message: problem });
      return;
    }
    const newRun = numberOrNull(newRunText) as number | null;
    const settings = { measure, unit, weighting, uncertaintyScale, proposed: proposed as number | null, excludedLines: excluded };
    const request = { ...buildFitRequest(parsed.rows, settings), ...(newRun === null ? {} : { newRunUncertainty: newRun }) };
    setSubmitted({ request, rows: parsed.rows, measure, hasProposed: proposed !== null, inputs: { ...inputs } });
  };

  const toggleExclude = (line: number) => {
    const next = excludedLines.includes(line) ? excludedLines.filter((l) => l !== line) : [...excludedLines, line];
    setExcludedLines(next);
    send(next);
  };

  const loadExample = () => {
    form.reset({
      ...form.getValues(),
      text: exampleScreen.text,
      unit: exampleScreen.unit,
      measure: exampleScreen.measure,
      proposedText: exampleScreen.proposedTemperature,
    });
    setExcludedLines([]);
  };

  // The fit on screen and the request it answers; it stays (greyed, labelled) after a failed request or an edit.
  const answered = useMemo(
    () => (query.data && !query.isPlaceholderData && submitted ? { fit: query.data, submitted } : null),
    [query.data, query.isPlaceholderData, submitted],
  );
  const shown = useLastDefined(answered);
  const fit = shown?.fit;
  const view = useMemo(() => (shown ? buildView(shown.fit, shown.submitted) : null), [shown]);
  const reason: StaleReason | null =
    query.isError && !query.data
      ? 'failed'
      : query.isFetching
        ? 'updating'
        : shown && !sameInputs(inputs, shown.submitted.inputs)
          ? 'changed'
          : null;

  return (
    <Panel title="Fit a temperature screen (Eyring plot)">
      <div className="grid gap-6 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
        <FitInputsForm
          form={form}
          parsed={parsed}
          mapped={mapped}
          error={query.error}
          fetching={query.isFetching}
          onSend={() => send(excludedLines)}
          onTextChange={(t) => {
            form.setValue('text', t);
            setExcludedLines([]);
          }}
          onLoadExample={loadExample}
        />

        <div className="flex min-w-0 flex-col gap-4" aria-live="polite">
          {!fit && !query.isFetching && (
            <p className="rounded border border-dashed border-slate-300 px-3 py-6 text-center text-sm text-ink-500">
              {query.error
                ? 'No fit: see the messages beside the inputs.'
                : 'Paste a screen (or load the invented example), then press Fit screen.'}
            </p>
          )}
          {fit && view && shown && (
            <StaleResult
              reason={reason}
              action="Fit screen"
              onRetry={worthRetrying(query.error) ? () => void query.refetch() : undefined}
              retrying={query.isFetching}
              className="gap-4"
            >
              <FitResults fit={fit} view={view} submitted={shown.submitted} excludedLines={excludedLines} onToggleExclude={toggleExclude} />
            </StaleResult>
          )}
        </div>
      </div>
    </Panel>
  );
}
