/**
 * Geometry from drawings: the invented test drawings in meshes/ import to the loops, hole
 * counts and areas they were drawn with. The expected areas are closed forms worked out from
 * the drawing by hand (each named beside it), so the tolerance is round-off (1e-9 relative),
 * except where said.
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { buildDomain, type Domain } from '../src/geometry/domain.js';
import { validateDomain } from '../src/geometry/validate.js';
import { evaluateCurve, curveAreaTerm, curveLength, curvatureRadius, curveConcavity, reverseCurve, subCurve, type Curve } from '../src/geometry/curve.js';
import { nearestBoundaryPoint } from '../src/geometry/project.js';
import { generateMesh } from '../src/mesh/generate.js';
import { loadModelAndDrawing } from '../src/pipeline/load.js';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { conicArc, mapCurve } from '../src/geometry/import/affine.js';

const MESHES = join(import.meta.dirname, '..', 'meshes');
const PI = Math.PI;

/** A model around a drawing (supports and loads only so that it is a complete model). */
function modelFor(geometry: Record<string, unknown>, extra: Record<string, unknown> = {}) {
  const m = {
    material: { E: 210000, nu: 0.3 },
    thickness: 5,
    geometry,
    supports: [{ type: 'fixed', on: { outline: true } }],
    loads: [{ type: 'pressure', on: { outline: true }, p: 1 }],
    ...extra,
  };
  return loadModelAndDrawing(JSON.stringify(m), join(MESHES, 'test-model.json'));
}

function domainOf(geometry: Record<string, unknown>, extra: Record<string, unknown> = {}): Domain {
  const { model, drawing } = modelFor(geometry, extra);
  const d = buildDomain(model.geometry, drawing);
  validateDomain(d);
  return d;
}

const area = (d: Domain, loop: number) => Math.abs(d.loops[loop].signedArea);
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('the Bezier curve kind', () => {
  // A rational quadratic with weights 1, sqrt(1/2), 1 is exactly a quarter of the unit circle
  // (Farin, Curves and Surfaces for CAGD, section 13.3 [M]); its length, area and radius are known.
  const quarter: Curve = { kind: 'bezier', p: [1, 0, 1, 1, 0, 1], w: [1, Math.SQRT1_2, 1] };
  it('evaluates a rational quadratic quarter circle on the circle, with radius of curvature 1', () => {
    const p = [0, 0];
    for (let k = 0; k <= 20; k++) {
      evaluateCurve(quarter, k / 20, p);
      expect(Math.hypot(p[0], p[1])).toBeCloseTo(1, 14);
      expect(curvatureRadius(quarter, k / 20)).toBeCloseTo(1, 11);
    }
  });
  it('gives the quarter circle length pi/2 and swept area pi/4, and the reversed curve the opposite area', () => {
    expect(curveLength(quarter)).toBeCloseTo(PI / 2, 13);
    expect(curveAreaTerm(quarter)).toBeCloseTo(PI / 4, 13);
    expect(curveAreaTerm(reverseCurve(quarter))).toBeCloseTo(-PI / 4, 13);
    expect(curveConcavity(quarter)).toBe(-1); // counter-clockwise about its centre: convex, as a ccw arc
  });
  it('splits exactly: a piece between t = 0.2 and 0.7 starts and ends on the curve', () => {
    const s = subCurve(quarter, 0.2, 0.7);
    const a = [0, 0];
    const b = [0, 0];
    for (const [ts, t] of [[0, 0.2], [1, 0.7], [0.5, 0.45]] as const) {
      evaluateCurve(s, ts, a);
      if (ts === 0.5) expect(Math.hypot(a[0], a[1])).toBeCloseTo(1, 14);
      else {
        evaluateCurve(quarter, t, b);
        expect(Math.hypot(a[0] - b[0], a[1] - b[1])).toBeLessThan(1e-14);
      }
    }
  });
  it('integrates the area of a cubic exactly: 0.6 w h for control points (0,0), (0,h), (w,h), (w,0)', () => {
    // x = w (3t^2 - 2t^3), y = 3 h t (1 - t): integral of y dx = 18 h w / 30 (by hand).
    const c: Curve = { kind: 'bezier', p: [0, 0, 0, 3, 7, 3, 7, 0] };
    expect(-curveAreaTerm(c)).toBeCloseTo(0.6 * 7 * 3, 12);
  });
});

describe('affine maps of arcs', () => {
  it('a circle under a scale (2, 1) becomes an ellipse with semi-axes 2r and r', () => {
    const c = mapCurve({ kind: 'arc', cx: 1, cy: 2, r: 3, a0: 0, sweep: 2 * PI }, [2, 0, 0, 1, 0, 0])!;
    expect(c.kind).toBe('ellipse');
    expect(curveAreaTerm(c)).toBeCloseTo(PI * 6 * 3, 10);
  });
  it('an arc under a skew keeps every point: the mapped curve passes through the mapped points', () => {
    const arc: Curve = { kind: 'arc', cx: 0.3, cy: -0.2, r: 2, a0: 0.4, sweep: -2.1 };
    const A = [1, 0.1, Math.tan(0.3), 0.9, 5, -1] as const;
    const m = mapCurve(arc, A)!;
    const p = [0, 0];
    const q = [0, 0];
    for (let k = 0; k <= 10; k++) {
      evaluateCurve(arc, k / 10, p);
      evaluateCurve(m, k / 10, q);
      expect(Math.hypot(A[0] * p[0] + A[2] * p[1] + A[4] - q[0], A[1] * p[0] + A[3] * p[1] + A[5] - q[1])).toBeLessThan(1e-12);
    }
  });
  it('a mirror turns a counter-clockwise arc clockwise and keeps it circular', () => {
    const m = mapCurve({ kind: 'arc', cx: 0, cy: 0, r: 1, a0: 0, sweep: 1 }, [-1, 0, 0, 1, 0, 0])!;
    expect(m.kind).toBe('arc');
    expect(m.kind === 'arc' && m.sweep).toBeCloseTo(-1, 14);
    expect(conicArc(0, 0, 1, 0, 2, 0, 0, 1)).toBeNull(); // u parallel to v: no arc
  });
});

describe('meshes/import-shapes.svg', () => {
  // Outline 120 x 60 with two corners rounded by r = 10 arcs (each cuts (1 - pi/4) 100), two cut
  // by quadratic curves with their control point at the corner (each cuts 1/3 of the 10 x 10
  // corner triangle, 50 / 3), a cubic notch of 0.6 x 20 x 10 = 120 and a cubic bump of the same area.
  const outline = 7200 - 2 * (100 - 25 * PI) - 2 * (50 / 3);
  const holes: Record<string, number> = {
    window: 20 * 12 - (4 - PI) * 9, // rect with rx = ry = 3
    'oval-window': 16 * 10 - (4 - PI) * 4 * 2, // rect with rx 4, ry 2: elliptical corners
    stretched: PI * 6 * 3, // circle r 3 under scale(2 1)
    tilted: PI * 5 * 2.5, // ellipse under rotate(30)
    wedge: 0.5 * 10 * 8, // triangle under skewX(10): a shear keeps the area
    peg: PI * 4, // <use> of a circle r 2
    square: 10 * 8, // polyline closed by matching its ends, under matrix()
    lens: 2 * (2 / 3) * 100, // Q and T: two parabolic segments, each 2/3 of its 100 mm^2 triangle
  };
  const d = domainOf({ from: 'import-shapes.svg', ignore: ['construction'] });
  it('imports the outline and its eight holes with their areas', () => {
    expect(d.loops.length).toBe(9);
    expect(rel(area(d, 0), outline)).toBeLessThan(1e-9);
    const byName = new Map(d.loops.slice(1).map((l) => [l.name, Math.abs(l.signedArea)]));
    expect([...byName.keys()].sort()).toEqual(Object.keys(holes).sort());
    for (const [name, a] of Object.entries(holes)) expect(rel(byName.get(name)!, a), name).toBeLessThan(1e-9);
    expect(rel(d.area, outline - Object.values(holes).reduce((s, a) => s + a, 0))).toBeLessThan(1e-9);
  });
  it('keeps curves as curves: arcs, ellipses and quadratic and cubic Bezier curves in the outline', () => {
    const kinds = d.loops[0].edges.map((id) => d.edges[id].curve);
    expect(kinds.filter((c) => c.kind === 'arc').length).toBe(2);
    expect(kinds.filter((c) => c.kind === 'bezier' && c.p.length === 6).length).toBe(2);
    expect(kinds.filter((c) => c.kind === 'bezier' && c.p.length === 8).length).toBe(2);
    const hole = (name: string) => d.loops.find((l) => l.name === name)!;
    expect(d.edges[hole('stretched').edges[0]].curve.kind).toBe('ellipse');
    expect(hole('oval-window').edges.map((id) => d.edges[id].curve.kind).filter((k) => k === 'ellipse').length).toBe(4);
  });
  it('flips y with the origin at the bottom-left of the viewBox, and turns rotate(30) clockwise on the page into -30 degrees', () => {
    const tilted = d.edges[d.loops.find((l) => l.name === 'tilted')!.edges[0]].curve;
    expect(tilted.kind).toBe('ellipse');
    if (tilted.kind !== 'ellipse') return;
    expect(tilted.cx).toBeCloseTo(55, 12);
    expect(tilted.cy).toBeCloseTo(60 - 30, 12);
    // The major axis points along +-(cos -30deg, sin -30deg).
    expect(Math.abs(Math.sin(tilted.rot + PI / 6))).toBeLessThan(1e-12);
    expect(tilted.a).toBeCloseTo(5, 12);
    const peg = d.edges[d.loops.find((l) => l.name === 'peg')!.edges[0]].curve;
    expect(peg.kind === 'arc' && [peg.cx, peg.cy, peg.r]).toEqual([45, 48, 2]);
  });
  it('tags each edge with the ids and classes of its element and its groups, and the layer label', () => {
    const edge = d.edges[d.loops[0].edges[0]];
    expect(edge.tags).toEqual(expect.arrayContaining(['profile', 'edge', 'layer1', 'Part']));
  });
  it('takes the outline named by "outline" and leaves the larger frame outside it out', () => {
    const named = domainOf({ from: 'import-shapes.svg', outline: 'profile' });
    expect(named.loops.length).toBe(9);
    expect(rel(area(named, 0), outline)).toBeLessThan(1e-9);
  });
  it('without "ignore" or "outline", says the frame became the outline and the profile a hole', () => {
    expect(() => domainOf({ from: 'import-shapes.svg' })).toThrow(/lies inside .*profile.*which lies inside the outline \(the loop of <rect> \(line \d+\), the largest closed loop\)/);
  });
  it('meshes with boundary and midside nodes on the true Bezier curves', () => {
    const { mesh } = generateMesh(d, { order: 2, size: 4 });
    let onBezier = 0;
    for (let i = 0; i < mesh.nNodes; i++) {
      const e = mesh.nodeEdge[i];
      if (e < 0 || d.edges[e].curve.kind !== 'bezier') continue;
      const b = nearestBoundaryPoint(d, mesh.nodes[2 * i], mesh.nodes[2 * i + 1]);
      expect(b.distance).toBeLessThan(1e-9 * d.scale);
      onBezier++;
    }
    expect(onBezier).toBeGreaterThan(20);
    let meshArea = 0;
    for (let e = 0; e < mesh.nElements; e++) {
      const [a, b, c] = [mesh.elements[6 * e], mesh.elements[6 * e + 1], mesh.elements[6 * e + 2]];
      meshArea += 0.5 * ((mesh.nodes[2 * b] - mesh.nodes[2 * a]) * (mesh.nodes[2 * c + 1] - mesh.nodes[2 * a + 1]) - (mesh.nodes[2 * c] - mesh.nodes[2 * a]) * (mesh.nodes[2 * b + 1] - mesh.nodes[2 * a + 1]));
    }
    // Straight-sided triangles miss the curved segments: within 0.5% of the exact area at this size.
    expect(rel(meshArea, d.area)).toBeLessThan(5e-3);
  });
  it('reads the drawing in the unit asked for: "unit": "in" makes it 25.4 times larger, and "scale" multiplies', () => {
    const inch = domainOf({ from: 'import-shapes.svg', ignore: ['construction'], unit: 'in' });
    expect(rel(area(inch, 0), outline * 25.4 * 25.4)).toBeLessThan(1e-9);
    const half = domainOf({ from: 'import-shapes.svg', ignore: ['construction'], scale: 0.5 });
    expect(rel(area(half, 0), outline / 4)).toBeLessThan(1e-9);
    const cm = domainOf({ from: 'import-shapes.svg', ignore: ['construction'] }, { units: { length: 'cm', force: 'N' } });
    expect(rel(area(cm, 0), outline / 100)).toBeLessThan(1e-9);
  });
});

/** de Boor's algorithm for a point of a polynomial B-spline (independent of the knot insertion used by the importer). */
function deBoor(p: number, U: number[], P: [number, number][], u: number): [number, number] {
  let k = p;
  while (k < P.length - 1 && U[k + 1] <= u) k++;
  const d = P.slice(k - p, k + 1).map((q) => [...q] as [number, number]);
  for (let r = 1; r <= p; r++) {
    for (let j = p; j >= r; j--) {
      const i = j + k - p;
      const a = (u - U[i]) / (U[i + p + 1 - r] - U[i]);
      d[j] = [(1 - a) * d[j - 1][0] + a * d[j][0], (1 - a) * d[j - 1][1] + a * d[j][1]];
    }
  }
  return d[p];
}

describe('meshes/import-bracket.dxf', () => {
  // Areas by hand: outline 100 x 40 with a half-round end of radius 20 (bulge 1); slot 12 x 8
  // between half circles of radius 4; ELLIPSE semi-axes 6 and 3; rational SPLINE circle r 4;
  // CIRCLE r 5 drawn in the mirrored coordinate system (extrusion (0, 0, -1)) at OCS x = -85,
  // which is x = +85 in the drawing; POLYLINE "D" 8 x 8 with a half circle of radius 4; two pins
  // of the block (r 1) inserted at scale 1.5; one inserted at scale (2, 1): an ellipse 2 x 1.
  const d = domainOf({ from: 'import-bracket.dxf' });
  const U = [0, 0, 0, 0, 0.5, 1, 1, 1, 1];
  const P: [number, number][] = [[70, 28], [71, 34], [75, 37], [79, 34], [80, 28]];
  // Area of the cubic SPLINE hole closed by its LINE: 1/2 closed integral of x dy - y dx, on de
  // Boor points with 5-point Gauss-Legendre per knot span (exact for these polynomials of degree 5).
  const splineHole = (() => {
    const gx = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
    const gw = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];
    let s = 0;
    for (const [a, b] of [[0, 0.5], [0.5, 1]]) {
      for (let g = 0; g < 5; g++) {
        const u = 0.5 * (a + b) + 0.5 * (b - a) * gx[g];
        const h = 1e-6;
        const [x, y] = deBoor(3, U, P, u);
        const [x1, y1] = deBoor(3, U, P, u + h);
        const [x0, y0] = deBoor(3, U, P, u - h);
        s += 0.5 * (b - a) * gw[g] * 0.5 * (x * (y1 - y0) - y * (x1 - x0)) / (2 * h);
      }
    }
    // The closing line from (80, 28) to (70, 28): 1/2 (x0 y1 - x1 y0).
    return Math.abs(s + 0.5 * (80 * 28 - 70 * 28));
  })();
  const expected = [PI * 6 * 3, PI * 25, 64 + 8 * PI, 2.25 * PI, 2.25 * PI, 2 * PI, 96 + 16 * PI, 16 * PI, splineHole].sort((a, b) => a - b);
  it('imports the outline and nine holes with their areas', () => {
    expect(d.loops.length).toBe(10);
    expect(rel(area(d, 0), 4000 + 200 * PI)).toBeLessThan(1e-9);
    const got = d.loops.slice(1).map((l) => Math.abs(l.signedArea)).sort((a, b) => a - b);
    // The finite-difference derivative in the spline check limits that one to 1e-8.
    for (let i = 0; i < expected.length; i++) expect(rel(got[i], expected[i]), `hole area ${expected[i]}`).toBeLessThan(1e-8);
  });
  it('puts the cubic SPLINE on the curve de Boor gives', () => {
    const loop = d.loops.find((l) => l.edges.some((id) => d.edges[id].curve.kind === 'bezier' && !(d.edges[id].curve as { w?: number[] }).w))!;
    for (let k = 1; k < 20; k++) {
      const [x, y] = deBoor(3, U, P, k / 20);
      const b = nearestBoundaryPoint(d, x, y);
      expect(b.distance).toBeLessThan(1e-9);
      expect(d.edges[b.edge].loop).toBe(loop.index);
    }
  });
  it('places the mirrored CIRCLE at x = +85 and the array of pins along the insert rotated by 30 degrees', () => {
    const circles = d.edges.filter((e) => e.curve.kind === 'arc' && Math.abs(Math.abs(e.curve.sweep) - 2 * PI) < 1e-12).map((e) => e.curve as Extract<Curve, { kind: 'arc' }>);
    expect(circles.some((c) => Math.hypot(c.cx - 85, c.cy - 20) < 1e-12 && c.r === 5)).toBe(true);
    expect(circles.some((c) => Math.hypot(c.cx - 45, c.cy - 33) < 1e-12 && Math.abs(c.r - 1.5) < 1e-12)).toBe(true);
    expect(circles.some((c) => Math.hypot(c.cx - (45 + 4 * Math.cos(PI / 6)), c.cy - (33 + 4 * Math.sin(PI / 6))) < 1e-12)).toBe(true);
  });
  it('joins the loose LINEs and ARCs of the slot into one loop with its two half circles', () => {
    const slot = d.loops.find((l) => rel(Math.abs(l.signedArea), 96 + 16 * PI) < 1e-9)!;
    expect(slot.edges.map((id) => d.edges[id].curve.kind).sort()).toEqual(['arc', 'arc', 'line', 'line']);
    expect(slot.edges.every((id) => d.edges[id].tags.includes('SLOT'))).toBe(true);
  });
  it('tags edges with their layer, and a block on layer 0 with the layer of its insert', () => {
    expect(d.edges.filter((e) => e.tags.includes('PINS')).length).toBe(3);
    expect(d.edges[d.loops[0].edges[0]].tags).toEqual(['OUTLINE']);
  });
  it('meshes the bracket with 6-node triangles of positive Jacobian (the mesh checker runs in generateMesh)', () => {
    const { mesh } = generateMesh(d, { order: 2, size: 4 });
    expect(mesh.nElements).toBeGreaterThan(100);
  });
});

describe('more of the formats', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
  const load = (file: string, extra: Record<string, unknown> = {}) =>
    loadModelAndDrawing(
      JSON.stringify({ material: { E: 1, nu: 0.3 }, thickness: 1, geometry: { from: file, ...extra }, supports: [{ type: 'fixed', on: { outline: true } }], loads: [{ type: 'pressure', on: { outline: true }, p: 1 }] }),
      join(dir, 'm.json'),
    );
  it('SVG: rotate about a centre and skewY keep areas, and an arc path command under them stays an exact conic', () => {
    // A 40 x 20 plate; a hole of two half-ellipse arcs (rx 6, ry 3: area 18 pi) under rotate(25 20 10) skewY(15).
    writeFileSync(
      join(dir, 'rot.svg'),
      '<svg xmlns="http://www.w3.org/2000/svg" width="40mm" height="20mm" viewBox="0 0 40 20"><!-- invented test drawing -->' +
        '<rect width="40" height="20"/><path id="h" transform="rotate(25 20 10) skewY(15)" d="M14 10 a6 3 0 0 1 12 0 a6 3 0 0 1 -12 0 z"/></svg>',
    );
    const { model, drawing } = load('rot.svg');
    const d = buildDomain(model.geometry, drawing);
    expect(d.loops.length).toBe(2);
    const hole = d.loops[1];
    expect(hole.edges.length).toBe(1); // the two half arcs are one whole ellipse
    expect(d.edges[hole.edges[0]].curve.kind).toBe('ellipse');
    expect(rel(Math.abs(hole.signedArea), 18 * PI)).toBeLessThan(1e-9); // rotation and skew have determinant 1
  });
  it('DXF: a partial ELLIPSE, an ARC in a mirrored coordinate system, and a drawing without a unit (taken in the model unit, with a warning)', () => {
    const g = (...p: (string | number)[]) => p.join('\n');
    const ents = [
      // outline: a half ellipse (a 20, b 10) from parameter 0 to pi, closed by a line
      g(0, 'ELLIPSE', 8, 'P', 10, 0, 20, 0, 30, 0, 11, 20, 21, 0, 31, 0, 210, 0, 220, 0, 230, 1, 40, 0.5, 41, 0, 42, Math.PI),
      g(0, 'LINE', 8, 'P', 10, -20, 20, 0, 30, 0, 11, 20, 21, 0, 31, 0),
      // a hole: two half circles of radius 2 about (5, 4); the lower one drawn mirrored, about OCS (-5, 4) from 180 to 360 degrees
      g(0, 'ARC', 8, 'H', 10, 5, 20, 4, 30, 0, 40, 2, 50, 0, 51, 180, 210, 0, 220, 0, 230, 1),
      g(0, 'ARC', 8, 'H', 10, -5, 20, 4, 30, 0, 40, 2, 50, 180, 51, 360, 210, 0, 220, 0, 230, -1),
    ];
    writeFileSync(join(dir, 'e.dxf'), g(999, 'invented test drawing', 0, 'SECTION', 2, 'ENTITIES', ...ents, 0, 'ENDSEC', 0, 'EOF', ''));
    const { model, drawing, warnings } = loadModelAndDrawing(
      JSON.stringify({ units: { length: 'in', force: 'lbf' }, material: { E: 3e7, nu: 0.3 }, thickness: 1, geometry: { from: 'e.dxf' }, supports: [{ type: 'fixed', on: 'P' }], loads: [{ type: 'pressure', on: 'H', p: 1 }] }),
      join(dir, 'm.json'),
    );
    expect(warnings.map((w) => w.message).join()).toMatch(/declares no unit .* taken in in, the model's length unit/);
    const d = buildDomain(model.geometry, drawing);
    expect(rel(Math.abs(d.loops[0].signedArea), 0.5 * PI * 20 * 10)).toBeLessThan(1e-9);
    // Mirrored, the second arc is the lower half about (5, 4) (read without the mirror it would lie about (-5, 4) and leave both open).
    expect(rel(Math.abs(d.loops[1].signedArea), PI * 4)).toBeLessThan(1e-9);
    expect(d.loops[1].edges.length).toBe(1);
  });
});
