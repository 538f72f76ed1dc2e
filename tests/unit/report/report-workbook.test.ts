import { describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { buildCampaignReport, reportFileName } from '../../../api/features/campaigns/report';
import { buildReportModel } from '../../../api/features/campaigns/report-model';
import { renderReportCharts } from '../../../api/features/campaigns/report-charts';
import { buildCampaignReportPdf } from '../../../api/features/campaigns/report-pdf';
import { forecastCsv, measurementsCsv } from '../../../api/features/campaigns/report-service';
import { analyseScreen } from '../../../api/features/calculators/fit';
import { toEngineMeasurements } from '../../../api/features/campaigns/analysis';
import { fixed, safeFileName } from '../../../api/features/campaigns/report-format';
import { HOSTILE, demoComparison, demoMeta, demoPlan, demoReportData } from './fixture';

/** A typical campaign as a team lead would print it: 30 runs, a saved plan and a saved comparison. */
const typicalCampaign = () => demoReportData(30, { plan: demoPlan(), comparisons: [demoComparison()] });

const onPath = (cmd: string) => {
  try {
    execFileSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
};

async function readBack(buffer: Buffer) {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(buffer as unknown as ArrayBuffer);
  return wb;
}

function cellsOf(ws: ExcelJS.Worksheet): ExcelJS.Cell[] {
  const out: ExcelJS.Cell[] = [];
  ws.eachRow((row) => row.eachCell((cell) => out.push(cell)));
  return out;
}

function labelRow(ws: ExcelJS.Worksheet, label: string, nth = 0): ExcelJS.Row {
  const found: ExcelJS.Row[] = [];
  ws.eachRow((row) => {
    if (row.getCell(1).value === label) found.push(row);
  });
  if (!found[nth]) throw new Error(`no row "${label}"`);
  return found[nth];
}

/** A decimal written with a run of six or more 9s or 0s before its last digit: float noise in text. */
const FLOAT_ARTEFACT = /\d\.\d*(?:9{6,}|0{6,})\d/;

describe('campaign workbook', () => {
  it('when a dr campaign is exported, then its sheets come in reading order with the summary first', async () => {
    const wb = await readBack(await buildCampaignReport(demoReportData(), demoMeta));
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Summary', 'Fit', 'Measurements', 'Forecast']);
    const summary = wb.getWorksheet('Summary')!;
    expect(labelRow(summary, 'Specification').getCell(2).value).toBe('dr ≥ 10.0:1');
    expect(String(labelRow(summary, 'Forecast dr').getCell(2).value)).toMatch(
      /^\d+\.\d:1 \(95 % prediction interval \d+\.\d:1 to \d+\.\d:1\)/,
    );
    expect(labelRow(summary, 'Forecast de (%)').getCell(6).value).toBe('%');
    expect(labelRow(summary, 'Forecast Major diastereomer (%)').getCell(2).value).toBeGreaterThan(50);
    // ee belongs to enantiomers only: a dr campaign never shows it.
    for (const ws of wb.worksheets) for (const c of cellsOf(ws)) expect(String(c.value)).not.toMatch(/\bee\b/);
    expect(String(labelRow(summary, 'Runs excluded').getCell(2).value)).toContain('integration failed');
    expect(String(labelRow(summary, 'Model').getCell(2).value)).toMatch(/^(One straight line|Two straight branches)/);
    expect(labelRow(summary, 'Exported by').getCell(2).value).toBe('R. Vale');
    expect(String(labelRow(summary, 'Sign convention').getCell(2).value)).toContain('X‡(TS→B) − X‡(TS→A)');
    expect(String(labelRow(summary, 'Caution').getCell(2).value)).toContain('process-safety');
    // The two charts sit on the Fit sheet, under the parameters.
    const images = wb.getWorksheet('Fit')!.getImages();
    expect(images).toHaveLength(2);
    const covariance = labelRow(wb.getWorksheet('Fit')!, 'Covariance intercept·intercept').number;
    for (const image of images) expect(image.range.tl.nativeRow).toBeGreaterThan(covariance);
  });

  it('when the workbook is read back, then every number equals the engine output', async () => {
    const data = demoReportData();
    const wb = await readBack(await buildCampaignReport(data, demoMeta));
    const fit = data.analysis.fit!;
    const named = (name: string) => {
      const ranges = wb.definedNames.getRanges(name).ranges;
      expect(ranges).toHaveLength(1);
      const [sheet, ref] = ranges[0]!.split('!');
      return wb.getWorksheet(sheet!.replace(/'/g, ''))!.getCell(ref!.replace(/\$/g, '')).value;
    };
    expect(named('ddH_kJ_per_mol')).toBe(fit.ddH['kJ/mol']);
    expect(named('ddH_kcal_per_mol')).toBe(fit.ddH['kcal/mol']);
    expect(named('ddS_J_per_mol_K')).toBe(fit.ddS['J/(mol*K)']);
    expect(named('Runs_fitted')).toBe(fit.n);
    expect(named('Forecast_ratio')).toBe(data.analysis.at!.ratio);
    const summary = wb.getWorksheet('Summary')!;
    const ddH = labelRow(summary, 'ΔΔH‡');
    expect(ddH.getCell(3).value).toBe(fit.ddH.se!['kJ/mol']);
    expect([ddH.getCell(4).value, ddH.getCell(5).value]).toEqual(fit.ddH.ci!['kJ/mol']);
    // Two significant digits of the SE decide the decimals shown.
    expect(ddH.getCell(2).numFmt).toBe(`0.${'0'.repeat(Math.ceil(-Math.log10(fit.ddH.se!['kJ/mol'])) + 1)}`);

    const ms = wb.getWorksheet('Measurements')!;
    const header = (ms.getRow(1).values as unknown[]).map(String);
    const lnCol = header.indexOf('ln r (−)');
    const tCol = header.indexOf('T (K)');
    data.analysis.points.forEach((p, i) => {
      expect(ms.getRow(i + 2).getCell(lnCol).value).toBe(p.lnRatio);
      expect(ms.getRow(i + 2).getCell(tCol).value).toBe(data.measurements[i]!.temperatureK);
    });
    // Each run's residual sits on its own row, as the engine computed it.
    const col = (h: string) => header.indexOf(h);
    expect(col("Cook's distance (−)")).toBeGreaterThan(0);
    fit.residuals.forEach((res, i) => {
      const row = ms.getRow(i + 2);
      expect(row.getCell(col('Fitted ln r (−)')).value).toBe(res.fitted);
      expect(row.getCell(col('Residual (−)')).value).toBe(res.residual);
      expect(row.getCell(col('Studentized residual (−)')).value).toBe(res.studentized);
      expect(row.getCell(col('Leverage (−)')).value).toBe(res.leverage);
      expect(row.getCell(col("Cook's distance (−)")).value).toBe(res.cooksDistance);
      expect(row.getCell(col('Flags')).value ?? '').toBe(res.flags.join(', '));
    });
    expect(fit.residuals).toHaveLength(data.measurements.length);

    const fitSheet = wb.getWorksheet('Fit')!;
    expect(labelRow(fitSheet, 'Slope of ln r on 1/T').getCell(2).value).toBe(fit.slope);
    expect(labelRow(fitSheet, 'Covariance slope·intercept').getCell(2).value).toBe(fit.covariance!.slopeIntercept);

    const fc = wb.getWorksheet('Forecast')!;
    const rows: { c: number; k: number; source: string; ratio: number }[] = [];
    fc.eachRow((row, i) => {
      if (i > 1)
        rows.push({
          c: row.getCell(1).value as number,
          k: row.getCell(2).value as number,
          source: String(row.getCell(3).value),
          ratio: row.getCell(4).value as number,
        });
    });
    const engine = analyseScreen(
      toEngineMeasurements(data.campaign, data.measurements),
      { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95 },
      rows.map((r) => r.k),
    );
    rows.forEach((r, i) => expect(r.ratio).toBe(engine.predictions[i]!.ratio));
    const grid = rows.filter((r) => r.source === 'grid').map((r) => r.c);
    // Every 5 °C over the screened −78 to 25 °C, widened to round values [C].
    expect(grid).toEqual(Array.from({ length: 22 }, (_, i) => -80 + 5 * i));
    // Text that does not start with a formula character needs no neutralising.
    expect(rows.some((r) => r.source === 'saved: =cmd|calc')).toBe(true);
    expect(rows.filter((r) => r.source === 'proposed temperature')).toHaveLength(1);
  });

  it('when a specification is set, then the forecast, measurement and residual rows say in words whether they meet it', async () => {
    // A minimum inside the screen (the forecast at −30 °C, rounded), so rows fall on both sides of it.
    const minimum = Math.round(demoReportData().analysis.at!.ratio! * 10) / 10;
    const data = demoReportData(12, { specification: { measure: 'dr', minimum, probability: 0.95, runs: 1, source: 'project' } });
    const wb = await readBack(await buildCampaignReport(data, demoMeta));
    const specLn = Math.log(minimum); // dr ≥ m:1 → ln r ≥ ln m [C]
    expect(labelRow(wb.getWorksheet('Summary')!, 'Specification').getCell(2).value).toBe(
      `dr ≥ ${minimum.toFixed(1)}:1, with probability 0.95 that a new run meets it (the project's default)`,
    );

    const fc = wb.getWorksheet('Forecast')!;
    const header = Array.from(fc.getRow(1).values as unknown[], String);
    const meetsCol = header.findIndex((h) => h.startsWith('Meets specification'));
    expect(meetsCol).toBeGreaterThan(0);
    const ks: number[] = [];
    const said: string[] = [];
    fc.eachRow((row, i) => {
      if (i === 1) return;
      ks.push(row.getCell(2).value as number);
      said.push(String(row.getCell(meetsCol).value));
    });
    const engine = analyseScreen(
      toEngineMeasurements(data.campaign, data.measurements),
      { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95 },
      ks,
    );
    engine.predictions.forEach((p, i) => {
      const low = Math.log(Math.min(p.predictionInterval!.ratio[0]!, p.predictionInterval!.ratio[1]!));
      const expected =
        Math.log(p.ratio!) < specLn
          ? 'falls short'
          : low >= specLn
            ? 'meets: whole prediction interval at or above'
            : 'forecast meets; interval reaches below';
      expect(said[i]).toBe(expected);
    });
    // Warm rows fall short, cold rows meet.
    expect(said).toContain('falls short');
    expect(said.some((s) => s.includes('meets'))).toBe(true);

    const ms = wb.getWorksheet('Measurements')!;
    const mh = Array.from(ms.getRow(1).values as unknown[], String);
    const col = mh.indexOf('Meets specification');
    data.analysis.points.forEach((p, i) => expect(ms.getRow(i + 2).getCell(col).value).toBe(p.lnRatio >= specLn ? 'meets' : 'falls short'));

    const proposed = labelRow(wb.getWorksheet('Summary')!, 'Meets specification').getCell(2).value;
    expect(['falls short', 'meets: whole prediction interval at or above', 'forecast meets; interval reaches below']).toContain(proposed);
  });

  it('when no specification is set, then no pass/fail column appears', async () => {
    const wb = await readBack(await buildCampaignReport(demoReportData(12, { specification: null }), demoMeta));
    for (const name of ['Forecast', 'Measurements']) {
      expect(Array.from(wb.getWorksheet(name)!.getRow(1).values as unknown[], String).some((h) => h.startsWith('Meets'))).toBe(false);
    }
    expect(labelRow(wb.getWorksheet('Summary')!, 'Specification').getCell(2).value).toBe('no specification set');
  });

  it('when any sheet holds text, then it carries no float artefacts', async () => {
    const wb = await readBack(await buildCampaignReport(demoReportData(), demoMeta));
    for (const ws of wb.worksheets) {
      for (const c of cellsOf(ws)) {
        if (typeof c.value === 'string') expect(c.value).not.toMatch(FLOAT_ARTEFACT);
        // Numbers keep full precision but Celsius values lose the kelvin round-trip noise.
        if (typeof c.value === 'number' && ws.name === 'Forecast' && Number(c.col) === 1)
          expect(String(c.value)).not.toMatch(FLOAT_ARTEFACT);
      }
    }
    expect(fixed(-39.99999999999997, 2)).toBe('−40.00');
    expect(fixed(-0.0001, 2)).toBe('0.00');
  });

  it('when user text starts like a formula, then it is stored as text in Text format and never as a formula', async () => {
    const wb = await readBack(await buildCampaignReport(demoReportData(), demoMeta));
    const texts: ExcelJS.Cell[] = [];
    for (const ws of wb.worksheets) {
      for (const c of cellsOf(ws)) {
        expect(c.type).not.toBe(ExcelJS.ValueType.Formula);
        // XML readers turn a stored carriage return into a line feed; the apostrophe is what matters.
        if (typeof c.value === 'string' && HOSTILE.some((h) => [`'${h}`, `'${h.replace('\r', '\n')}`].includes(c.value as string)))
          texts.push(c);
      }
    }
    expect(texts.length).toBe(HOSTILE.length);
    for (const c of texts) expect(c.numFmt).toBe('@');
    const reason = cellsOf(wb.getWorksheet('Measurements')!).find((c) => String(c.value).includes('integration failed'))!;
    expect(reason.value).toBe("'=1+1 (integration failed)");
    expect(reason.numFmt).toBe('@');
  });

  it('when the CSVs are written, then formula-like text is neutralised and numbers are plain', () => {
    const model = buildReportModel(demoReportData(), demoMeta);
    const m = measurementsCsv(model);
    const f = forecastCsv(model);
    expect(m.startsWith('\uFEFFsample,replicate,T (°C)')).toBe(true);
    expect(m).toContain(`"'=HYPERLINK(""http://example.test"",""x"")"`);
    expect(m).toContain(",'+1+2,");
    expect(m).toContain(",'@SUM(A1:A2),");
    expect(m).toContain("'=1+1 (integration failed)");
    expect(m).not.toMatch(FLOAT_ARTEFACT);
    expect(f).toContain('saved: =cmd|calc');
    expect(f.split('\r\n')[1]).toMatch(/^-80\.00,193\.15,grid,/);
    expect(f).not.toMatch(FLOAT_ARTEFACT);
  });

  it('when the page setup is read back, then every sheet prints landscape, fitted to width, with header, footer and page numbers', async () => {
    const wb = await readBack(await buildCampaignReport(demoReportData(), demoMeta));
    for (const ws of wb.worksheets) {
      expect(ws.pageSetup.orientation).toBe('landscape');
      expect(ws.pageSetup.fitToPage).toBe(true);
      expect(ws.pageSetup.fitToWidth).toBe(1);
      // The title carries "&", doubled so the header code does not swallow it.
      expect(ws.headerFooter.oddHeader).toContain('Aldol screen (invented demo) && co');
      expect(ws.headerFooter.oddFooter).toContain('Page &P of &N');
    }
    expect(wb.getWorksheet('Summary')!.pageSetup.fitToHeight).toBe(1);
    for (const name of ['Measurements', 'Fit', 'Forecast']) {
      const ws = wb.getWorksheet(name)!;
      expect(ws.pageSetup.printTitlesRow).toBe('1:1');
      expect(ws.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 });
    }
  });

  it('when a title has path or header characters, then the file name keeps only safe ones', () => {
    expect(reportFileName('../Añadir "x"; rm -rf /\r\n')).toBe('eyrie-Anadir-x-rm-rf-report.xlsx');
    expect(safeFileName('***', 'summary.pdf')).toBe('eyrie-campaign-summary.pdf');
  });

  it('when the PDF summary is built, then it has the summary page and the chart page', async () => {
    const model = buildReportModel(demoReportData(), demoMeta);
    const pdf = await buildCampaignReportPdf(model, renderReportCharts(model));
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(pdf.toString('latin1').match(/\/Type \/Page\b/g)).toHaveLength(2);
  });

  it.runIf(onPath('pdftotext'))('when the PDF is read as text, then it holds the summary', async () => {
    const model = buildReportModel(demoReportData(), demoMeta);
    const dir = mkdtempSync(path.join(tmpdir(), 'eyrie-pdf-'));
    try {
      writeFileSync(path.join(dir, 's.pdf'), await buildCampaignReportPdf(model, renderReportCharts(model)));
      const text = execFileSync('pdftotext', ['-layout', path.join(dir, 's.pdf'), '-'], { encoding: 'utf8' });
      expect(text).toContain('Aldol screen (invented demo) & co');
      expect(text).toContain('ΔΔH‡');
      expect(text).toMatch(/Forecast dr\s+\d+\.\d:1/);
      expect(text).toContain('dr ≥ 10.0:1');
      expect(text).toContain('process-safety review');
      expect(text).toContain(fixed(model.fit!.ddH['kJ/mol'], model.decimals.ddH));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('when a campaign with a plan and a comparison is exported, then its page setup prints the summary on page 1 and the charts on page 2', async () => {
    const wb = await readBack(await buildCampaignReport(typicalCampaign(), demoMeta));
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Summary', 'Fit', 'Measurements', 'Forecast', 'Plan', 'Comparison']);
    for (const ws of wb.worksheets) {
      expect(ws.pageSetup).toMatchObject({ orientation: 'landscape', paperSize: 9, fitToPage: true, fitToWidth: 1 });
      expect(ws.headerFooter.oddFooter).toContain('Page &P of &N');
    }
    // One page each for the Summary and for the fit with its charts; the tables run on at full width.
    for (const name of ['Summary', 'Fit']) expect(wb.getWorksheet(name)!.pageSetup.fitToHeight).toBe(1);
    for (const name of ['Measurements', 'Forecast', 'Plan', 'Comparison']) expect(wb.getWorksheet(name)!.pageSetup.fitToHeight).toBe(0);
    // The Fit sheet's print area reaches below both chart images, so neither is cut off.
    const fit = wb.getWorksheet('Fit')!;
    const lastRow = Number(/^A1:J(\d+)$/.exec(fit.pageSetup.printArea!)![1]);
    for (const image of fit.getImages()) expect(image.range.tl.nativeRow + 16).toBeLessThan(lastRow);
    for (const name of ['Measurements', 'Forecast', 'Plan']) expect(wb.getWorksheet(name)!.pageSetup.printTitlesRow).toBe('1:1');
  });

  it.runIf(onPath('soffice') && onPath('pdfinfo'))(
    'when LibreOffice prints a typical campaign with a plan and a comparison, then it takes at most 6 pages: the summary on page 1, the charts on page 2',
    async () => {
      const dir = mkdtempSync(path.join(tmpdir(), 'eyrie-lo-'));
      try {
        writeFileSync(path.join(dir, 'r.xlsx'), await buildCampaignReport(typicalCampaign(), demoMeta));
        execFileSync(
          'soffice',
          [`-env:UserInstallation=file://${dir}/profile`, '--headless', '--convert-to', 'pdf', '--outdir', dir, path.join(dir, 'r.xlsx')],
          { stdio: 'ignore', timeout: 60_000 },
        );
        const pdf = path.join(dir, 'r.pdf');
        const info = execFileSync('pdfinfo', [pdf], { encoding: 'utf8' });
        const pages = Number(/Pages:\s+(\d+)/.exec(info)![1]);
        // Six sheets of one page each: the goal for a campaign of a few dozen runs is at most six.
        expect(pages).toBe(6);
        if (onPath('pdftotext')) {
          const page = (n: number) =>
            execFileSync('pdftotext', ['-f', String(n), '-l', String(n), '-layout', pdf, '-'], { encoding: 'utf8' });
          const first = page(1);
          expect(first).toContain('Caution');
          expect(first).toContain('Eyrie version');
          expect(first).toContain('Page 1 of 6');
          const second = page(2);
          expect(second).toContain('Slope of ln r on 1/T');
          expect(second).toContain('Charts drawn from the same data');
          expect(page(5)).toContain('Recommended temperature');
          expect(page(6)).toContain('Boron sources (invented)');
        }
        if (onPath('pdfimages')) {
          // Both chart images print on page 2 (and the window chart with the plan).
          const listed = execFileSync('pdfimages', ['-list', '-f', '2', '-l', '2', pdf], { encoding: 'utf8' });
          expect(
            listed
              .trim()
              .split('\n')
              .filter((l) => /^\s*2\s/.test(l)).length,
          ).toBeGreaterThanOrEqual(2);
        }
        expect(readFileSync(pdf).length).toBeGreaterThan(1000);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
    90_000,
  );
});

describe('measures in the report', () => {
  it('when an ee campaign is exported, then it reads ee and er and never de or dr', async () => {
    const data = demoReportData(12);
    const campaign = { ...data.campaign, measure: 'ee', defaultUncertainty: 0.2 } as typeof data.campaign;
    const model = buildReportModel({ ...data, campaign, specification: { measure: 'ee', minimum: 95 } }, demoMeta);
    const headline = model.summary.find((l) => l.label === 'Forecast ee')!.value as string;
    // ±0.2 percentage points → one decimal [C].
    expect(headline).toMatch(/^\d+\.\d % ee \(er \d+\.\d:1\) \(95 % prediction interval \d+\.\d to \d+\.\d % ee\)/);
    expect(model.specificationText).toBe('ee ≥ 95.0 %');
    const text = model.summary.map((l) => `${l.label} ${String(l.value)}`).join('\n');
    expect(text).not.toMatch(/\b(de|dr)\b/);
  });

  it('when a plain-ratio campaign is exported, then no excess column appears', () => {
    const data = demoReportData(12);
    const campaign = { ...data.campaign, measure: 'ratio' } as typeof data.campaign;
    const model = buildReportModel({ ...data, campaign, specification: null }, demoMeta);
    expect(model.labels.excess).toBeNull();
    expect(model.specificationText).toBe('no specification set');
    expect(measurementsCsv(model).split('\r\n')[0]).not.toMatch(/ee|de \(%\)/);
  });
});
