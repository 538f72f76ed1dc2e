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
