/**
 * The cold-to-warm scale, used only where temperature is the variable. Anchors follow
 * the theme's thermo colours; between anchors the colour is interpolated in RGB.
 */
const ANCHORS: [celsius: number, hex: string][] = [
  [-80, '#2c5aa0'],
  [-30, '#5fa8c8'],
  [10, '#9a9a7a'],
  [50, '#d08a3c'],
  [100, '#b4452c'],
];

function rgb(hex: string): [number, number, number] {
  const n = parseInt(hex.slice(1), 16);
  return [(n >> 16) & 255, (n >> 8) & 255, n & 255];
}

export function thermalColor(celsius: number): string {
  if (!Number.isFinite(celsius)) return ANCHORS[2][1];
  if (celsius <= ANCHORS[0][0]) return ANCHORS[0][1];
  for (let i = 1; i < ANCHORS.length; i++) {
    const [c1, h1] = ANCHORS[i];
    if (celsius <= c1) {
      const [c0, h0] = ANCHORS[i - 1];
      const t = (celsius - c0) / (c1 - c0);
      const a = rgb(h0);
      const b = rgb(h1);
      const mix = a.map((v, k) => Math.round(v + (b[k] - v) * t));
      return `rgb(${mix[0]}, ${mix[1]}, ${mix[2]})`;
    }
  }
  return ANCHORS[ANCHORS.length - 1][1];
}
