/**
 * Checks that a domain describes a plate that can be meshed: no loop crosses itself or another,
 * no two loops touch, every hole lies inside the outline and outside every other hole. Errors
 * name the loops and the place. The check runs on a fine polyline of each loop (no chord turns
 * more than 2 degrees); the distance by which a chord may miss its arc is allowed for, so a hole
 * tangent to an edge is found to touch it.
 */
import { ModelError } from '../model/errors.js';
import { curveBendBound, curveTurn, evaluateCurve } from './curve.js';
import type { Domain } from './domain.js';
import { findContacts, indexLoops, pointInLoop, type LoopIndex, type Polylines } from './intersect.js';

const CHORD_TURN = (2 * Math.PI) / 180;

/** A fine polyline of every loop, with per-segment slack (the chord's sagitta). */
export function traceLoops(domain: Domain): Polylines {
  const xy: number[] = [];
  const segs: number[] = [];
  const segLoop: number[] = [];
  const slack: number[] = [];
  const p = [0, 0];
  for (const loop of domain.loops) {
    const first = xy.length / 2;
    loop.edges.forEach((eid, k) => {
      const c = domain.edges[eid].curve;
      let n = 1;
      let sag = 0;
      if (c.kind === 'bezier') {
        n = Math.max(4, Math.ceil(curveTurn(c) / CHORD_TURN));
        // Chord error <= max|p''| dt^2 / 8, with dt = 1 / n.
        sag = curveBendBound(c) / (8 * n * n);
      } else if (c.kind !== 'line') {
        n = Math.max(4, Math.ceil(Math.abs(c.sweep) / CHORD_TURN));
        // Chord error <= max|p''| dt^2 / 8: r for an arc, max(a, b) for an ellipse in its eccentric angle.
        const bend = c.kind === 'arc' ? c.r : Math.max(c.a, c.b);
        sag = bend * (1 - Math.cos(Math.abs(c.sweep) / n / 2));
      }
      for (let j = 0; j < n; j++) {
        evaluateCurve(c, j / n, p);
        const idx = xy.length / 2;
        xy.push(p[0], p[1]);
        const last = k === loop.edges.length - 1 && j === n - 1;
        segs.push(idx, last ? first : idx + 1);
        segLoop.push(loop.index);
        slack.push(sag);
      }
    });
  }
  return { xy: Float64Array.from(xy), segs: Int32Array.from(segs), segLoop: Int32Array.from(segLoop), segSlack: Float64Array.from(slack) };
}

function fmt(v: number): string {
  return Number(v.toPrecision(5)).toString();
}

/**
 * The narrowest wedge of material a corner may make, and the widest (radians). A corner sharper
 * than a degree (a cusp: an arc of radius half its chord meeting an edge along its tangent, say)
 * cannot be meshed with elements of bounded shape in bounded number: the mesh of a 1 degree
 * wedge takes about a second, of 0.1 degree it did not finish. A material angle within a degree
 * of a full turn is a slit of no width.
 */
const MIN_CORNER_ANGLE = Math.PI / 180;

/**
 * Farthest a part may lie from the origin, in part sizes: a double holds about 16 digits, so a
 * coordinate of 1e9 sizes keeps about 7 of the shape (Kt moves by 6e-7 there; by 3e-10 at 1e6).
 */
const MAX_OFFSET = 1e9;

/** Smallest hole, as a fraction of the part (its box diagonal); mesh sizes have the same floor. */
const MIN_FEATURE = 1e-6;

/** Throws a ModelError for the first problem found; returns quietly for a valid domain. */
export function validateDomain(domain: Domain): void {
  // A wedge drawn at exactly one degree passes: the limit allows for its rounding.
  const least = MIN_CORNER_ANGLE * (1 - 1e-6);
  for (const c of domain.corners) {
    if (c.materialAngle >= least && c.materialAngle <= 2 * Math.PI - least) continue;
    const ein = domain.edges[c.edgeIn];
    const eout = domain.edges[c.edgeOut];
    // Near a reversal the sign of the turn is rounding: a cusp of material and a slit of no width look alike.
    const fromReversal = (Math.min(c.materialAngle, 2 * Math.PI - c.materialAngle) * 180) / Math.PI;
    throw new ModelError(
      eout.curve.kind !== 'line' || ein.curve.kind === 'line' ? eout.source : ein.source,
      `${ein.label} and ${eout.label} meet at (${fmt(c.x)}, ${fmt(c.y)}) running back along each other (${Number(fromReversal.toPrecision(3))} degrees from a full reversal, less than the 1 degree a corner may have): a cusp of material or a slit of no width, which no mesh can fill`,
      'check the arc\'s radius, "turn" and "large" (an arc of radius half its chord leaves its ends along the chord), round the corner, or give a slit a width',
    );
  }
  // A part far from the origin beside its size keeps few digits of its shape in its coordinates.
  const [bx0, by0, bx1, by1] = domain.bbox;
  const far = Math.max(Math.abs(bx0), Math.abs(bx1), Math.abs(by0), Math.abs(by1));
  if (far > MAX_OFFSET * domain.scale) {
    throw new ModelError(
      domain.loops[0].source,
      `the part lies ${fmt(far)} from the origin but is only ${fmt(domain.scale)} across: its coordinates keep fewer than ${Math.floor(16 - Math.log10(far / domain.scale))} digits of its shape`,
      'move the part near the origin (subtract a reference point from every coordinate); positions far beyond 1e9 times the part size are not resolved by double precision',
    );
  }
  const pl = traceLoops(domain);
  const index = indexLoops(pl);
  // A loop too small to mesh beside the part (a 1 nm hole in a 1 m plate) would only be found
  // to "touch itself" by the contact test below, whose tolerance is 1e-9 of the part.
  for (const loop of domain.loops) {
    const b = index.box;
    const across = Math.hypot(b[4 * loop.index + 2] - b[4 * loop.index], b[4 * loop.index + 3] - b[4 * loop.index + 1]);
    if (loop.hole > 0 && across < MIN_FEATURE * domain.scale) {
      throw new ModelError(
        loop.source,
        `${loop.label} is ${fmt(across)} across, less than a millionth of the part (${fmt(domain.scale)}): it cannot be meshed`,
        'leave it out (a feature this small beside the part does not change its stresses), or model a small piece of the part around it',
      );
    }
  }
  const tol = 1e-9 * domain.scale;
  const contacts = findContacts(pl, tol, 4);
  if (contacts.length > 0) {
    const c = contacts[0];
    const l1 = domain.loops[c.loop1];
    const l2 = domain.loops[c.loop2];
    const at = `near (${fmt(c.x)}, ${fmt(c.y)})`;
    if (c.loop1 === c.loop2) {
      throw new ModelError(
        l1.source,
        c.kind === 'cross' ? `the ${l1.label} crosses itself ${at}` : `the ${l1.label} touches itself ${at}`,
        'a loop must not cross or touch itself; check the order of its vertices',
      );
    }
    const [a, b] = l1.hole === 0 ? [l2, l1] : [l1, l2];
    const other = b.hole === 0 ? 'the outline' : b.label;
    throw new ModelError(
      a.source,
      c.kind === 'cross' ? `${a.label} crosses ${other} ${at}` : `${a.label} touches ${other} ${at}`,
      b.hole === 0 ? 'move the hole inside the outline, leaving material between them' : 'holes must be apart; move them or merge them into one cutout',
    );
  }
  const outline = domain.loops[0];
  for (const loop of domain.loops.slice(1)) {
    const x = pl.xy[2 * firstPoint(pl, loop.index, index)];
    const y = pl.xy[2 * firstPoint(pl, loop.index, index) + 1];
    if (!pointInLoop(pl, outline.index, x, y, index)) {
      throw new ModelError(loop.source, `${loop.label} lies outside the outline`, 'holes must lie inside the outline; check its centre and size');
    }
    for (const other of domain.loops.slice(1)) {
      if (other === loop) continue;
      if (pointInLoop(pl, other.index, x, y, index)) {
        throw new ModelError(loop.source, `${loop.label} lies inside ${other.label}`, 'a hole inside a hole is not a plate; remove one of them');
      }
    }
  }
}

function firstPoint(pl: Polylines, loop: number, index: LoopIndex): number {
  return index.start[loop] >= 0 ? pl.segs[2 * index.start[loop]] : 0;
}
