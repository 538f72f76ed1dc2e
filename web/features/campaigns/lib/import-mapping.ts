/** The column-mapping step's state and its translation into the API's import mapping. */
import {
  IMPORT_FIELDS,
  importMappingSchema,
  type ImportField,
  type ImportMapping,
  type SelectivityMeasure,
  type TemperatureUnit,
  type TimeUnit,
} from '../../../../api/features/campaigns/schemas';
import type { SuggestedMapping } from '../api/types';

export interface MappingDraft {
  /** Column index per field; null = not in the file. */
  columns: Record<ImportField, number | null>;
  /** Used when no unit column is mapped. */
  temperatureUnit: TemperatureUnit | null;
  /** Used when no measure column is mapped. */
  measure: SelectivityMeasure | null;
  timeUnit: TimeUnit;
}

export const REQUIRED_FIELDS: ImportField[] = ['temperature', 'value'];

export const FIELD_LABEL: Record<ImportField, string> = {
  temperature: 'Temperature',
  temperatureUnit: 'Temperature unit (per row)',
  measure: 'Measure (per row)',
  value: 'Selectivity value',
  uncertainty: 'Uncertainty',
  sampleId: 'Sample id',
  replicateLabel: 'Replicate',
  conversionPercent: 'Conversion (%)',
  reactionTime: 'Reaction time',
  notes: 'Notes',
};

/** The starting point of the form: what the headers suggested. */
export function draftFromSuggestion(s: SuggestedMapping): MappingDraft {
  const columns = Object.fromEntries(IMPORT_FIELDS.map((f) => [f, s.columns[f] ?? null])) as Record<ImportField, number | null>;
  return { columns, temperatureUnit: s.temperatureUnit ?? null, measure: s.measure ?? null, timeUnit: s.timeUnit ?? 'h' };
}

/**
 * The API mapping from the form, checked with the API's own schema, plus a check the schema
 * cannot make: one column feeding two fields. Errors are keyed by field (or "temperatureUnit" /
 * "measure" for the unit choices).
 */
export function mappingFromDraft(draft: MappingDraft): { mapping: ImportMapping | null; errors: Partial<Record<ImportField, string>> } {
  const errors: Partial<Record<ImportField, string>> = {};
  const columns: Partial<Record<ImportField, number>> = {};
  const usedBy = new Map<number, ImportField>();
  for (const f of IMPORT_FIELDS) {
    const c = draft.columns[f];
    if (c === null) continue;
    const other = usedBy.get(c);
    if (other) errors[f] = `this column is already mapped to ${FIELD_LABEL[other].toLowerCase()}`;
    else usedBy.set(c, f);
    columns[f] = c;
  }
  for (const f of REQUIRED_FIELDS) if (draft.columns[f] === null) errors[f] = `choose the ${FIELD_LABEL[f].toLowerCase()} column`;
  const input = {
    columns,
    ...(draft.columns.temperatureUnit === null && draft.temperatureUnit ? { temperatureUnit: draft.temperatureUnit } : {}),
    ...(draft.columns.measure === null && draft.measure ? { measure: draft.measure } : {}),
    timeUnit: draft.timeUnit,
  };
  const parsed = importMappingSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const path = issue.path.map(String);
      const field = (path[0] === 'columns' ? path[1] : path[0]) as ImportField;
      if (IMPORT_FIELDS.includes(field) && !errors[field]) errors[field] = issue.message;
    }
  }
  return { mapping: parsed.success && Object.keys(errors).length === 0 ? parsed.data : null, errors };
}
