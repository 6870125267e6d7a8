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
import { findContacts, pointInLoop, type Polylines } from './intersect.js';

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

/** Throws a ModelError for the first problem found; returns quietly for a valid domain. */
export function validateDomain(domain: Domain): void {
  const pl = traceLoops(domain);
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
    const x = pl.xy[2 * firstPoint(pl, loop.index)];
    const y = pl.xy[2 * firstPoint(pl, loop.index) + 1];
    if (!pointInLoop(pl, outline.index, x, y)) {
      throw new ModelError(loop.source, `${loop.label} lies outside the outline`, 'holes must lie inside the outline; check its centre and size');
    }
    for (const other of domain.loops.slice(1)) {
      if (other === loop) continue;
      if (pointInLoop(pl, other.index, x, y)) {
        throw new ModelError(loop.source, `${loop.label} lies inside ${other.label}`, 'a hole inside a hole is not a plate; remove one of them');
      }
    }
  }
}

function firstPoint(pl: Polylines, loop: number): number {
  for (let s = 0; s < pl.segLoop.length; s++) if (pl.segLoop[s] === loop) return pl.segs[2 * s];
  return 0;
}
