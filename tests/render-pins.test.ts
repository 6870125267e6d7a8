/**
 * Pins on the geometry picture, checked on decoded pixels: a link plate (the link template, an
 * invented part) held by a fixed pin in hole A and pulled along +x by a pin in hole B, both with
 * clearance. Each pin is a disc in its hole, the contact arcs are marked on the side each hole
 * presses on its pin (the left of A, the right of B) and nowhere else; a bearing load on a lug is
 * drawn as pressure, arrows only on the half of the hole facing its force.
 */
import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { plotSource } from '../src/report/saved.js';
import { geometryScene } from '../src/report/pictures.js';
import { renderPng } from '../src/render/scene.js';
import { toPixel, type View } from '../src/render/field.js';
import { LOAD_COLOUR } from '../src/render/boundary-conditions.js';
import { CONTACT_COLOUR } from '../src/render/pins.js';
import { link, lug } from '../src/model/templates.js';
import type { Model } from '../src/model/schema.js';

function picture(model: Model) {
  const a = analyseModel(model);
  const scene = geometryScene(plotSource(a, buildResult(a, 'pins.json'), '2024-01-02T03:04:05Z'), { width: 1200 });
  const png = PNG.sync.read(renderPng(scene).toPng());
  const view = scene.info.view as View;
  const count = (c: readonly number[], xa: number, xb: number, ya: number, yb: number) => {
    let n = 0;
    for (let y = Math.max(0, Math.floor(ya)); y < Math.min(png.height, Math.ceil(yb)); y++) {
      for (let x = Math.max(0, Math.floor(xa)); x < Math.min(png.width, Math.ceil(xb)); x++) {
        const o = 4 * (y * png.width + x);
        if (Math.abs(png.data[o] - c[0]) + Math.abs(png.data[o + 1] - c[1]) + Math.abs(png.data[o + 2] - c[2]) < 40) n++;
      }
    }
    return n;
  };
  return { scene, png, view, count };
}

describe('geometry picture: pins', () => {
  it('draws both pins and marks each contact arc on the side the hole presses on', () => {
    const W = 40;
    const d = 20;
    const p = 120;
    const { scene, png, view, count } = picture(link({ W, d, p, clearance: 0.4 }));
    expect(scene.info.boundaryConditions).toEqual({ loads: 1, supports: 2 });
    const [ax, ay] = toPixel(view, 0, 0);
    const [bx] = toPixel(view, p, 0);
    const r = view.s * (d / 2);
    // the arcs: left of hole A's centre and right of hole B's, within a ring about the hole
    expect(count(CONTACT_COLOUR, ax - r - 6, ax - 0.7 * r, ay - r, ay + r)).toBeGreaterThan(20);
    expect(count(CONTACT_COLOUR, bx + 0.7 * r, bx + r + 6, ay - r, ay + r)).toBeGreaterThan(20);
    // and not on the other sides
    expect(count(CONTACT_COLOUR, ax - 0.5 * r, ax + r + 6, 0, png.height)).toBe(0);
    expect(count(CONTACT_COLOUR, bx - r - 6, bx + 0.5 * r, 0, png.height)).toBe(0);
  });

  it('draws a bearing load as pressure on the half of the hole facing the force', () => {
    const d = 20;
    const { view, count } = picture(lug({ W: 40, d, load: 'bearing' }));
    const [cx, cy] = toPixel(view, 0, 0);
    const r = view.s * (d / 2);
    expect(count(LOAD_COLOUR, cx + 2, cx + r + 2, cy - r - 2, cy + r + 2)).toBeGreaterThan(50);
    expect(count(LOAD_COLOUR, cx - r - 2, cx - 2, cy - r - 2, cy + r + 2)).toBe(0);
  });
});
