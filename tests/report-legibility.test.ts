/**
 * The report's pictures read at page width: the strap example's report opened in headless
 * Chromium (Debian's chromium through playwright-core, as in report-html.test.ts), laid out for
 * print at the width of an A4 page, and every picture's smallest text measured at that scale.
 * A picture carries the smallest text size it was drawn with (data-min-text-px, CSS pixels at
 * its CSS width data-css-width); printed, that text is min-text x displayed width / CSS width.
 * The threshold is 8 pt = 8/72 inch = 10.67 CSS pixels (CSS: 96 pixels per inch, 72 points per
 * inch, CSS Values and Units Level 3, section 5.2), a common lower limit for print legibility
 * (common practice). The glyph heights in the raster are checked too: the tallest dark run
 * in the footer line of the contour picture is the text's cap or ascender height, which for
 * DejaVu Sans is about 0.73 to 0.76 em.
 */
import { describe, expect, it, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { loadModelFile } from '../src/model/load.js';
import { certifyModel } from '../src/pipeline/certify.js';
import { buildResult } from '../src/report/result.js';
import { writeResultFiles } from '../src/report/files.js';
import { plotSource } from '../src/report/saved.js';
import { contourScene } from '../src/report/pictures.js';
import { COLUMN_PX, EIGHT_PT_PX, MIN_TEXT_PX, reportPictures } from '../src/report/report-pictures.js';
import { capHeight } from '../src/render/font.js';
import { chromiumUnavailable, openChromium } from './support/chromium.js';

const missing = chromiumUnavailable('report-legibility.test.ts');

const { model } = loadModelFile('examples/strap-bolt-hole.json');
const cert = certifyModel(model, { target: 0.01 });
const result = buildResult(cert.analysis, 'examples/strap-bolt-hole.json', cert);

describe('report pictures drawn for the column', () => {
  const src = plotSource(cert.analysis, result, '2024-03-04T05:06:07Z');
  const pics = reportPictures(src);

  it('every picture is drawn 680 CSS pixels wide with its smallest text at 11.5 CSS pixels or more, as a PNG of twice (the mesh 1.5 times) the pixels', () => {
    expect([...pics.keys()].sort()).toEqual(['contour', 'convergence', 'deformed', 'geometry', 'mesh', 'peak', 'section']);
    for (const [name, p] of pics) {
      expect(p.width, name).toBe(COLUMN_PX);
      expect(p.minTextPx, name).toBeGreaterThanOrEqual(MIN_TEXT_PX);
      const png = PNG.sync.read(p.png);
      expect([png.width, png.height], name).toEqual([Math.round(p.width * p.scale), Math.round(p.height * p.scale)]);
    }
  });

  it('the contour keeps its colours: 256-colour PNG pixels within a few levels of the true-colour drawing', async () => {
    const { renderPng } = await import('../src/render/scene.js');
    const p = pics.get('contour')!;
    // the same scene drawn again at the size the report chose, in true colour: compare on a grid of pixels
    const truth = renderPng(contourScene(src, { width: p.width, height: p.height, textSize: p.textSize }), p.scale);
    const got = PNG.sync.read(p.png);
    expect([truth.width, truth.height]).toEqual([got.width, got.height]);
    let worst = 0;
    let sum = 0;
    let n = 0;
    for (let y = 0; y < got.height; y += 3) {
      for (let x = 0; x < got.width; x += 3) {
        const o = 4 * (y * got.width + x);
        const d = Math.max(...[0, 1, 2].map((c) => Math.abs(got.data[o + c] - truth.data[o + c])));
        worst = Math.max(worst, d);
        sum += d;
        n++;
      }
    }
    // median cut to 256 colours: the mean error is small (measured 0.3 levels), no pixel far off
    expect(sum / n).toBeLessThan(3);
    expect(worst).toBeLessThan(64);
  });

  it('the footer text in the contour PNG is as tall as its font size says (glyph height measured on the raster)', () => {
    const p = pics.get('contour')!;
    const png = PNG.sync.read(p.png);
    // The caution line is the last text: its capitals ("L", "A", "K", "C") rise capHeight above its baseline.
    // Scan the bottom band of the picture for the rows holding the caution's dark red ink.
    const rows: number[] = [];
    for (let y = Math.floor(png.height * 0.75); y < png.height; y++) {
      let red = 0;
      for (let x = 0; x < png.width; x++) {
        const o = 4 * (y * png.width + x);
        if (png.data[o] > 110 && png.data[o] - png.data[o + 1] > 60 && png.data[o] - png.data[o + 2] > 60) red++;
      }
      if (red > 0) rows.push(y);
    }
    expect(rows.length).toBeGreaterThan(0);
    // The first line of the caution: the first run of consecutive rows with red ink.
    let end = 0;
    while (end + 1 < rows.length && rows[end + 1] - rows[end] <= 1) end++;
    const inkRows = rows[end] - rows[0] + 1;
    // The line holds capitals and descenders (p, y, q): its ink spans about 0.73 + 0.24 em.
    const footerEm = 0.82 * p.textSize * p.scale; // the footer's size in src/report/pictures.ts frame()
    expect(inkRows).toBeGreaterThanOrEqual(Math.floor(capHeight(footerEm)));
    expect(inkRows).toBeLessThanOrEqual(Math.ceil(1.1 * footerEm));
  });
});

describe.skipIf(missing !== null)('report printed on A4 in headless Chromium', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-legible-'));
  let ctx: import('playwright-core').BrowserContext;

  beforeAll(async () => {
    writeResultFiles(dir, cert.analysis, result, false, { createdAt: '2024-03-04T05:06:07Z' });
    // A4 is 210 mm wide = 793.7 CSS pixels; the test lays the page out at its printable width below
    ctx = await openChromium({ width: 794, height: 1123 });
  });

  afterAll(async () => {
    await ctx?.close();
  });

  it('report.html of the strap example is under 1.5 MB', () => {
    const size = statSync(join(dir, 'report.html')).size;
    process.stdout.write(`report-legibility: report.html ${size} bytes\n`);
    expect(size).toBeLessThan(1.5e6);
  });

  it('every text in every picture prints at 8 pt or more on A4 and on Letter (smallest text x displayed width / drawn width)', async () => {
    const page = await ctx.newPage();
    await page.goto('file://' + join(dir, 'report.html'));
    await page.emulateMedia({ media: 'print' });
    // In print the column is the page less its margins: lay the page out at A4's printable width.
    const marginMm = Number(await page.evaluate(`(() => { for (const s of document.styleSheets) for (const r of s.cssRules) if (r.type === 6 /* CSSPageRule */) { const m = r.style.getPropertyValue('margin'); if (m) return parseFloat(m); } return 0; })()`));
    expect(marginMm).toBeGreaterThan(0);
    for (const [paper, widthMm] of [['A4', 210], ['Letter', 215.9]] as const) {
    const printable = Math.floor(((widthMm - 2 * marginMm) / 25.4) * 96);
    await page.setViewportSize({ width: printable, height: 1123 });
    const figures = (await page.evaluate(
      `Array.from(document.querySelectorAll('figure img')).map((i) => ({ id: i.closest('figure').id, shown: i.getBoundingClientRect().width - 2, natural: i.naturalWidth, cssWidth: Number(i.dataset.cssWidth), minText: Number(i.dataset.minTextPx) }))`,
    )) as { id: string; shown: number; natural: number; cssWidth: number; minText: number }[];
    expect(figures.map((f) => f.id).sort()).toEqual(['fig-contour', 'fig-convergence', 'fig-deformed', 'fig-geometry', 'fig-mesh', 'fig-peak', 'fig-section']);
    const printed: Record<string, number> = {};
    for (const f of figures) {
      expect(f.natural, f.id).toBeGreaterThan(f.cssWidth);
      // the smallest text in raster pixels is minText x natural / cssWidth; shown at shown / natural
      const px = ((f.minText * f.natural) / f.cssWidth) * (f.shown / f.natural);
      printed[f.id] = Math.round(px * 100) / 100;
      expect(px, `${f.id}: smallest text ${px.toFixed(2)} CSS px printed`).toBeGreaterThanOrEqual(EIGHT_PT_PX);
    }
    process.stdout.write(`report-legibility: ${paper}, printable width ${printable} CSS px; smallest picture text printed (CSS px, 10.67 = 8 pt): ${JSON.stringify(printed)}\n`);
    }
    await page.close();
  });
});
