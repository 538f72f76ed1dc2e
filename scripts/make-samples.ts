// Writes the example import files in samples/ from the invented demo screens in
// api/db/demo-campaigns.ts, so the files and the demo seed tell the same (invented) story.
// Run: npx tsx scripts/make-samples.ts
import ExcelJS from 'exceljs';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEMO_CAMPAIGNS, type DemoPoint } from '../api/db/demo-campaigns';
import { kelvinFromCelsius } from '../api/science/quantities';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const out = (name: string) => path.join(root, 'samples', name);
const [skylark, merlin, skylarkMeTHF] = DEMO_CAMPAIGNS;

const kelvin = (c: number) => Math.round(kelvinFromCelsius(c) * 100) / 100;
const csvField = (v: string | number | null, delimiter: string) => {
  const s = v === null ? '' : String(v);
  return s.includes(delimiter) || s.includes('"') || s.includes('\n') ? `"${s.replace(/"/g, '""')}"` : s;
};
const csv = (rows: (string | number | null)[][], delimiter = ',') =>
  rows.map((r) => r.map((v) => csvField(v, delimiter)).join(delimiter)).join('\r\n') + '\r\n';

// 1. Clean: comma-separated, kelvin, decimal points, duplicates at six temperatures.
writeFileSync(
  out('kestrelmoor-skylark-screen.csv'),
  csv([
    ['sample_id', 'replicate', 'T (K)', 'ee (%)', 'sd (% ee)', 'conversion (%)', 'time (h)', 'notes'],
    ...skylark.points.map((p) => [
      p.sampleId,
      p.replicateLabel,
      kelvin(p.temperatureC),
      p.eePercent,
      p.uncertainty,
      p.conversionPercent,
      p.reactionTimeH,
      p.notes,
    ]),
  ]),
);

// 2. A German-locale export: title line, semicolons, decimal commas, °C, UTF-8 with BOM.
const de = (n: number) => String(n).replace('.', ',');
writeFileSync(
  out('kestrelmoor-merlin-screen-de.csv'),
  '\uFEFF' +
    csv(
      [
        ['Kestrelmoor Laboratories (erfunden) – Temperaturscreening Merlin-Ligand in Toluol'],
        [],
        ['Probe', 'Temperatur (°C)', 'ee (%)', 'Umsatz (%)', 'Zeit (h)', 'Bemerkung'],
        ...merlin.points.map((p) => [
          p.sampleId,
          de(p.temperatureC),
          de(p.eePercent),
          de(p.conversionPercent),
          de(p.reactionTimeH),
          p.notes,
        ]),
      ],
      ';',
    ),
);

// 3. Row-level problems, one kind per row, each explained in the notes column.
const ok = (p: DemoPoint, notes: string | null = null) => [
  p.sampleId,
  p.replicateLabel,
  p.temperatureC,
  p.eePercent,
  p.uncertainty,
  p.conversionPercent,
  'T. Reyes',
  notes,
];
const s = skylark.points;
writeFileSync(
  out('kestrelmoor-screen-with-errors.csv'),
  csv([
    ['sample_id', 'replicate', 'T (°C)', 'ee (%)', 'sd (% ee)', 'conversion (%)', 'Operator', 'notes'],
    ok(s[0]),
    ok(s[1]),
    [s[2].sampleId, 'a', '', s[2].eePercent, 0.3, s[2].conversionPercent, 'T. Reyes', 'temperature not logged'],
    [s[3].sampleId, 'b', 25, 'n.d.', 0.3, s[3].conversionPercent, 'T. Reyes', 'peak overlap, not determined'],
    [s[4].sampleId, 'a', 10, 104.2, 0.3, s[4].conversionPercent, 'T. Reyes', 'integration error'],
    ok(s[5]),
    ok(s[5], null),
    [s[6].sampleId.replace('007', '017'), 'a', 298.15, 97.9, 0.3, 93.7, 'T. Reyes', 'thermometer read in kelvin'],
    [s[7].sampleId, 'b', -300, s[7].eePercent, 0.3, s[7].conversionPercent, 'T. Reyes', 'typo for -30'],
    [s[8].sampleId, 'a', -10, s[8].eePercent, 0.3, 130, 'T. Reyes', 'conversion over 100 %'],
    [s[9].sampleId, 'b', -10, s[9].eePercent, -0.3, s[9].conversionPercent, 'T. Reyes', 'negative uncertainty'],
    ok(s[10]),
    ok(s[11]),
  ]),
);

// 4. A workbook: numbers as numbers, the censored point as text "≥99.8", a second sheet of notes.
const workbook = new ExcelJS.Workbook();
workbook.creator = 'Eyrie sample generator (invented data)';
workbook.created = new Date(Date.UTC(2026, 11, 1));
workbook.modified = workbook.created;
const sheet = workbook.addWorksheet('Screen');
sheet.addRow(['Sample', 'Replicate', 'Temperature (°C)', 'ee (%)', 'SD (% ee)', 'Conversion (%)', 'Time (h)', 'Notes']);
for (const p of skylarkMeTHF.points) {
  sheet.addRow([
    p.sampleId,
    p.replicateLabel,
    p.temperatureC,
    p.isLowerBound ? `≥${p.eePercent}` : p.eePercent,
    p.uncertainty,
    p.conversionPercent,
    p.reactionTimeH,
    p.notes,
  ]);
}
sheet.getRow(1).font = { bold: true };
sheet.columns.forEach((c) => (c.width = 16));
const about = workbook.addWorksheet('About');
about.addRow(['Invented demo data (Kestrelmoor Laboratories is an invented company).']);
about.addRow(['Skylark ligand in 2-MeTHF, low-temperature screen. The −60 °C samples are at the ee quantitation limit (≥ 99.8 %).']);
writeFileSync(out('kestrelmoor-skylark-methf-screen.xlsx'), Buffer.from(await workbook.xlsx.writeBuffer()));

console.log('samples written');
