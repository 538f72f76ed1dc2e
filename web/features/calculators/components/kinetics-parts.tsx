import type { ReactNode } from 'react';
import { scientific, sig } from '../../../lib/format';
import type { DurationUnit } from '../lib/rate-form';
import { FormNumber, FormSelect } from './calculator-form';
import { temperatureUnitOptions, type Option } from '../../../components/ui/fields';
import { SECONDS_PER } from '../../../../api/science/quantities';

export const durationUnitOptions: Option<DurationUnit>[] = [
  { value: 's', label: 's' },
  { value: 'min', label: 'min' },
  { value: 'h', label: 'h' },
  { value: 'd', label: 'd' },
];

/** k's unit as the API names it, written for reading. */
export function kUnitText(unit: 's^-1' | 'L/(mol*s)'): string {
  return unit === 's^-1' ? 's⁻¹' : 'L mol⁻¹ s⁻¹';
}

/** A tick or tooltip number with up to three significant figures and no trailing zeros. */
export function compactNumber(value: number): string {
  return sig(value, 3)
    .replace(/^([^×]*\.\d*?)0+(\s|$)/, '$1$2')
    .replace(/\.(\s|$)/, '$1');
}

/** A rate constant in scientific notation, three significant figures, so a column of them reads alike. */
export function sci(value: number): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  return scientific(value);
}

const { s: SECOND, min: MINUTE, h: HOUR, d: DAY, y: YEAR } = SECONDS_PER;
/** Readable time marks for a log axis in seconds: 1 s, 10 s, 1 min, 10 min, 1 h, 10 h, 1 d, 10 d, 100 d, 1 y, 10 y … */
const DURATION_MARKS = [
  1e-3,
  1e-2,
  0.1,
  SECOND,
  10,
  MINUTE,
  10 * MINUTE,
  HOUR,
  10 * HOUR,
  DAY,
  10 * DAY,
  100 * DAY,
  YEAR,
  10 * YEAR,
  100 * YEAR,
  1000 * YEAR,
];

export function durationTicks([lo, hi]: [number, number]): number[] {
  let marks = DURATION_MARKS.filter((t) => t >= lo * 0.999 && t <= hi * 1.001);
  while (marks.length > 7) marks = marks.filter((_, i) => i % 2 === 0);
  return marks;
}

/** A duration in seconds as a short axis label in the unit that reads best. */
export function durationTick(seconds: number): string {
  const [value, unit] =
    seconds < MINUTE
      ? [seconds, 's']
      : seconds < HOUR
        ? [seconds / MINUTE, 'min']
        : seconds < DAY
          ? [seconds / HOUR, 'h']
          : seconds < YEAR
            ? [seconds / DAY, 'd']
            : [seconds / YEAR, 'y'];
  return `${compactNumber(value)} ${unit}`;
}

/** From / to / how many: the temperature range every panel asks for (form fields rangeFrom, rangeTo, rangeUnit, count). */
export function RangeFields() {
  return (
    <fieldset className="flex flex-wrap items-start gap-3 border-t border-slate-200 pt-3">
      <legend className="sr-only">Temperature range</legend>
      <FormNumber label="From" path="temperatures.from" name="rangeFrom" width="w-20" />
      <FormNumber
        label="to"
        path="temperatures.to"
        name="rangeTo"
        width="w-20"
        unit={<FormSelect label="Range unit" name="rangeUnit" options={temperatureUnitOptions} />}
      />
      <FormNumber label="Temperatures" path="temperatures.count" name="count" width="w-16" />
    </fieldset>
  );
}

export const rangeFieldPaths = ['temperatures.from', 'temperatures.to', 'temperatures.count'];

/** The API's warnings (never hidden), definitions and assumptions under a result. */
export function ResultNotes({
  warnings = [],
  definitions = [],
  assumptions = [],
}: {
  warnings?: { code: string; message: string }[];
  definitions?: string[];
  assumptions?: string[];
}) {
  return (
    <div className="flex flex-col gap-2 text-xs text-ink-600">
      {warnings.length > 0 && (
        <div role="status" className="rounded border border-amber-300 bg-caution-50 px-3 py-2 text-caution-700">
          <p className="font-medium">
            <span aria-hidden="true">⚠ </span>
            {warnings.length === 1 ? 'Warning' : 'Warnings'}
          </p>
          <ul className="list-disc pl-5">
            {warnings.map((w) => (
              <li key={w.code}>{w.message}</li>
            ))}
          </ul>
        </div>
      )}
      {definitions.length > 0 && <NoteList title="Definitions" items={definitions} />}
      {assumptions.length > 0 && <NoteList title="Assumptions" items={assumptions} />}
    </div>
  );
}

function NoteList({ title, items }: { title: string; items: string[] }) {
  return (
    <div>
      <p className="font-medium text-ink-800">{title}</p>
      <ul className="list-disc pl-5">
        {items.map((a) => (
          <li key={a}>{a}</li>
        ))}
      </ul>
    </div>
  );
}

/** Placeholder shown in the results column before the first answer. */
export function EmptyResult({ failed, children }: { failed: boolean; children: ReactNode }) {
  return (
    <p className="rounded border border-dashed border-slate-300 px-3 py-6 text-center text-sm text-ink-500">
      {failed ? 'No result: see the message beside the inputs.' : children}
    </p>
  );
}

/** Table header cell in the calculators' style. */
export function Th({ children, className = '' }: { children: ReactNode; className?: string }) {
  return (
    <th scope="col" className={`px-2 py-1.5 font-medium ${className}`}>
      {children}
    </th>
  );
}
