/**
 * The pictures, checked on their decoded pixels (pngjs): size, the peak marker at the peak, the
 * colour at a point against the colour map at that point's stress, the legend's numbers against
 * the field's range, curved edges kept curved, and nothing drawn outside the part except the
 * legend and the labels. The model is the bundled invented strap example on one mesh.
 */
import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { loadModelFile } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { plotSource, type PlotSource } from '../src/report/saved.js';
import { contourScene, stressField } from '../src/report/pictures.js';
import { renderPng, renderSvg, type Box } from '../src/render/scene.js';
import { colourAt, DEFAULT_MAP } from '../src/render/colormap.js';
import { toModel, toPixel, type View } from '../src/render/field.js';
import type { LegendTick } from '../src/render/annotate.js';
import { FieldProbe } from '../src/mesh/probe.js';
import { measureField } from '../src/post/peak.js';
import type { Model } from '../src/model/schema.js';

function solve(model: Model, file: string): PlotSource {
  const a = analyseModel(model);
  return plotSource(a, buildResult(a, file), '2024-05-06T07:08:09Z');
}

const strap = solve(loadModelFile('examples/strap-bolt-hole.json').model, 'examples/strap-bolt-hole.json');

function decode(buf: Buffer): PNG {
  return PNG.sync.read(buf);
}

function px(png: PNG, x: number, y: number): [number, number, number] {
  const o = 4 * (y * png.width + x);
  return [png.data[o], png.data[o + 1], png.data[o + 2]];
}

const inBox = (b: Box, x: number, y: number, pad = 0) => x >= b[0] - pad && x <= b[2] + pad && y >= b[1] - pad && y <= b[3] + pad;

describe('contour picture', () => {
  const scene = contourScene(strap, { width: 900, height: 560, iso: false });
  const png = decode(renderPng(scene).toPng());
  const info = scene.info as unknown as { view: View; draw: Box; range: [number, number]; ticks: LegendTick[]; bar: Box; peak: [number, number]; peakValue: number };

  it('has the requested size', () => {
    expect([png.width, png.height]).toEqual([900, 560]);
    const other = decode(renderPng(contourScene(strap, { width: 640, height: 400 })).toPng());
    expect([other.width, other.height]).toEqual([640, 400]);
  });

  it('marks the peak where the analysis found it: a dark ring around the pixel of the peak point', () => {
    const [cx, cy] = toPixel(info.view, strap.result.peak.x, strap.result.peak.y);
    expect(Math.hypot(cx - info.peak[0], cy - info.peak[1])).toBeLessThan(1e-9);
    // The ring's radius is 0.6 of the text size (11 px at this size): look for dark pixels on it.
    const size = Math.max(11, Math.min(22, Math.min(900 / 1.6, 560) / 58));
    let dark = 0;
    for (let k = 0; k < 24; k++) {
      const a = (2 * Math.PI * k) / 24;
      let found = false;
      for (let dr = -1; dr <= 1; dr++) {
        const c = px(png, Math.floor(cx + (0.6 * size + dr) * Math.cos(a)), Math.floor(cy + (0.6 * size + dr) * Math.sin(a)));
        if (c[0] + c[1] + c[2] < 200) found = true;
      }
      if (found) dark++;
    }
    expect(dark).toBeGreaterThanOrEqual(20);
    // The peak is at the hole edge: the pixel 4 px into the plate beside it is near the top colour.
    expect(strap.result.peak.feature).toContain('bolt hole');
  });

  it('colours each point as the colour map at the stress interpolated there', () => {
    const probe = new FieldProbe(strap.mesh);
    const field = stressField(strap, strap.result.peak.measure);
    const [lo, hi] = info.range;
    let checked = 0;
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const c3 = new Float64Array(3);
    for (let n = 0; n < 4000 && checked < 300; n++) {
      const x = Math.floor(info.draw[0] + rnd() * (info.draw[2] - info.draw[0]));
      const y = Math.floor(info.draw[1] + rnd() * (info.draw[3] - info.draw[1]));
      if (scene.info.boxes.some((b) => inBox(b.box, x, y, 3))) continue;
      // Keep 4 px away from the boundary, where the outline is drawn over the field.
      let inside = true;
      for (const [dx, dy] of [[0, 0], [4, 0], [-4, 0], [0, 4], [0, -4]]) {
        const [mx, my] = toModel(info.view, x + 0.5 + dx, y + 0.5 + dy);
        if (!probe.locate(mx, my)) inside = false;
      }
      if (!inside) continue;
      const [mx, my] = toModel(info.view, x + 0.5, y + 0.5);
      for (let c = 0; c < 3; c++) c3[c] = probe.value(strap.stress, 3, c, mx, my);
      const v = field.value(c3);
      const want = colourAt(DEFAULT_MAP, (v - lo) / (hi - lo));
      const got = px(png, x, y);
      for (let c = 0; c < 3; c++) expect(Math.abs(got[c] - want[c]), `pixel (${x}, ${y}) stress ${v}`).toBeLessThanOrEqual(3);
      checked++;
    }
    expect(checked).toBe(300);
  });

  it("spans the legend over the field's range and labels round values inside it, with text pixels beside the bar", () => {
    const nodal = measureField(strap.stress, strap.result.peak.measure, strap.szzFactor);
    const lo = Math.min(...nodal);
    const hi = Math.max(Math.max(...nodal), strap.result.peak.stress);
    expect(info.range[0]).toBeCloseTo(lo, 9);
    expect(info.range[1]).toBeCloseTo(hi, 9);
    expect(info.ticks.length).toBeGreaterThanOrEqual(3);
    const step = info.ticks[1].value - info.ticks[0].value;
    for (const t of info.ticks) {
      expect(t.value).toBeGreaterThanOrEqual(lo);
      expect(t.value).toBeLessThanOrEqual(hi);
      expect(Math.abs(t.value / step - Math.round(t.value / step))).toBeLessThan(1e-9);
      expect(Number(t.label.replace('\u2212', '-'))).toBeCloseTo(t.value, 9);
      // The tick sits where the value falls on the bar, and the bar there has the value's colour.
      const [, top, , bottom] = info.bar;
      expect(t.y).toBeCloseTo(bottom - ((t.value - lo) / (hi - lo)) * (bottom - top), 6);
      const want = colourAt(DEFAULT_MAP, (t.value - lo) / (hi - lo));
      const got = px(png, Math.floor(0.5 * (info.bar[0] + info.bar[2])), Math.floor(t.y));
      for (let c = 0; c < 3; c++) expect(Math.abs(got[c] - want[c])).toBeLessThanOrEqual(6);
      // Dark text pixels in a band around the tick, right of the bar.
      let ink = 0;
      for (let y = Math.floor(t.y - 6); y <= Math.ceil(t.y + 6); y++) for (let x = Math.ceil(info.bar[2] + 8); x < 900; x++) if (px(png, x, y)[0] < 200) ink++;
      expect(ink, `label ${t.label}`).toBeGreaterThan(8);
    }
    // Half-way between two ticks there is no text.
    const mid = 0.5 * (info.ticks[0].y + info.ticks[1].y);
    let ink = 0;
    for (let x = Math.ceil(info.bar[2] + 8); x < 900; x++) if (px(png, x, Math.floor(mid))[0] < 200) ink++;
    expect(ink).toBe(0);
  });

  it('draws nothing outside the plate except the legend, the title, the footer and the labels', () => {
    const probe = new FieldProbe(strap.mesh);
    let looked = 0;
    for (let y = 0; y < png.height; y += 2) {
      for (let x = 0; x < png.width; x += 2) {
        if (scene.info.boxes.some((b) => inBox(b.box, x, y, 2))) continue;
        let near = false;
        for (const [dx, dy] of [[0, 0], [3, 0], [-3, 0], [0, 3], [0, -3], [3, 3], [-3, -3], [3, -3], [-3, 3]]) {
          const [mx, my] = toModel(info.view, x + 0.5 + dx, y + 0.5 + dy);
          if (probe.locate(mx, my)) near = true;
        }
        if (near) continue;
        looked++;
        expect(px(png, x, y), `pixel (${x}, ${y})`).toEqual([255, 255, 255]);
      }
    }
    expect(looked).toBeGreaterThan(20000);
  });

  it('writes the same picture as SVG with the field embedded and the text as outlines', () => {
    const svg = renderSvg(scene);
    expect(svg).toMatch(/^<\?xml version="1.0" encoding="UTF-8"\?>\n<svg xmlns="http:\/\/www.w3.org\/2000\/svg" width="900" height="560"/);
    expect(svg).toContain('href="data:image/png;base64,');
    expect(svg).toContain('aria-label="Lifting strap with an off-centre bolt hole"');
    expect(svg).toContain('<linearGradient');
    expect(svg.trim().endsWith('</svg>')).toBe(true);
  });
});

describe('curved elements', () => {
  it('6-node elements keep a coarsely meshed hole round: the material reaches the true circle between the nodes', () => {
    const model = loadModelFile('examples/strap-bolt-hole.json').model;
    const coarse: Model = { ...model, mesh: { element: 'quadratic', size: 12, raiserSize: 7 } };
    const src = solve(coarse, 'coarse');
    const scene = contourScene(src, { width: 1400, height: 700, window: [130, 16, 170, 56], iso: false, meshLines: false });
    const png = decode(renderPng(scene).toPng());
    const view = (scene.info as unknown as { view: View }).view;
    // Hole: centre (150, 36), radius 8.5. Just inside the material (1.5 px beyond the circle)
    // every pixel must be coloured; with straight chords the mid-chord pixels would be white.
    const [cx, cy] = toPixel(view, 150, 36);
    const r = 8.5 * view.s;
    let white = 0;
    let n = 0;
    for (let k = 0; k < 360; k += 2) {
      const a = (k * Math.PI) / 180;
      const c = px(png, Math.floor(cx + (r + 3) * Math.cos(a)), Math.floor(cy + (r + 3) * Math.sin(a)));
      if (scene.info.boxes.some((b) => inBox(b.box, cx + (r + 3) * Math.cos(a), cy + (r + 3) * Math.sin(a), 2))) continue;
      n++;
      if (c[0] > 245 && c[1] > 245 && c[2] > 245) white++;
    }
    expect(n).toBeGreaterThan(120);
    expect(white).toBe(0);
    // And the hole itself stays empty 3 px inside the circle.
    let coloured = 0;
    for (let k = 0; k < 360; k += 2) {
      const a = (k * Math.PI) / 180;
      const qx = cx + (r - 3) * Math.cos(a);
      const qy = cy + (r - 3) * Math.sin(a);
      if (scene.info.boxes.some((b) => inBox(b.box, qx, qy, 2))) continue;
      const c = px(png, Math.floor(qx), Math.floor(qy));
      if (!(c[0] > 245 && c[1] > 245 && c[2] > 245)) coloured++;
    }
    expect(coloured).toBe(0);
  });
});
