/**
 * The workbook's Summary and charts as a PDF (pdfkit, pure JavaScript; the fonts are the same
 * shipped TrueType files the charts use, so ΔΔH‡, −, ± and ° print on any server).
 */
import PDFDocument from 'pdfkit';
import { REPORT_FONT_FILES, type ReportCharts } from './report-charts';
import { summaryLineText, type ReportModel } from './report-model';

const A4_LANDSCAPE: [number, number] = [841.89, 595.28];
const MARGIN = 40;

export async function buildCampaignReportPdf(model: ReportModel, charts: ReportCharts | null): Promise<Buffer> {
  const doc = new PDFDocument({
    size: A4_LANDSCAPE,
    margins: { top: MARGIN, bottom: MARGIN, left: MARGIN, right: MARGIN },
    info: {
      Title: `${model.data.campaign.title}: selectivity report`,
      Creator: `Eyrie ${model.meta.appVersion}`,
      CreationDate: model.meta.generatedAt,
    },
    autoFirstPage: true,
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  doc.registerFont('body', REPORT_FONT_FILES[0]!);
  doc.registerFont('bold', REPORT_FONT_FILES[1]!);

  const width = A4_LANDSCAPE[0] - 2 * MARGIN;
  const labelWidth = 150;
  doc.font('bold').fontSize(14).text(`${model.data.campaign.title}: selectivity report`, { width });
  doc.moveDown(0.3);
  let section = '';
  for (const line of model.summary) {
    if (line.section !== section) {
      section = line.section;
      doc.moveDown(0.25).font('bold').fontSize(9.5).fillColor('#0a4a46').text(section, MARGIN, doc.y, { width }).fillColor('#1e293b');
    }
    const text = summaryLineText(line);
    const y = doc.y;
    doc
      .font('bold')
      .fontSize(8)
      .text(line.label, MARGIN, y, { width: labelWidth - 8 });
    const afterLabel = doc.y;
    doc
      .font('body')
      .fontSize(8)
      .text(text, MARGIN + labelWidth, y, { width: width - labelWidth });
    doc.y = Math.max(doc.y, afterLabel) + 1.5;
  }

  if (charts) {
    doc.addPage();
    doc.font('bold').fontSize(12).fillColor('#1e293b').text('Charts', MARGIN, MARGIN);
    const w = (width - 20) / 2;
    const top = MARGIN + 24;
    doc.image(charts.eyring, MARGIN, top, { width: w });
    doc.image(charts.selectivity, MARGIN + w + 20, top, { width: w });
    doc
      .font('body')
      .fontSize(8)
      .text(
        `Bands at ${model.level} %: the darker band is the confidence interval of the line, the lighter one the prediction interval for a new run.`,
        MARGIN,
        top + (w * 420) / 720 + 12,
        { width },
      );
    if (charts.window) {
      // The saved plan's window, under the two fit charts, at the same size.
      const y = top + (w * 420) / 720 + 30;
      doc.image(charts.window, MARGIN, y, { width: w });
      doc
        .font('body')
        .fontSize(8)
        .text(
          'The saved plan: hatched temperatures break a constraint (named on the chart); the Plan sheet of the workbook holds the numbers.',
          MARGIN + w + 20,
          y + 12,
          { width: w },
        );
    }
  }
  doc.end();
  return done;
}
