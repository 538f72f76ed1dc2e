/**
 * Text typed into a number field: empty is "not given" (undefined); anything else must read as a
 * number, else NaN so the API's schema names the field. Accepts a true minus sign and a decimal comma.
 */
export function numberText(text: string): number | undefined {
  const t = text
    .trim()
    .replace(/\u2212/g, '-')
    .replace(',', '.');
  if (t === '') return undefined;
  return /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(t) ? Number(t) : NaN;
}

/** A temperature range as typed (from, to, unit, count) in the API's `{ from, to, count }` shape. */
export function rangeText(form: { rangeFrom: string; rangeTo: string; rangeUnit: 'K' | 'C' | 'F'; count: string }) {
  return {
    from: { value: numberText(form.rangeFrom), unit: form.rangeUnit },
    to: { value: numberText(form.rangeTo), unit: form.rangeUnit },
    count: numberText(form.count),
  };
}
