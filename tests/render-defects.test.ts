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
import { deformedScene } from '../src/report/pictures.js';
import { Raster } from '../src/render/raster.js';
import type { Scene } from '../src/render/scene.js';

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
