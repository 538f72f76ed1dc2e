import type { ReactNode } from 'react';
import { fixed } from '../../lib/format';
import { thermalColor } from './thermal-scale';

/**
 * The first two cells of a table row keyed by temperature: a cold-to-warm dot (decoration
 * only; the number beside it carries the value) and the temperature in °C.
 */
export function TemperatureCells({ celsius }: { celsius: number }) {
  return (
    <>
      <td className="py-1 pl-2">
        <span className="inline-block h-2 w-2 rounded-full align-middle" style={{ background: thermalColor(celsius) }} aria-hidden="true" />
      </td>
      <td className="px-2 py-1">{fixed(celsius, 1)}</td>
    </>
  );
}

/**
 * A scrolling table keyed by temperature, its header sticky: the colour and °C columns that
 * {@link TemperatureCells} fills, then `headings` (further `th` cells); `children` are the body rows.
 */
export function TemperatureTable({ caption, headings, children }: { caption: string; headings: ReactNode; children: ReactNode }) {
  return (
    <div className="max-h-[26rem] overflow-auto rounded border border-slate-200">
      <table className="tnum w-full border-collapse text-right text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="sticky top-0 bg-slate-50 text-xs text-ink-600">
          <tr className="border-b border-slate-200">
            <th scope="col" className="w-4 px-0 py-1.5">
              <span className="sr-only">Temperature colour</span>
            </th>
            <th scope="col" className="px-2 py-1.5 font-medium">
              T (°C)
            </th>
            {headings}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}
