/**
 * Regression: load arrows are drawn exactly on the edges the finite element stage loaded.
 *
 * The geometry picture once chose a remote load's default edges again from the model (every
 * outline edge without a support), while the load compilation (src/fem/boundary-conditions.ts,
 * outerEdges) applies it only to the outline's straight edges on the bounding box: arrows were
 * drawn on the shoulders and fillets of a stepped plate that carried no load. The picture now
 * draws from result.json's boundaryConditions, which the finite element stage fills.
 *
 * The part is an invented stepped plate, 50 wide stepping to 32 through 4 mm fillets, under a
 * remote tension sxx with no `on` (so its edges are the default ones). A remote stress puts the
 * traction sigma . n on an edge (Cauchy's formula); on the shoulders and fillets n has an x part,
 * so re-deriving the edges from "the unsupported outline" would put arrows there.
 */
import { describe, expect, it } from 'vitest';
import { parseModelText } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { decodeSaved, encodeSaved, plotSource } from '../src/report/saved.js';
import { geometryScene } from '../src/report/pictures.js';
import { toPixel, type View } from '../src/render/field.js';
import { LOAD_COLOUR } from '../src/render/boundary-conditions.js';
import type { Mesh } from '../src/mesh/types.js';
import type { Scene } from '../src/render/scene.js';

const MODEL = {
  title: 'Invented stepped plate under remote tension (test scenario)',
  material: { E: 210000, nu: 0.3 },
  thickness: 5,
  geometry: {
    outline: {
      shape: 'path',
      path: [
        { at: [0, 0] },
        { at: [110, 0] },
        { at: [110, 9], round: 4 },
        { at: [220, 9] },
        { at: [220, 41] },
        { at: [110, 41], round: 4 },
        { at: [110, 50] },
        { at: [0, 50] },
      ],
    },
  },
  supports: [{ type: 'pin', at: [0, 25] }, { type: 'pin', at: [220, 25], fix: 'y' }],
  loads: [{ type: 'remote', sxx: 80 }],
  mesh: { size: 6 },
};

/** The pixel points of the boundary edges on the given domain edges, where the picture anchors its marks (mid-node or midpoint). */
function anchorsOn(mesh: Mesh, edges: ReadonlySet<number>, view: View): [number, number][] {
  const out: [number, number][] = [];
  for (let k = 0; k < mesh.nBEdges; k++) {
    if (!edges.has(mesh.bEdgeDomain[k])) continue;
    const [a, b, m] = [mesh.bEdges[3 * k], mesh.bEdges[3 * k + 1], mesh.bEdges[3 * k + 2]];
    const x = m >= 0 ? mesh.nodes[2 * m] : 0.5 * (mesh.nodes[2 * a] + mesh.nodes[2 * b]);
    const y = m >= 0 ? mesh.nodes[2 * m + 1] : 0.5 * (mesh.nodes[2 * a + 1] + mesh.nodes[2 * b + 1]);
    out.push(toPixel(view, x, y) as [number, number]);
  }
  return out;
}

/** The start points of the load arrows' shafts (a pulling load's arrows start on the edge). */
function arrowStarts(scene: Scene): [number, number][] {
  const same = (c: readonly number[]) => c[0] === LOAD_COLOUR[0] && c[1] === LOAD_COLOUR[1] && c[2] === LOAD_COLOUR[2];
  return scene.items.flatMap((it) => (it.kind === 'stroke' && same(it.colour) ? it.lines.map((l) => [l[0], l[1]] as [number, number]) : []));
}

describe('load arrows on the edges the finite element stage loaded (remote load, default edges)', () => {
  const model = parseModelText(JSON.stringify(MODEL), 'stepped-plate.json');
  const a = analyseModel(model);
  const result = buildResult(a, 'stepped-plate.json');
  const loaded = new Set(a.load.items[0].edges);
  const draw = (src = plotSource(a, result, '2026-01-02T03:04:05Z')) => geometryScene(src, { width: 1200 });

  it('the part is one where the two choices differ: outline edges outside the loaded set would carry sigma . n', () => {
    // the unsupported outline (the old picture's choice) holds curved or inner edges the load compilation left unloaded
    const outline = a.domain.loops[0].edges;
    const unloadedButTractioned = outline.filter((e) => {
      if (loaded.has(e)) return false;
      const c = a.domain.edges[e].curve;
      return c.kind !== 'line' || Math.abs(c.y1 - c.y0) > 1e-9; // an arc, or a straight edge with an x-normal part
    });
    expect(unloadedButTractioned.length).toBeGreaterThanOrEqual(4); // two shoulders and two fillets
    expect(result.boundaryConditions.loads).toEqual([{ index: 0, type: 'remote', edges: a.load.items[0].edges }]);
  });

  it('every arrow starts on a boundary edge of a loaded domain edge, and both loaded ends get arrows', () => {
    const scene = draw();
    const view = scene.info.view as View;
    const starts = arrowStarts(scene);
    expect(starts.length).toBeGreaterThan(4);
    const anchors = anchorsOn(a.mesh, loaded, view);
    const onLoaded = (p: [number, number]) => anchors.some((q) => Math.abs(q[0] - p[0]) < 1e-9 && Math.abs(q[1] - p[1]) < 1e-9);
    const stray = starts.filter((p) => !onLoaded(p));
    expect(stray).toEqual([]);
    // arrows at both ends of the plate (x = 0 and x = 220), none between
    const [left] = toPixel(view, 0, 0);
    const [right] = toPixel(view, 220, 0);
    expect(starts.some((p) => Math.abs(p[0] - left) < 1e-6)).toBe(true);
    expect(starts.some((p) => Math.abs(p[0] - right) < 1e-6)).toBe(true);
    expect(starts.filter((p) => p[0] > left + 1 && p[0] < right - 1)).toEqual([]);
  });

  it('a saved solution carries the loaded edges, and its picture is drawn from them', () => {
    const src = plotSource(a, result, '2026-01-02T03:04:05Z');
    const back = decodeSaved(encodeSaved(src));
    expect(back.result.boundaryConditions).toEqual(result.boundaryConditions);
    expect(arrowStarts(draw(back))).toEqual(arrowStarts(draw(src)));
  });

  it('a saved solution without the record draws no loads or supports and says why', () => {
    const { boundaryConditions: _gone, ...older } = result;
    const scene = draw({ ...plotSource(a, result, '2026-01-02T03:04:05Z'), result: older as typeof result });
    expect(scene.info.boundaryConditions).toEqual({ loads: 0, supports: 0 });
    expect(arrowStarts(scene)).toEqual([]);
    expect(scene.items.some((it) => it.kind === 'text' && it.text.includes('does not record where they act'))).toBe(true);
  });
});
