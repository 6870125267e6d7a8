/**
 * The part's own frame for meshing: coordinates relative to the centre of its bounding box, in
 * units of its size (the box diagonal),
 *
 *     xi = (x - c) / s,    x = c + s xi,
 *
 * rounded to a grid of 2^-40 (about 1e-12 of the part; geometric tolerances are 1e-9 of it).
 * The mesher works in this frame only, so a part drawn at x = 1e9 (site or world coordinates)
 * or a millimetre part written in kilometres meshes as it does at the origin in its own size: no
 * tolerance or predicate meets coordinates that have lost their digits to an offset, and no
 * product of lengths under- or overflows (d^4 in the in-circle test underflows for a part of
 * 1e-100; the mesh of a part at 1e9 failed its own area check).
 *
 * The frame is found from an anchor, a point the model gives (the start of the first edge, or
 * the centre of an arc) that a translation moves exactly: the box, centre and size are computed
 * from the curves relative to it, so they carry no rounding of the offset. A part and its copy
 * translated by exactly representable amounts, or scaled by a power of two, have the same
 * relative coordinates to the bit; under any other scaling they differ by rounding, which the
 * grid removes (unless a value lies within rounding of a grid midpoint, about one in 10^4).
 * Angles (of arcs, ellipses) do not change with position or scale and are kept as they are:
 * rounding them would move the end of a quarter arc off the symmetry line it ends on.
 */
import { curveAreaTerm, evaluateCurve, sampleCurvesBox, type Curve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';

export interface Frame {
  /** the anchor, a point of the model */
  ax: number;
  ay: number;
  /** the centre relative to the anchor */
  cx: number;
  cy: number;
  /** the size: the diagonal of the bounding box */
  s: number;
}

const GRID = 2 ** 40;
const snap = (v: number) => Math.round(v * GRID) / GRID;

function anchorOf(c: Curve): [number, number] {
  switch (c.kind) {
    case 'line':
      return [c.x0, c.y0];
    case 'arc':
    case 'ellipse':
      return [c.cx, c.cy];
    case 'bezier':
      return [c.p[0], c.p[1]];
  }
}

/** A curve moved by (-dx, -dy), then scaled by 1/k, each number rounded to the grid when `round`. */
function moveCurve(c: Curve, dx: number, dy: number, k: number, round: boolean): Curve {
  const r = round ? snap : (v: number) => v;
  const X = (x: number) => r((x - dx) / k);
  const Y = (y: number) => r((y - dy) / k);
  switch (c.kind) {
    case 'line':
      return { kind: 'line', x0: X(c.x0), y0: Y(c.y0), x1: X(c.x1), y1: Y(c.y1) };
    case 'arc':
      return { ...c, cx: X(c.cx), cy: Y(c.cy), r: r(c.r / k) };
    case 'ellipse':
      return { ...c, cx: X(c.cx), cy: Y(c.cy), a: r(c.a / k), b: r(c.b / k) };
    case 'bezier': {
      const p = c.p.map((v, i) => (i % 2 === 0 ? X(v) : Y(v)));
      return c.w ? { kind: 'bezier', p, w: c.w.slice() } : { kind: 'bezier', p };
    }
  }
}

export function partFrame(domain: Domain): Frame {
  const [ax, ay] = anchorOf(domain.edges[domain.loops[0].edges[0]].curve);
  const [x0, y0, x1, y1] = sampleCurvesBox(domain.edges.map((e) => moveCurve(e.curve, ax, ay, 1, false)), 32);
  return { ax, ay, cx: 0.5 * (x0 + x1), cy: 0.5 * (y0 + y1), s: Math.hypot(x1 - x0, y1 - y0) };
}

/** Frame coordinates of a model point (not rounded). */
function pointToFrame(f: Frame, x: number, y: number): [number, number] {
  return [(x - f.ax - f.cx) / f.s, (y - f.ay - f.cy) / f.s];
}

function curveToFrame(c: Curve, f: Frame): Curve {
  // Relative to the anchor first (exact for nearby numbers), then to the centre, in units of s.
  const rel = moveCurve(c, f.ax, f.ay, 1, false);
  return moveCurve(rel, f.cx, f.cy, f.s, true);
}

/**
 * The domain in the frame: curves and corners mapped (labels, tags and angles kept); the box,
 * scale and areas computed again from the mapped curves, as buildDomain computes them, so they
 * too are the same to the bit for a part and its translated copy.
 */
export function domainToFrame(d: Domain, f: Frame): Domain {
  const edges = d.edges.map((e) => ({ ...e, curve: curveToFrame(e.curve, f) }));
  const loops = d.loops.map((l) => ({ ...l, signedArea: l.edges.reduce((a, id) => a + curveAreaTerm(edges[id].curve), 0) }));
  const [xmin, ymin, xmax, ymax] = sampleCurvesBox(edges.map((e) => e.curve), 32);
  return {
    loops,
    edges,
    corners: d.corners.map((c) => {
      const [x, y] = pointToFrame(f, c.x, c.y);
      return { ...c, x: snap(x), y: snap(y) };
    }),
    bbox: [xmin, ymin, xmax, ymax],
    scale: Math.hypot(xmax - xmin, ymax - ymin),
    area: loops.reduce((a, l) => a + l.signedArea, 0),
  };
}

/** Maps flat node coordinates from the frame back to the model, in place. */
export function nodesFromFrame(xy: Float64Array, f: Frame): void {
  for (let i = 0; i < xy.length; i += 2) {
    xy[i] = f.ax + (f.cx + f.s * xy[i]);
    xy[i + 1] = f.ay + (f.cy + f.s * xy[i + 1]);
  }
}
