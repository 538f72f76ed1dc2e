import { readDecimal } from '../../../../api/science/quantities';

/**
 * Text typed into a number field: empty is "not given" (undefined); anything else must read as a
 * number (the shared grammar: a true minus sign and a decimal comma are fine), else NaN so the
 * API's schema names the field.
 */
export function numberText(text: string): number | undefined {
  if (text.trim() === '') return undefined;
  return readDecimal(text) ?? NaN;
}

/** A temperature range as typed (from, to, unit, count) in the API's `{ from, to, count }` shape. */
export function rangeText(form: { rangeFrom: string; rangeTo: string; rangeUnit: 'K' | 'C' | 'F'; count: string }) {
  return {
    from: { value: numberText(form.rangeFrom), unit: form.rangeUnit },
    to: { value: numberText(form.rangeTo), unit: form.rangeUnit },
    count: numberText(form.count),
  };
}
