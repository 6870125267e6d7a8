/**
 * Regression tests for defects seen in the pictures, each checked on pixels or on the boxes the
 * scene records for its labels (scene.info.boxes). Models: the bundled invented examples
 * (examples/bracket.json, examples/link-plate.json), each on one mesh.
 */
import { describe, expect, it } from 'vitest';
import { loadModelFile } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { plotSource, type PlotSource } from '../src/report/saved.js';
import { CAUTION_LINE, contourScene, deformedScene, geometryScene, meshScene } from '../src/report/pictures.js';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expandTemplate } from '../src/model/templates.js';
import { runSweep } from '../src/sweep/run.js';
import { parseVary } from '../src/sweep/cases.js';
import { runMesh } from '../src/cli/mesh.js';
import { toModel, toPixel, type View } from '../src/render/field.js';
import { FieldProbe } from '../src/mesh/probe.js';
import { Raster } from '../src/render/raster.js';
import { PNG } from 'pngjs';
import { renderPng } from '../src/render/scene.js';
import { colourAt, DEFAULT_MAP } from '../src/render/colormap.js';
import type { Box, Scene } from '../src/render/scene.js';

function solve(file: string): PlotSource {
  const { model } = loadModelFile(file);
  const a = analyseModel({ ...model, mesh: { ...(model.mesh ?? {}) } });
  return plotSource(a, buildResult(a, file), '2024-05-06T07:08:09Z');
}

/**
 * Paints the scene's per-pixel layers alone on a transparent raster (k times the picture, as the
 * SVG back end embeds them) and counts the pixels left unpainted whose four neighbours are all
 * painted: a hole in the fill, which shows as an isolated white pixel.
 */
function layerHoles(s: Scene, k: number): number {
  const r = new Raster(s.width * k, s.height * k, null);
  for (const it of s.items) {
    if (it.kind !== 'layer') continue;
    r.setClip(it.clip ? [it.clip[0] * k, it.clip[1] * k, it.clip[2] * k, it.clip[3] * k] : null);
    it.paint(r, k);
  }
  let holes = 0;
  const a = (x: number, y: number) => r.data[4 * (y * r.width + x) + 3];
  for (let y = 1; y < r.height - 1; y++) {
    for (let x = 1; x < r.width - 1; x++) {
      if (a(x, y) === 0 && a(x - 1, y) && a(x + 1, y) && a(x, y - 1) && a(x, y + 1)) holes++;
    }
  }
  return holes;
}

describe('deformed shape: no white pixels inside the fill (link plate)', () => {
  const link = solve('examples/link-plate.json');
  it('leaves no unpainted pixel surrounded by painted ones, at 1 and 2 times the picture', () => {
    const s = deformedScene(link);
    expect(layerHoles(s, 1)).toBe(0);
    expect(layerHoles(s, 2)).toBe(0);
  });
});

const overlap = (a: Box, b: Box) => a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];

/** The boxes of labels, markers and the scale bar (not the frame's title, footer or legend). */
function annotationBoxes(s: Scene): { what: string; box: Box }[] {
  return s.info.boxes.filter((b) => !['title', 'subtitle', 'footer', 'caution', 'legend'].includes(b.what));
}

/** Pixels of the box whose centre lies in the material of the part (drawn with the scene's view). */
function partPixelsIn(src: PlotSource, view: View, b: Box): number {
  const probe = new FieldProbe(src.mesh);
  let n = 0;
  for (let y = Math.floor(b[1]); y < Math.ceil(b[3]); y++) {
    for (let x = Math.floor(b[0]); x < Math.ceil(b[2]); x++) {
      const [mx, my] = toModel(view, x + 0.5, y + 0.5);
      if (Number.isFinite(probe.value(src.stress, 3, 0, mx, my))) n++;
    }
  }
  return n;
}

describe('labels, markers and the scale bar (L-bracket)', () => {
  const bracket = solve('examples/bracket.json');
  const sizes: [number, number][] = [
    [1600, 1340],
    [1200, 1000],
    [900, 760],
  ];

  it('geometry picture: no label overlaps a marker, the scale bar or another label, at several sizes (bracket, link plate, link plate on pins)', () => {
    // before: the link plate's net-section labels overlapped at 600 and 800 px wide, and the
    // pinned link plate's point-support label "S2" sat on the pin load's label "L1 (pin)"
    const models = [bracket, solve('examples/link-plate.json'), solve('examples/link-plate-pins.json')];
    for (const src of models) {
      for (const [width, height] of [...sizes, [800, 600], [600, 400]] as [number, number][]) {
        const s = geometryScene(src, { width, height });
        const boxes = annotationBoxes(s);
        expect(boxes.some((b) => b.what === 'peak marker')).toBe(true);
        expect(boxes.some((b) => b.what.includes(': net '))).toBe(true);
        for (let i = 0; i < boxes.length; i++) {
          for (let j = i + 1; j < boxes.length; j++) {
            expect(overlap(boxes[i].box, boxes[j].box), `${src.result.model.title} ${width}x${height}: "${boxes[i].what}" and "${boxes[j].what}"`).toBe(false);
          }
        }
      }
    }
  });

  it('contour, mesh, deformed and geometry pictures: the scale bar covers no pixel of the part', () => {
    for (const [width, height] of [[1600, undefined], [1200, 800]] as [number, number | undefined][]) {
      for (const scene of [contourScene, meshScene, deformedScene, geometryScene]) {
        const s = scene(bracket, { width, height });
        const bar = s.info.boxes.find((b) => b.what === 'scale bar');
        expect(bar, `${s.title}: has a scale bar`).toBeDefined();
        expect(partPixelsIn(bracket, s.info.view as View, bar!.box), `${s.title} at ${width}`).toBe(0);
        for (const other of annotationBoxes(s)) if (other.what !== 'scale bar') expect(overlap(other.box, bar!.box), `${s.title}: scale bar and ${other.what}`).toBe(false);
      }
    }
  });
});

/** The texts of an SVG written by renderSvg (each text is a path with its words in aria-label). */
function svgTexts(svg: string): string[] {
  return [...svg.matchAll(/aria-label="([^"]*)"/g)].map((m) => m[1].replace(/&quot;/g, '"').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&'));
}

describe('sweep chart: titled by the family swept, with the footer', () => {
  it('a sweep of d/W from 0.1 to 0.5 is not titled by one case (d/W = 0.2), and carries model, date and caution', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-sweep-'));
    const file = join(dir, 'hole.json');
    writeFileSync(file, JSON.stringify(expandTemplate('plate-with-hole', { W: 100, d: 20 })));
    await runSweep(file, { vary: [parseVary('d=10:50:2')], outDir: join(dir, 'out'), jobs: 1, singleMesh: true });
    const texts = svgTexts(readFileSync(join(dir, 'out', 'sweep.svg'), 'utf8'));
    const title = texts[0];
    expect(title).toMatch(/^Kt against d\/W: /);
    expect(title).not.toContain('d/W = 0.2');
    expect(texts.join('\n')).toContain('d from 10 to 50');
    expect(texts.join('\n')).toContain('d/W 0.1 to 0.5');
    expect(texts.some((t) => t.includes(file) && /raiser \d+\.\d+\.\d+/.test(t) && /\d{4}-\d\d-\d\d/.test(t))).toBe(true);
    expect(texts).toContain(CAUTION_LINE);
  }, 60000);
});

describe('mesh preview (raiser mesh -o): footer and scale bar', () => {
  it('carries the model, date and caution line, and a scale bar below the part', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-mesh-'));
    runMesh('examples/bracket.json', { out: dir });
    const texts = svgTexts(readFileSync(join(dir, 'mesh-preview.svg'), 'utf8'));
    expect(texts.some((t) => t.includes('examples/bracket.json') && /raiser \d+\.\d+\.\d+/.test(t) && /\d{4}-\d\d-\d\d/.test(t))).toBe(true);
    expect(texts).toContain(CAUTION_LINE);
    expect(texts.some((t) => /^\d+(\.\d+)? mm$/.test(t))).toBe(true);
  });
});

describe('a quarter model is drawn as the whole part (plate with a central hole, d/W = 0.2)', () => {
  const model = expandTemplate('plate-with-hole', { W: 100, d: 20 });
  const a = analyseModel(model);
  const quarter = plotSource(a, buildResult(a, 'hole.json'), '2024-05-06T07:08:09Z');

  it('the result records the two mirror planes its symmetry supports hold', () => {
    const planes = (quarter.result.mirrorPlanes ?? []).map((p) => [p.axis, p.at]);
    expect(planes.sort()).toEqual([['x', 0], ['y', 0]]);
  });

  for (const measure of ['max-principal', 'sxy'] as const) {
    it(`contour of ${measure}: four hole quadrants, colours mirror-symmetric (sxy mirrored with its sign changed)`, () => {
      const s = contourScene(quarter, { width: 1200, height: 600, iso: false, measure });
      const png = PNG.sync.read(renderPng(s).toPng());
      const info = s.info as unknown as { view: View; draw: Box; range: [number, number] };
      const at = (x: number, y: number): [number, number, number] => {
        const o = 4 * (Math.round(y) * png.width + Math.round(x));
        return [png.data[o], png.data[o + 1], png.data[o + 2]];
      };
      const white = (c: number[]) => c[0] > 250 && c[1] > 250 && c[2] > 250;
      const [cx, cy] = toPixel(info.view, 0, 0);
      const r = 10 * info.view.s;
      // inside the hole (half its radius from the centre) background, and material beyond it, in each quadrant
      for (const [sx, sy] of [[1, 1], [-1, 1], [1, -1], [-1, -1]]) {
        expect(white(at(cx + sx * 0.35 * r, cy + sy * 0.35 * r))).toBe(true);
        expect(white(at(cx + sx * 1.6 * r, cy + sy * 1.6 * r)), `material in quadrant ${sx}, ${sy}`).toBe(false);
      }
      // mirror symmetry of the colours about both planes, away from the labels and the plane lines
      const keepOut = s.info.boxes.filter((b) => !['title', 'subtitle', 'footer', 'caution', 'legend'].includes(b.what)).map((b) => b.box);
      const free = (x: number, y: number) => !keepOut.some((b) => x >= b[0] - 2 && x <= b[2] + 2 && y >= b[1] - 2 && y <= b[3] + 2) && Math.abs(x - cx) > 3 && Math.abs(y - cy) > 3;
      const colourOf = (v: number) => colourAt(DEFAULT_MAP, (v - info.range[0]) / (info.range[1] - info.range[0]));
      let compared = 0;
      let differing = 0;
      const diffs: number[] = [];
      for (let y = Math.ceil(info.draw[1]) + 2; y < cy; y += 3) {
        for (let x = Math.ceil(info.draw[0]) + 2; x < cx; x += 3) {
          // the pixel whose centre is the mirror image of this one's centre
          const mx = Math.floor(2 * cx - (x + 0.5));
          const my = Math.floor(2 * cy - (y + 0.5));
          if (mx >= info.draw[2] || my >= info.draw[3] || !free(x, y) || !free(mx, y) || !free(x, my) || !free(mx, my)) continue;
          const p = at(x, y);
          if (white(p)) continue;
          for (const q of [at(mx, y), at(x, my), at(mx, my)]) {
            const d = Math.max(...[0, 1, 2].map((k) => Math.abs(p[k] - q[k])));
            diffs.push(d);
            if (d > 24) differing++;
          }
          compared++;
        }
      }
      expect(compared).toBeGreaterThan(2000);
      diffs.sort((p, q) => p - q);
      if (measure === 'sxy') {
        // sxy is odd under reflection: the colour at a mirrored point is the colour of -sxy there
        const probe = new FieldProbe(quarter.mesh);
        let best = 1.3;
        let bv = 0;
        for (let f = 1.3; f <= 2.5; f += 0.1) {
          const [x, y] = toModel(info.view, cx + f * r, cy - f * r);
          const v = probe.value(quarter.stress, 3, 2, x, y);
          if (Math.abs(v) > Math.abs(bv)) [best, bv] = [f, v];
        }
        const v = bv;
        expect(Math.abs(v)).toBeGreaterThan(0.05 * (info.range[1] - info.range[0]));
        for (const [sx, sy, sign] of [[1, -1, 1], [-1, -1, -1], [1, 1, -1], [-1, 1, 1]]) {
          const c = at(cx + sx * best * r, cy + sy * best * r);
          const want = colourOf(sign * v);
          expect(Math.max(...[0, 1, 2].map((k) => Math.abs(c[k] - want[k]))), `quadrant ${sx}, ${sy}`).toBeLessThanOrEqual(6);
        }
      }
      else {
        // an invariant measure: the picture is its own mirror image but for antialiased edges
        expect(diffs[Math.floor(diffs.length / 2)]).toBeLessThanOrEqual(2);
        expect(differing / diffs.length).toBeLessThan(0.005);
      }
      // the cut planes are marked and named
      expect(s.info.boxes.filter((b) => b.what.startsWith('symmetry plane')).length).toBe(2);
    });
  }

  it('mesh, deformed and geometry pictures show the whole part too', () => {
    for (const scene of [meshScene, deformedScene, geometryScene]) {
      const s = scene(quarter, { width: 1200, height: 600 });
      const view = s.info.view as View;
      const [x0] = toPixel(view, -200, 0);
      const [x1] = toPixel(view, 200, 0);
      expect(x1 - x0, s.title).toBeLessThan(1200);
      expect(x0, `${s.title}: the part reaches x = -L/2`).toBeGreaterThan(0);
      expect(s.info.boxes.filter((b) => b.what.startsWith('symmetry plane')).length, s.title).toBe(2);
    }
  });
});
