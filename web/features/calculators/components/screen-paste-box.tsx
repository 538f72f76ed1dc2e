import { useId } from 'react';
import type { ScreenParseError } from '../lib/parse-screen';
import { inputClass } from '../../../components/ui/fields';
import { LabelAbove } from '../../../components/ui/form';

/**
 * The paste box for a temperature screen with its per-line problems listed beneath it.
 * `lineErrors` holds both parse problems and API errors mapped to their lines.
 */
export function ScreenPasteBox({
  value,
  onChange,
  lineErrors,
  runCount,
  headerLine,
  unitLabel,
  selectivityLabel,
}: {
  value: string;
  onChange: (text: string) => void;
  lineErrors: ScreenParseError[];
  runCount: number;
  headerLine: number | null;
  unitLabel: string;
  selectivityLabel: string;
}) {
  const id = useId();
  const sorted = [...lineErrors].sort((a, b) => a.line - b.line);
  return (
    <LabelAbove id={id} label={`Screen: one run per line — temperature (${unitLabel}), ${selectivityLabel}[, SD]`} roomy>
      <textarea
        id={id}
        name="measurements"
        rows={9}
        spellCheck={false}
        className={`${inputClass} w-full font-mono text-[13px] leading-5`}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={sorted.length > 0}
        aria-describedby={`${id}-help ${sorted.length ? `${id}-errors` : ''}`}
        placeholder={'-40, 96.9, 0.3\n-20, 95.6, 0.3\n0, 93.7, 0.4'}
      />
      <p id={`${id}-help`} className="tnum text-xs text-ink-500">
        Separate values by tab, semicolon or comma. A bound such as ≥99.8 or &gt;200:1 is fitted as at least that selective. Lines starting
        with # are ignored.{' '}
        <span className="text-ink-700">
          {runCount} run{runCount === 1 ? '' : 's'} read
          {headerLine !== null ? `; line ${headerLine} read as column headings` : ''}.
        </span>
      </p>
      {sorted.length > 0 && (
        <ul
          id={`${id}-errors`}
          role="alert"
          aria-label="Problems in the pasted screen"
          className="rounded border border-red-300 bg-red-50 px-3 py-1.5 text-xs text-red-800"
        >
          {sorted.map((e, i) => (
            <li key={i} className="tnum">
              <span className="font-medium">Line {e.line}:</span> {e.message}
            </li>
          ))}
        </ul>
      )}
    </LabelAbove>
  );
}
