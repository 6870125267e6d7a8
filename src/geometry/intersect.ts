/**
 * Crossings and near contacts between the segments of closed polylines, found through a
 * uniform grid so the cost stays near linear in the number of segments.
 */
import { orientCcw } from './predicates.js';

export interface Polylines {
  /** x0, y0, x1, y1, ... */
  xy: Float64Array;
  /** segments as point index pairs */
  segs: Int32Array;
  /** the loop each segment belongs to */
  segLoop: Int32Array;
  /** per segment: how far the true curve may stray from the chord (0 for straight edges) */
  segSlack: Float64Array;
}

export interface Contact {
  kind: 'cross' | 'touch';
  s1: number;
  s2: number;
  loop1: number;
  loop2: number;
  x: number;
  y: number;
  gap: number;
}

/**
 * The first contacts found between segments that are not neighbours in their loop: proper
 * crossings, and gaps narrower than gapTol plus the slack of both segments. At most `limit`
 * contacts are returned, worst (crossings) first.
 */
export function findContacts(pl: Polylines, gapTol: number, limit = 16): Contact[] {
  const { xy, segs, segLoop, segSlack } = pl;
  const ns = segs.length / 2;
  if (ns === 0) return [];
  let xmin = Infinity;
  let ymin = Infinity;
  let xmax = -Infinity;
  let ymax = -Infinity;
  let total = 0;
  for (let s = 0; s < ns; s++) {
    const a = segs[2 * s];
    const b = segs[2 * s + 1];
    total += Math.hypot(xy[2 * b] - xy[2 * a], xy[2 * b + 1] - xy[2 * a + 1]);
  }
  for (let i = 0; i < xy.length; i += 2) {
    xmin = Math.min(xmin, xy[i]);
    xmax = Math.max(xmax, xy[i]);
    ymin = Math.min(ymin, xy[i + 1]);
    ymax = Math.max(ymax, xy[i + 1]);
  }
  const span = Math.max(xmax - xmin, ymax - ymin) || 1;
  let cell = Math.max((2 * total) / ns, span / 2048);
  const nx = Math.max(1, Math.min(2048, Math.ceil((xmax - xmin) / cell) + 1));
  const ny = Math.max(1, Math.min(2048, Math.ceil((ymax - ymin) / cell) + 1));
  cell = Math.max((xmax - xmin) / Math.max(1, nx - 1), (ymax - ymin) / Math.max(1, ny - 1), cell);
  // Bucket segments by the cells their (padded) boxes cover.
  const buckets = new Map<number, number[]>();
  const first = new Int32Array(2 * ns); // per segment: the first cell (i0, j0) its box covers
  for (let s = 0; s < ns; s++) {
    const a = segs[2 * s];
    const b = segs[2 * s + 1];
    const pad = gapTol + segSlack[s];
    const i0 = Math.floor((Math.min(xy[2 * a], xy[2 * b]) - pad - xmin) / cell);
    const i1 = Math.floor((Math.max(xy[2 * a], xy[2 * b]) + pad - xmin) / cell);
    const j0 = Math.floor((Math.min(xy[2 * a + 1], xy[2 * b + 1]) - pad - ymin) / cell);
    const j1 = Math.floor((Math.max(xy[2 * a + 1], xy[2 * b + 1]) + pad - ymin) / cell);
    first[2 * s] = i0;
    first[2 * s + 1] = j0;
    for (let i = i0; i <= i1; i++) {
      for (let j = j0; j <= j1; j++) {
        const k = i * 4099 + j;
        let list = buckets.get(k);
        if (!list) buckets.set(k, (list = []));
        list.push(s);
      }
    }
  }
  const out: Contact[] = [];
  // A pair of segments shares several cells when their boxes overlap over more than one: it is
  // tested only in the first cell of that overlap, so no set of pairs seen is kept (one grew past
  // the 2^24 entries a Set may hold on an outline of a million vertices).
  for (const [k, list] of buckets) {
    for (let p = 0; p < list.length; p++) {
      for (let q = p + 1; q < list.length; q++) {
        const s1 = Math.min(list[p], list[q]);
        const s2 = Math.max(list[p], list[q]);
        if (Math.max(first[2 * s1], first[2 * s2]) * 4099 + Math.max(first[2 * s1 + 1], first[2 * s2 + 1]) !== k) continue;
        const c = testPair(pl, s1, s2, gapTol);
        if (c) {
          out.push(c);
          if (out.length >= 4 * limit) return rank(out, limit);
        }
      }
    }
  }
  return rank(out, limit);
}

function rank(cs: Contact[], limit: number): Contact[] {
  cs.sort((a, b) => (a.kind === b.kind ? a.gap - b.gap : a.kind === 'cross' ? -1 : 1));
  return cs.slice(0, limit);
}

function testPair(pl: Polylines, s1: number, s2: number, gapTol: number): Contact | null {
  const { xy, segs, segLoop, segSlack } = pl;
  const a = segs[2 * s1];
  const b = segs[2 * s1 + 1];
  const c = segs[2 * s2];
  const d = segs[2 * s2 + 1];
  const ax = xy[2 * a];
  const ay = xy[2 * a + 1];
  const bx = xy[2 * b];
  const by = xy[2 * b + 1];
  const cx = xy[2 * c];
  const cy = xy[2 * c + 1];
  const dx = xy[2 * d];
  const dy = xy[2 * d + 1];
  const shared = a === c || a === d || b === c || b === d;
  if (shared) {
    // Neighbours in a loop: only a fold back onto each other is wrong.
    const [p, q, r] = a === c ? [b, a, d] : a === d ? [b, a, c] : b === c ? [a, b, d] : [a, b, c];
    const o = orientCcw(xy[2 * p], xy[2 * p + 1], xy[2 * q], xy[2 * q + 1], xy[2 * r], xy[2 * r + 1]);
    if (o === 0) {
      const dot = (xy[2 * p] - xy[2 * q]) * (xy[2 * r] - xy[2 * q]) + (xy[2 * p + 1] - xy[2 * q + 1]) * (xy[2 * r + 1] - xy[2 * q + 1]);
      if (dot > 0) return { kind: 'cross', s1, s2, loop1: segLoop[s1], loop2: segLoop[s2], x: xy[2 * q], y: xy[2 * q + 1], gap: 0 };
    }
    return null;
  }
  const o1 = orientCcw(ax, ay, bx, by, cx, cy);
  const o2 = orientCcw(ax, ay, bx, by, dx, dy);
  const o3 = orientCcw(cx, cy, dx, dy, ax, ay);
  const o4 = orientCcw(cx, cy, dx, dy, bx, by);
  if (((o1 > 0 && o2 < 0) || (o1 < 0 && o2 > 0)) && ((o3 > 0 && o4 < 0) || (o3 < 0 && o4 > 0))) {
    const t = o3 / (o3 - o4);
    return { kind: 'cross', s1, s2, loop1: segLoop[s1], loop2: segLoop[s2], x: ax + t * (bx - ax), y: ay + t * (by - ay), gap: 0 };
  }
  // Closest approach of two non-crossing segments: the least of the four end-point distances.
  let best = Infinity;
  let px = 0;
  let py = 0;
  const tryPoint = (x: number, y: number, x0: number, y0: number, x1: number, y1: number) => {
    const ex = x1 - x0;
    const ey = y1 - y0;
    const l2 = ex * ex + ey * ey;
    let t = l2 > 0 ? ((x - x0) * ex + (y - y0) * ey) / l2 : 0;
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    const qx = x0 + t * ex;
    const qy = y0 + t * ey;
    const dd = Math.hypot(x - qx, y - qy);
    if (dd < best) {
      best = dd;
      px = (x + qx) / 2;
      py = (y + qy) / 2;
    }
  };
  tryPoint(ax, ay, cx, cy, dx, dy);
  tryPoint(bx, by, cx, cy, dx, dy);
  tryPoint(cx, cy, ax, ay, bx, by);
  tryPoint(dx, dy, ax, ay, bx, by);
  if (best <= gapTol + segSlack[s1] + segSlack[s2]) {
    return { kind: 'touch', s1, s2, loop1: segLoop[s1], loop2: segLoop[s2], x: px, y: py, gap: best };
  }
  return null;
}

/** Where each loop's segments are (they are consecutive, loop by loop), and each loop's bounding box. */
export interface LoopIndex {
  start: Int32Array;
  end: Int32Array;
  /** xmin, ymin, xmax, ymax per loop */
  box: Float64Array;
}

export function indexLoops(pl: Polylines): LoopIndex {
  const { xy, segs, segLoop } = pl;
  let nl = 0;
  for (let s = 0; s < segLoop.length; s++) nl = Math.max(nl, segLoop[s] + 1);
  const start = new Int32Array(nl).fill(-1);
  const end = new Int32Array(nl).fill(-1);
  const box = new Float64Array(4 * nl);
  for (let l = 0; l < nl; l++) box.set([Infinity, Infinity, -Infinity, -Infinity], 4 * l);
  for (let s = 0; s < segLoop.length; s++) {
    const l = segLoop[s];
    if (start[l] < 0) start[l] = s;
    else if (end[l] !== s) throw new RangeError('indexLoops: the segments of a loop are not consecutive');
    end[l] = s + 1;
    const a = segs[2 * s];
    box[4 * l] = Math.min(box[4 * l], xy[2 * a]);
    box[4 * l + 1] = Math.min(box[4 * l + 1], xy[2 * a + 1]);
    box[4 * l + 2] = Math.max(box[4 * l + 2], xy[2 * a]);
    box[4 * l + 3] = Math.max(box[4 * l + 3], xy[2 * a + 1]);
  }
  return { start, end, box };
}

/**
 * Crossing-number test: is (x, y) inside the closed loop made of the listed segments? With an
 * index, only the loop's own segments are read, and a point outside its box is outside at once
 * (so testing every hole against every other costs little more than the number of pairs).
 */
export function pointInLoop(pl: Polylines, loop: number, x: number, y: number, index?: LoopIndex): boolean {
  const { xy, segs, segLoop } = pl;
  let inside = false;
  let from = 0;
  let to = segLoop.length;
  if (index) {
    const b = index.box;
    if (x < b[4 * loop] || x > b[4 * loop + 2] || y < b[4 * loop + 1] || y > b[4 * loop + 3]) return false;
    from = Math.max(0, index.start[loop]);
    to = Math.max(from, index.end[loop]);
  }
  for (let s = from; s < to; s++) {
    if (segLoop[s] !== loop) continue;
    const a = segs[2 * s];
    const b = segs[2 * s + 1];
    const ax = xy[2 * a];
    const ay = xy[2 * a + 1];
    const bx = xy[2 * b];
    const by = xy[2 * b + 1];
    if (ay > y !== by > y) {
      const xc = ax + ((y - ay) * (bx - ax)) / (by - ay);
      if (xc > x) inside = !inside;
    }
  }
  return inside;
}
