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
import { toModel, type View } from '../src/render/field.js';
import { FieldProbe } from '../src/mesh/probe.js';
import { Raster } from '../src/render/raster.js';
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

  it('geometry picture: no label overlaps a marker or another label, at several sizes', () => {
    for (const [width, height] of sizes) {
      const s = geometryScene(bracket, { width, height });
      const boxes = annotationBoxes(s);
      expect(boxes.some((b) => b.what === 'peak marker')).toBe(true);
      expect(boxes.some((b) => b.what.includes(': net '))).toBe(true);
      for (let i = 0; i < boxes.length; i++) {
        for (let j = i + 1; j < boxes.length; j++) {
          expect(overlap(boxes[i].box, boxes[j].box), `${width}x${height}: "${boxes[i].what}" and "${boxes[j].what}"`).toBe(false);
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
