/**
 * Colours of chart marks, one palette for the web charts and the report's server-drawn charts (hex, because SVG
 * attributes cannot read Tailwind classes). Plain constants: the browser imports this module too.
 */
export const chartColors = {
  ink: '#1e293b',
  inkSoft: '#475569',
  grid: '#e2e8f0',
  accent: '#0f766e',
  accentDark: '#0a4a46',
  confidenceFill: '#0f766e',
  predictionFill: '#5eead4',
  branch: '#7c3aed',
  caution: '#8a4b08',
  flagRing: '#b4452c',
  paper: '#ffffff',
} as const;
