import {
  IMPORT_FIELDS,
  type ImportField,
  type SelectivityMeasure,
  type TemperatureUnit,
  type TimeUnit,
} from '../../../../api/features/campaigns/schemas';
import type { ImportCell, PreviewColumn } from '../api/types';
import { FIELD_LABEL, REQUIRED_FIELDS, type MappingDraft } from '../lib/import-mapping';
import { MEASURE_LABEL } from '../lib/labels';
import { CompactSelect } from './compact-select';
import { TableHead } from '../../../components/ui/table-head';
import { errorAria } from '../../../components/ui/form';

const cellText = (c: ImportCell) => (c === null || c === '' ? '∅' : String(c));

/**
 * Column mapping: one row per field, a select of the file's columns (with the first values, so
 * the user can tell columns apart), and the unit and measure choices when no column holds them.
 */
export function ColumnMappingStep({
  columns,
  draft,
  errors,
  onChange,
}: {
  columns: PreviewColumn[];
  draft: MappingDraft;
  errors: Partial<Record<ImportField, string>>;
  onChange: (draft: MappingDraft) => void;
}) {
  const setColumn = (field: ImportField, value: string) =>
    onChange({ ...draft, columns: { ...draft.columns, [field]: value === '' ? null : Number(value) } });
  const columnName = (c: PreviewColumn) => `${c.letter}${c.header ? ` · ${c.header}` : ''}`;
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1 text-sm font-semibold text-ink-900">Map the file’s columns</legend>
      <table className="tnum w-full border-collapse text-sm" aria-label="Column mapping">
        <TableHead
          className="text-xs text-ink-600"
          columns={['Field', 'Column in the file', 'First values'].map((label) => ({ label, align: 'left' }))}
        />
        <tbody>
          {IMPORT_FIELDS.map((field) => {
            const chosen = draft.columns[field];
            const col = chosen === null ? undefined : columns.find((c) => c.index === chosen);
            // Unit and measure problems are shown beside their choice while no column is mapped.
            const error = (field === 'temperatureUnit' || field === 'measure') && chosen === null ? undefined : errors[field];
            const id = `map-${field}`;
            return (
              <tr key={field} className="border-b border-slate-100 align-top">
                <th scope="row" className="px-2 py-1 text-left font-medium text-ink-800">
                  <label htmlFor={id}>
                    {FIELD_LABEL[field]}
                    {REQUIRED_FIELDS.includes(field) && <span className="text-ink-500"> (required)</span>}
                  </label>
                </th>
                <td className="px-2 py-1">
                  <select
                    id={id}
                    value={chosen === null ? '' : String(chosen)}
                    onChange={(e) => setColumn(field, e.target.value)}
                    {...errorAria(id, !!error)}
                    className={`w-56 rounded border bg-white px-1.5 py-1 text-sm ${error ? 'border-rose-600' : 'border-slate-300'}`}
                  >
                    <option value="">— not in the file —</option>
                    {columns.map((c) => (
                      <option key={c.index} value={String(c.index)}>
                        {columnName(c)}
                      </option>
                    ))}
                  </select>
                  {error && (
                    <p id={`${id}-err`} className="mt-0.5 text-xs text-rose-700">
                      <span aria-hidden="true">✕ </span>
                      {error}
                    </p>
                  )}
                </td>
                <td className="max-w-xs truncate px-2 py-1 text-xs text-ink-600">{col ? col.sample.map(cellText).join(' · ') : ''}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <div className="flex flex-wrap gap-4">
        {draft.columns.temperatureUnit === null && (
          <CompactSelect<TemperatureUnit>
            blank="choose…"
            id="map-unit"
            label="Temperatures are in"
            value={draft.temperatureUnit}
            options={[
              ['C', '°C'],
              ['K', 'K'],
              ['F', '°F'],
            ]}
            error={errors.temperatureUnit}
            onChange={(temperatureUnit) => onChange({ ...draft, temperatureUnit })}
          />
        )}
        {draft.columns.measure === null && (
          <CompactSelect<SelectivityMeasure>
            blank="choose…"
            id="map-measure"
            label="The value column holds"
            value={draft.measure}
            options={(['ee', 'percentA', 'er', 'dr', 'ratio'] as const).map((m) => [m, MEASURE_LABEL[m]])}
            error={errors.measure}
            onChange={(measure) => onChange({ ...draft, measure })}
          />
        )}
        {draft.columns.reactionTime !== null && (
          <CompactSelect<TimeUnit>
            blank="choose…"
            id="map-time"
            label="Times are in"
            value={draft.timeUnit}
            options={[
              ['h', 'h'],
              ['min', 'min'],
              ['s', 's'],
            ]}
            onChange={(timeUnit) => timeUnit && onChange({ ...draft, timeUnit })}
          />
        )}
      </div>
    </fieldset>
  );
}
