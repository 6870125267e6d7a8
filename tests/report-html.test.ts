/**
 * The HTML report opened in a real browser: Debian's chromium, driven by playwright-core
 * (no browser download; .ci/run installs it where it is missing). Where no Chromium can be had
 * the browser tests are skipped and say why (tests/support/chromium.ts).
 */
import { describe, expect, it, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { loadModelFile } from '../src/model/load.js';
import { certifyModel } from '../src/pipeline/certify.js';
import { buildResult } from '../src/report/result.js';
import { writeResultFiles } from '../src/report/files.js';
import { buildDomain } from '../src/geometry/domain.js';
import { describeRaiserShape, findRaisers } from '../src/post/raisers.js';
import { chromiumUnavailable, openChromium } from './support/chromium.js';

const missing = chromiumUnavailable('report-html.test.ts');

describe('geometry of the stress raisers, read from the model (no browser)', () => {
  it('a slot and a rounded rectangle: dimensions and centres as the model file gives them (examples/mounting-plate.json)', () => {
    const { model } = loadModelFile('examples/mounting-plate.json');
    const domain = buildDomain(model.geometry);
    const shapes = findRaisers(domain).map((r) => describeRaiserShape(domain, r));
    const win = shapes.find((s) => s.type === 'rounded-rectangle')!;
    // "window": rounded-rect, centre (60, 50), 40 x 24, corner radius 3
    expect(win).toMatchObject({ type: 'rounded-rectangle', width: 40, height: 24, cornerRadius: 3, angleDeg: 0 });
    expect(win.type === 'rounded-rectangle' && win.center[0]).toBeCloseTo(60, 12);
    expect(win.type === 'rounded-rectangle' && win.center[1]).toBeCloseTo(50, 12);
    // "adjustment slot": centre (120, 50), overall length 30, width 8, at 30 degrees: end
    // centres 11 mm either side of the centre along the slot
    const slot = shapes.find((s) => s.type === 'slot')!;
    if (slot.type !== 'slot') throw new Error('no slot');
    expect(slot.width).toBeCloseTo(8, 12);
    expect(slot.length).toBeCloseTo(30, 12);
    const c = Math.cos(Math.PI / 6);
    const ends = [...slot.ends].sort((a, b) => a[0] - b[0]);
    expect(ends[0][0]).toBeCloseTo(120 - 11 * c, 9);
    expect(ends[0][1]).toBeCloseTo(50 - 11 * 0.5, 9);
    expect(ends[1][0]).toBeCloseTo(120 + 11 * c, 9);
    expect(ends[1][1]).toBeCloseTo(50 + 11 * 0.5, 9);
  });

  it('a fillet: its radius, centre and quarter arc (examples/bracket.json)', () => {
    const { model } = loadModelFile('examples/bracket.json');
    const domain = buildDomain(model.geometry);
    const shapes = findRaisers(domain).map((r) => describeRaiserShape(domain, r));
    expect(shapes).toHaveLength(1);
    expect(shapes[0]).toMatchObject({ type: 'arc', radius: 6, sweepDeg: 90 });
  });
});

describe.skipIf(missing !== null)('HTML report in headless Chromium', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-html-'));
  let ctx: import('playwright-core').BrowserContext;
  let result: ReturnType<typeof buildResult>;

  beforeAll(async () => {
    const { model } = loadModelFile('examples/strap-bolt-hole.json');
    const cert = certifyModel(model, { target: 0.02 });
    result = buildResult(cert.analysis, 'examples/strap-bolt-hole.json', cert);
    writeResultFiles(dir, cert.analysis, result, false, { createdAt: '2024-03-04T05:06:07Z', pictureOptions: { width: 1000, height: 640 } });
    ctx = await openChromium({ width: 1000, height: 1400 });
  });

  afterAll(async () => {
    await ctx?.close();
  });

  it('opens as one self-contained file: every picture an embedded image that loads, nothing fetched', async () => {
    const page = await ctx.newPage();
    const requests: string[] = [];
    page.on('request', (r) => requests.push(r.url()));
    await page.goto('file://' + join(dir, 'report.html'));
    // Page expressions are strings: the test project is compiled without the DOM types.
    const images = (await page.evaluate('Array.from(document.images).map((i) => ({ src: i.src.slice(0, 22), ok: i.complete && i.naturalWidth > 0, w: i.naturalWidth }))')) as { src: string; ok: boolean; w: number }[];
    expect(images.length).toBe(7);
    for (const im of images) {
      expect(im.src).toBe('data:image/png;base64,');
      expect(im.ok).toBe(true);
    }
    expect(requests.filter((u) => !u.startsWith('data:') && !u.startsWith('file:'))).toEqual([]);
    const shot = PNG.sync.read(await page.screenshot({ fullPage: false }));
    expect([shot.width, shot.height]).toEqual([1000, 1400]);
    // Not a blank page: the screenshot has dark text pixels and the light result cards.
    let dark = 0;
    for (let i = 0; i < shot.width * shot.height; i++) if (shot.data[4 * i] < 80) dark++;
    expect(dark).toBeGreaterThan(2000);
    await page.close();
  });

  it('states the inputs, Kt net and gross with the band, the mesh, the convergence table and the cautions', async () => {
    const page = await ctx.newPage();
    await page.goto('file://' + join(dir, 'report.html'));
    const text = (await page.evaluate('document.body.innerText')) as string;
    expect(text).toContain('Lifting strap with an off-centre bolt hole');
    expect(await page.textContent('#kt')).toBe(Number(result.kt.value!.toPrecision(4)).toString());
    const table = (await page.textContent('#raisers'))!;
    for (const x of result.raisers) {
      expect(table).toContain(x.name);
      expect(table).toContain(`Kt net ${Number(x.kt.net!.value!.toPrecision(4))}`);
      expect(table).toContain(`Kt gross ${Number(x.kt.gross!.value!.toPrecision(4))}`);
    }
    expect(text).toMatch(/estimated error \+-\d/);
    expect(text).toContain('210000 MPa');
    expect(text).toContain('force on tag "pulled end": fx 40000 N');
    expect(text).toContain(`${result.mesh.elements} quadratic triangles (6-node)`);
    const convRows = await page.$$eval('#convergence tbody tr', (r) => r.length);
    expect(convRows).toBe(result.convergence.meshes.length);
    for (const c of result.cautions) expect(text).toContain(c);
    expect(text).toContain('qualified engineer');
    expect(text).toContain('Kf');
    expect(text).toContain('2024-03-04');
    await page.close();
  });

  it('has a geometry table with the outline extent and the bolt hole\'s centre and diameter as the model file gives them', async () => {
    const page = await ctx.newPage();
    await page.goto('file://' + join(dir, 'report.html'));
    const { model } = loadModelFile('examples/strap-bolt-hole.json');
    const hole = model.geometry.holes![0] as { center: [number, number]; diameter: number };
    const geometry = (await page.textContent('#geometry'))!;
    expect(geometry).toContain('hole 1 "bolt hole"');
    expect(geometry).toContain('circular hole');
    expect(geometry).toContain(`diameter ${hole.diameter} mm`);
    expect(geometry).toContain(`centre (${hole.center[0]}, ${hole.center[1]})`);
    // the strap is 300 mm long and 60 mm wide (the example's note)
    expect(await page.textContent('#outline')).toContain('x 0 to 300, y 0 to 60 mm: 300 by 60 mm');
    expect(await page.$$eval('#geometry tbody tr', (r) => r.length)).toBe(result.raisers.length);
    await page.close();
  });

  it('prints to A4 and to Letter', async () => {
    const page = await ctx.newPage();
    await page.goto('file://' + join(dir, 'report.html'));
    for (const format of ['A4', 'Letter'] as const) {
      const pdf = await page.pdf({ format });
      expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
      const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page\b/g) ?? []).length;
      expect(pages).toBeGreaterThanOrEqual(3);
      expect(pages).toBeLessThan(15);
    }
    // Wide content never overflows the printed width: no element is wider than the page body.
    await page.emulateMedia({ media: 'print' });
    const overflow = (await page.evaluate('document.documentElement.scrollWidth - document.documentElement.clientWidth')) as number;
    expect(overflow).toBeLessThanOrEqual(0);
    await page.close();
  });

  it('says the support in words', () => {
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(html).toMatch(/fixed \(both components held\) on tag &quot;[^&]+&quot;/);
  });

  it('is written beside the pictures it embeds, each embedded as drawn for the column', () => {
    // The report draws its own copies for the 180 mm column (src/report/report-pictures.ts); the
    // files beside it keep the size asked for (--size, here 1000 x 640).
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    const embedded = [...html.matchAll(/<figure id="fig-([a-z]+)"><img [^>]*data-css-width="(\d+)"[^>]*src="data:image\/png;base64,([^"]+)"/g)];
    expect(embedded.map((m) => m[1]).sort()).toEqual(['contour', 'convergence', 'deformed', 'geometry', 'mesh', 'peak', 'section']);
    for (const [, name, cssWidth, b64] of embedded) {
      expect(existsSync(join(dir, `${name}.png`)), name).toBe(true);
      const png = PNG.sync.read(Buffer.from(b64, 'base64'));
      expect(png.width, name).toBeGreaterThanOrEqual(Number(cssWidth));
    }
    expect(PNG.sync.read(readFileSync(join(dir, 'contour.png'))).width).toBe(1000);
  });
});
