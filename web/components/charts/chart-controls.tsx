import { useId, useState } from 'react';
import { inputClass, Segmented } from '../ui/fields';
import { LabelAbove } from '../ui/form';
import { axisText, readDecimal, type SelectivityMeasure } from '../../../api/science/quantities';

/** y-axis choice (ee % or % A; % de or % major for dr) and an optional specification in the same unit. */
export function ChartControls({
  name,
  measure,
  onMeasure,
  spec,
  onSpec,
  family = 'ee',
}: {
  name: string;
  measure: 'ee' | 'percentA';
  onMeasure: (m: 'ee' | 'percentA') => void;
  spec: string;
  onSpec: (s: string) => void;
  /** The measure the runs are reported in (sets the words). */
  family?: SelectivityMeasure;
}) {
  const id = useId();
  const signed = axisText(family, 'ee');
  const share = axisText(family, 'percentA');
  return (
    <div className="flex flex-wrap items-end gap-4">
      <Segmented
        legend="Plot"
        name={`${name}-axis`}
        value={measure}
        onChange={onMeasure}
        options={[
          { value: 'ee', label: signed.button },
          { value: 'percentA', label: share.button },
        ]}
      />
      <LabelAbove id={id} label="Specification (optional)" roomy>
        <div className="flex items-center gap-1.5">
          <input
            id={id}
            inputMode="decimal"
            className={`${inputClass} w-20`}
            value={spec}
            onChange={(e) => onSpec(e.target.value)}
            placeholder="e.g. 99"
          />
          <span className="whitespace-nowrap text-sm text-ink-600">{(measure === 'ee' ? signed : share).unit}</span>
        </div>
      </LabelAbove>
    </div>
  );
}

/**
 * The state behind ChartControls: the chosen axis, the specification as typed and as a number.
 * Spread `controls` into ChartControls.
 */
export function useChartControls(initialSpec: string) {
  const [measure, setMeasure] = useState<'ee' | 'percentA'>('ee');
  const [specText, setSpecText] = useState(initialSpec);
  return {
    measure,
    spec: parseSpec(specText),
    controls: { measure, onMeasure: setMeasure, spec: specText, onSpec: setSpecText },
  };
}

/** A specification as typed, or null when empty or not a number in range. */
export function parseSpec(text: string): number | null {
  const v = readDecimal(text);
  return v !== null && v > -100 && v <= 100 ? v : null;
}
