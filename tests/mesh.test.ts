/**
 * Mesh properties, checked on every kind of boundary the model format offers:
 *  - the mesh checker passes (it runs inside generateMesh: det J > 0, element areas summing to
 *    the area the boundary encloses, every boundary segment present, every node used);
 *  - the smallest angle is at least the 25 degree target, except in triangles forced by an input
 *    corner sharper than 60 degrees (the exemption of J. R. Shewchuk, "Delaunay refinement
 *    algorithms for triangular mesh generation", Comput. Geom. 22, 2002, sec. 5);
 *  - boundary nodes lie on the true curves (round-off), so the meshed area of a quadratic mesh
 *    converges to the exact area at the rate of the isoparametric boundary;
 *  - the size field is honoured at a raiser;
 *  - the checker rejects a broken mesh rather than passing it.
 */
import { describe, expect, it } from 'vitest';
import { buildDomain } from '../src/geometry/domain.js';
import { curvatureRadius, evaluateCurve } from '../src/geometry/curve.js';
import { checkMesh } from '../src/mesh/check.js';
import { generateMesh, hilbertIndex } from '../src/mesh/generate.js';
import { buildSizeField } from '../src/mesh/sizefield.js';
import type { Geometry } from '../src/model/schema.js';
import { BRACKET } from './support/shapes.js';

const SHAPES: Record<string, Geometry> = {
  'plate with a circular hole': {
    outline: { shape: 'path', path: [[0, 0], [100, 0], [100, 40], [0, 40]] },
    holes: [{ shape: 'circle', center: [50, 20], radius: 5 }],
  },
  'bracket with fillets, slot, ellipse and rounded rectangle': BRACKET,
  'outline with arcs given by centre, radius and a through point': {
    outline: {
      shape: 'path',
      path: [
        { at: [0, 0], arc: { through: [25, -6] } },
        { at: [50, 0] },
        { at: [50, 30], arc: { radius: 30, turn: 'ccw' } },
        { at: [0, 30], arc: { center: [0, 15], turn: 'ccw' } },
      ],
    },
  },
  'strip with a sharp V notch (re-entrant corner)': {
    outline: { shape: 'path', path: [[0, 0], [40, 0], [40, 20], [21, 20], [20, 12], [19, 20], [0, 20]] },
  },
  'wedge with a 10 degree tip': {
    outline: { shape: 'path', path: [[0, 0], [50, 0], [50 * Math.cos(Math.PI / 18), 50 * Math.sin(Math.PI / 18)]] },
  },
};

describe('generateMesh', () => {
  for (const [name, geometry] of Object.entries(SHAPES)) {
    for (const order of [1, 2] as const) {
      it(`${name}, ${order === 2 ? 'quadratic' : 'linear'}: quality, area and boundary placement`, () => {
        const domain = buildDomain(geometry);
        const { mesh, stats } = generateMesh(domain, { order });
        expect(stats.minAngleUnforcedDeg).toBeGreaterThan(25 - 1e-6);
        expect(stats.refine.rejected).toBe(0);
        // Every boundary node lies on its curve.
        const p = [0, 0];
        for (let s = 0; s < mesh.nBEdges; s++) {
          const e = domain.edges[mesh.bEdgeDomain[s]];
          for (const [k, t] of [[0, mesh.bEdgeT[2 * s]], [1, mesh.bEdgeT[2 * s + 1]], [2, 0.5 * (mesh.bEdgeT[2 * s] + mesh.bEdgeT[2 * s + 1])]] as const) {
            const node = mesh.bEdges[3 * s + k];
            if (node < 0) continue;
            evaluateCurve(e.curve, t, p);
            expect(Math.hypot(mesh.nodes[2 * node] - p[0], mesh.nodes[2 * node + 1] - p[1])).toBeLessThan(1e-12 * domain.scale);
          }
        }
        const q = checkMesh(mesh, domain);
        // Meshed area against the exact area: chords lose O(h^2) (linear), parabolas O(h^4).
        const rel = Math.abs(q.area - domain.area) / domain.area;
        expect(rel).toBeLessThan(order === 2 ? 2e-5 : 5e-3);
      });
    }
  }

  it('halving the size field shrinks the quadratic area error by about 2^4 on a curved boundary', () => {
    const domain = buildDomain(SHAPES['plate with a circular hole']);
    const err = (k: number) => {
      const { mesh } = generateMesh(domain, { order: 2, raiserSize: 2 * k, size: 8 * k });
      return Math.abs(checkMesh(mesh, domain).area - domain.area);
    };
    const rate = Math.log2(err(1) / err(0.5));
    expect(rate).toBeGreaterThan(3.3);
  });

  it('edges on a hole follow the raiser size (2 pi r / 48 for quadratic elements)', () => {
    const domain = buildDomain(SHAPES['plate with a circular hole']);
    const { mesh } = generateMesh(domain, { order: 2 });
    const hole = domain.loops[1].edges[0];
    let sum = 0;
    let n = 0;
    for (let s = 0; s < mesh.nBEdges; s++) {
      if (mesh.bEdgeDomain[s] !== hole) continue;
      const a = mesh.bEdges[3 * s];
      const b = mesh.bEdges[3 * s + 1];
      sum += Math.hypot(mesh.nodes[2 * b] - mesh.nodes[2 * a], mesh.nodes[2 * b + 1] - mesh.nodes[2 * a + 1]);
      n++;
    }
    const target = (2 * Math.PI * curvatureRadius(domain.edges[hole].curve, 0)) / 48;
    expect(sum / n).toBeGreaterThan(0.8 * target);
    expect(sum / n).toBeLessThan(1.2 * target);
  });

  it('the size field grid gives exactly the minimum over all sources', () => {
    const domain = buildDomain(SHAPES['bracket with fillets, slot, ellipse and rounded rectangle']);
    const size = buildSizeField(domain, { order: 2 });
    expect(size.count).toBeGreaterThan(8);
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    for (let k = 0; k < 5000; k++) {
      const x = -10 + 140 * rnd();
      const y = -10 + 100 * rnd();
      expect(size.at(x, y)).toBe(size.atExhaustive(x, y));
    }
  });

  it('the size field a mesh returns (grid deferred to its 2000th query) gives exactly the minimum over all sources before and after its grid', () => {
    // The field in model coordinates is asked about a few ligaments only, so it answers its
    // first 2000 queries by every source and builds its grid after: both must be the minimum.
    const domain = buildDomain(SHAPES['bracket with fillets, slot, ellipse and rounded rectangle']);
    const { size } = generateMesh(domain, { order: 2, sizeFactor: 2 });
    expect(size.count).toBeGreaterThan(8);
    let seed = 11;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    for (let k = 0; k < 5000; k++) {
      const x = -10 + 140 * rnd();
      const y = -10 + 100 * rnd();
      expect(size.at(x, y)).toBe(size.atExhaustive(x, y));
    }
  });

  it('the mesh checker rejects a flipped element and a missing element', () => {
    const domain = buildDomain(SHAPES['plate with a circular hole']);
    const { mesh } = generateMesh(domain, { order: 1 });
    const flipped = { ...mesh, elements: Int32Array.from(mesh.elements) };
    [flipped.elements[0], flipped.elements[1]] = [flipped.elements[1], flipped.elements[0]];
    expect(() => checkMesh(flipped, domain)).toThrow(/counter-clockwise/);
    const missing = { ...mesh, nElements: mesh.nElements - 1 };
    expect(() => checkMesh(missing, domain)).toThrow(/mesh check/);
  });
});

describe('Hilbert order of the finished mesh', () => {
  // The curve visits every cell of an n x n grid once, each step to an edge neighbour
  // (D. Hilbert, "Ueber die stetige Abbildung einer Linie auf ein Flaechenstueck", Math. Ann. 38, 1891).
  it('hilbertIndex is a bijection on a 16 x 16 grid whose consecutive cells are edge neighbours', () => {
    const n = 16;
    const at: [number, number][] = [];
    for (let x = 0; x < n; x++) for (let y = 0; y < n; y++) at[hilbertIndex(n, x, y)] = [x, y];
    expect(at.filter(Boolean).length).toBe(n * n);
    for (let d = 1; d < n * n; d++) expect(Math.abs(at[d][0] - at[d - 1][0]) + Math.abs(at[d][1] - at[d - 1][1])).toBe(1);
  });

  it('numbers nodes so that an element spans a small range of node numbers', () => {
    const { mesh } = generateMesh(buildDomain(SHAPES['plate with a circular hole']), { order: 1, size: 1.5 });
    const spans: number[] = [];
    for (let e = 0; e < mesh.nElements; e++) {
      const a = mesh.elements[3 * e], b = mesh.elements[3 * e + 1], c = mesh.elements[3 * e + 2];
      spans.push(Math.max(a, b, c) - Math.min(a, b, c));
    }
    spans.sort((p, q) => p - q);
    // a random numbering would give a median span of about half the node count
    expect(spans[spans.length >> 1]).toBeLessThan(0.02 * mesh.nNodes);
  });
});

describe('hole shapes as drawn', () => {
  // Areas and extents by plane geometry: a slot of overall length L and width w is a w x (L - w)
  // rectangle with two half discs of diameter w; a rounded rectangle W x H with corner radius r
  // loses (4 - pi) r^2 to its corners.
  const plate = (hole: object) =>
    buildDomain({ outline: { shape: 'path', path: [[0, 0], [100, 0], [100, 60], [0, 60]] }, holes: [hole] } as unknown as Geometry);
  const bbox = (d: ReturnType<typeof buildDomain>, loop: number) => {
    const xs: number[] = [];
    const ys: number[] = [];
    const p = [0, 0];
    for (const id of d.loops[loop].edges) for (let k = 0; k <= 16; k++) {
      evaluateCurve(d.edges[id].curve, k / 16, p);
      xs.push(p[0]);
      ys.push(p[1]);
    }
    return [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  };

  for (const [L, w] of [
    [30, 8],
    [6, 5.7],
  ]) {
    it(`a slot ${L} long and ${w} wide has area (L - w) w + pi w^2 / 4 and extents L by w`, () => {
      const d = plate({ shape: 'slot', center: [50, 30], length: L, width: w });
      expect(Math.abs(Math.abs(d.loops[1].signedArea) / ((L - w) * w + (Math.PI * w * w) / 4) - 1)).toBeLessThan(1e-9);
      const [x0, x1, y0, y1] = bbox(d, 1);
      expect(x1 - x0).toBeCloseTo(L, 9);
      expect(y1 - y0).toBeCloseTo(w, 9);
    });
  }

  it('a rounded rectangle 20 x 12 with corners of radius 2 has area W H - (4 - pi) r^2', () => {
    const d = plate({ shape: 'rounded-rect', center: [50, 30], width: 20, height: 12, radius: 2 });
    expect(Math.abs(Math.abs(d.loops[1].signedArea) / (240 - (4 - Math.PI) * 4) - 1)).toBeLessThan(1e-9);
    const [x0, x1, y0, y1] = bbox(d, 1);
    expect(x1 - x0).toBeCloseTo(20, 9);
    expect(y1 - y0).toBeCloseTo(12, 9);
  });
});
