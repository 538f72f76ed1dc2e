import { describe, expect, it } from 'vitest';
import { Resvg } from '@resvg/resvg-js';
import { PNG } from 'pngjs';
import { encodePng } from '../../../api/features/campaigns/png';
import { buildReportModel } from '../../../api/features/campaigns/report-model';
import { eyringChartSvg } from '../../../api/features/campaigns/report-charts';
import { demoMeta, demoReportData } from './fixture';

// Decoded by an independent PNG reader (pngjs), so the container, CRCs and zlib stream are checked too.
const decode = (png: Buffer) => PNG.sync.read(png);

describe('encodePng', () => {
  it('when a chart is drawn on an opaque page, then the PNG decodes to exactly the rendered pixels', async () => {
    const image = new Resvg(eyringChartSvg(buildReportModel(demoReportData(12), demoMeta))).render();
    const png = decode(await encodePng(image.width, image.height, image.pixels, true));
    expect([png.width, png.height]).toEqual([image.width, image.height]);
    expect(Buffer.from(png.data).equals(image.pixels)).toBe(true);
  });

  it("when parts are translucent, then colours are stored with straight alpha as resvg's own encoder stores them (±1)", async () => {
    const svg =
      '<svg xmlns="http://www.w3.org/2000/svg" width="40" height="20"><rect width="30" height="20" fill="#0f766e" fill-opacity="0.25"/><circle cx="25" cy="10" r="8" fill="#b45309" fill-opacity="0.6"/></svg>';
    const image = new Resvg(svg).render();
    const ours = decode(await encodePng(image.width, image.height, image.pixels, true)).data;
    const theirs = decode(image.asPng()).data;
    expect(ours.length).toBe(theirs.length);
    let worst = 0;
    for (let i = 0; i < ours.length; i++) worst = Math.max(worst, Math.abs(ours[i]! - theirs[i]!));
    expect(worst).toBeLessThanOrEqual(1);
    // Something translucent was drawn, so the check above compared demultiplied colours.
    expect(theirs.some((v, i) => i % 4 === 3 && v > 0 && v < 255)).toBe(true);
  });

  it('when the byte count does not match the size, then it refuses', async () => {
    await expect(encodePng(2, 2, new Uint8Array(15))).rejects.toThrow(/15 bytes do not make a 2 × 2 RGBA image/);
  });
});
