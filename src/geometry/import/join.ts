/**
 * Joining loose drawn pieces into closed loops by matching their end points.
 *
 * Every open piece has two ends. Ends closer than the tolerance form one junction (a grid of
 * cells one tolerance wide finds the neighbours, so the cost stays linear). A junction of
 * exactly two ends links two pieces (or the two ends of one piece); a junction of one end is an
 * open end, of three or more a branch. Loops are then walked piece to piece, each piece turned
 * round when it is entered at its far end. Straight edges are moved onto the exact end of their
 * neighbour (a line has no shape to lose); two curves that meet are left as drawn, their ends
 * apart by less than the tolerance.
 *
 * Consecutive arcs of one circle (or ellipse) with the same tags become one arc: a circle drawn
 * as two half arcs is one whole circle to the mesher, with nodes at its axis ends.
 */
import { evaluateCurve, reverseCurve, type Curve } from '../curve.js';
import type { DrawnCurve, Piece } from './types.js';

export interface DrawnLoop {
  curves: DrawnCurve[];
  /** the pieces it was made of */
  pieces: Piece[];
}

export interface OpenEnd {
  x: number;
  y: number;
  piece: Piece;
  /** the nearest end of another piece (or the other end of the same piece), and how far it is */
  nearest?: { x: number; y: number; piece: Piece; gap: number; sameJunctionOtherEnd: boolean };
}

export interface Branch {
  x: number;
  y: number;
  pieces: Piece[];
}

export interface JoinResult {
  loops: DrawnLoop[];
  openEnds: OpenEnd[];
  branches: Branch[];
  /** pieces dropped because another piece covers exactly the same curve */
  duplicates: Piece[];
}

function endOf(p: Piece, which: 0 | 1): [number, number] {
  const q = [0, 0];
  if (which === 0) evaluateCurve(p.curves[0].curve, 0, q);
  else evaluateCurve(p.curves[p.curves.length - 1].curve, 1, q);
  return [q[0], q[1]];
}

/** Joins the open pieces; closed pieces pass through as loops of their own. */
export function joinPieces(pieces: readonly Piece[], tol: number): JoinResult {
  const loops: DrawnLoop[] = [];
  const duplicates: Piece[] = [];
  const open: Piece[] = [];
  for (const p of pieces) {
    if (p.curves.length === 0) continue;
    if (p.closed) loops.push({ curves: p.curves.map((c) => ({ ...c })), pieces: [p] });
    else open.push(p);
  }
  // Exact duplicates (a line drawn twice, either way round) would make every end a branch.
  const kept: Piece[] = [];
  const sig = (p: Piece) => {
    const a = endOf(p, 0);
    const b = endOf(p, 1);
    const m = [0, 0];
    const mid = p.curves[Math.floor(p.curves.length / 2)].curve;
    evaluateCurve(mid, 0.5, m);
    return { a, b, m };
  };
  const sigs: ReturnType<typeof sig>[] = [];
  const near = (x0: number, y0: number, x1: number, y1: number) => Math.hypot(x1 - x0, y1 - y0) <= tol;
  // Candidates are found by the grid cell of their midpoint (and the cells around it).
  const midCell = (x: number, y: number) => [Math.floor(x / (tol || 1)), Math.floor(y / (tol || 1))];
  const byMid = new Map<string, number[]>();
  for (const p of open) {
    const s = sig(p);
    const [cx, cy] = midCell(s.m[0], s.m[1]);
    let dup = false;
    for (let dx = -1; dx <= 1 && !dup; dx++) {
      for (let dy = -1; dy <= 1 && !dup; dy++) {
        for (const i of byMid.get(`${cx + dx},${cy + dy}`) ?? []) {
          if (kept[i].curves.length !== p.curves.length) continue;
          const t = sigs[i];
          const same = near(s.a[0], s.a[1], t.a[0], t.a[1]) && near(s.b[0], s.b[1], t.b[0], t.b[1]);
          const rev = near(s.a[0], s.a[1], t.b[0], t.b[1]) && near(s.b[0], s.b[1], t.a[0], t.a[1]);
          if ((same || rev) && near(s.m[0], s.m[1], t.m[0], t.m[1])) {
            dup = true;
            break;
          }
        }
      }
    }
    if (dup) duplicates.push(p);
    else {
      const key = `${cx},${cy}`;
      byMid.set(key, [...(byMid.get(key) ?? []), kept.length]);
      kept.push(p);
      sigs.push(s);
    }
  }
  // Ends: 2k is the start of kept[k], 2k + 1 its end.
  const n = kept.length;
  const ex = new Float64Array(2 * n);
  const ey = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    [ex[2 * k], ey[2 * k]] = sigs[k].a;
    [ex[2 * k + 1], ey[2 * k + 1]] = sigs[k].b;
  }
  // Union-find over ends within tol, through a grid of cells tol wide.
  const parent = Int32Array.from({ length: 2 * n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) i = parent[i] = parent[parent[i]];
    return i;
  };
  const cell = tol > 0 ? tol : 1;
  const grid = new Map<string, number[]>();
  for (let i = 0; i < 2 * n; i++) {
    const gx = Math.floor(ex[i] / cell);
    const gy = Math.floor(ey[i] / cell);
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        for (const j of grid.get(`${gx + dx},${gy + dy}`) ?? []) {
          if (Math.hypot(ex[i] - ex[j], ey[i] - ey[j]) <= tol) parent[find(i)] = find(j);
        }
      }
    }
    const key = `${gx},${gy}`;
    const list = grid.get(key);
    if (list) list.push(i);
    else grid.set(key, [i]);
  }
  const members = new Map<number, number[]>();
  for (let i = 0; i < 2 * n; i++) {
    const r = find(i);
    const list = members.get(r);
    if (list) list.push(i);
    else members.set(r, [i]);
  }
  const openEnds: OpenEnd[] = [];
  const branches: Branch[] = [];
  const partner = new Int32Array(2 * n).fill(-1);
  for (const list of members.values()) {
    if (list.length === 2) {
      partner[list[0]] = list[1];
      partner[list[1]] = list[0];
    } else if (list.length === 1) {
      const i = list[0];
      let best = -1;
      let bd = Infinity;
      // The nearest other end is looked for only for the ends that are reported.
      for (let j = 0; j < 2 * n && openEnds.length < 64; j++) {
        if (j === i) continue;
        const d = Math.hypot(ex[i] - ex[j], ey[i] - ey[j]);
        if (d < bd) ((bd = d), (best = j));
      }
      openEnds.push({
        x: ex[i],
        y: ey[i],
        piece: kept[i >> 1],
        nearest: best >= 0 ? { x: ex[best], y: ey[best], piece: kept[best >> 1], gap: bd, sameJunctionOtherEnd: best >> 1 === i >> 1 } : undefined,
      });
    } else {
      const r = list[0];
      branches.push({ x: ex[r], y: ey[r], pieces: [...new Set(list.map((i) => kept[i >> 1]))] });
    }
  }
  if (openEnds.length > 0 || branches.length > 0) return { loops, openEnds, branches, duplicates };

  // Walk the loops.
  const used = new Uint8Array(n);
  for (let k0 = 0; k0 < n; k0++) {
    if (used[k0]) continue;
    const curves: DrawnCurve[] = [];
    const from: Piece[] = [];
    let k = k0;
    let forward = true;
    for (;;) {
      used[k] = 1;
      from.push(kept[k]);
      const cs = kept[k].curves;
      if (forward) for (const c of cs) curves.push({ ...c });
      else for (let j = cs.length - 1; j >= 0; j--) curves.push({ ...cs[j], curve: reverseCurve(cs[j].curve) });
      const exitEnd: number = forward ? 2 * k + 1 : 2 * k;
      const next: number = partner[exitEnd];
      const nk: number = next >> 1;
      if (nk === k0 && next === (2 * k0)) break;
      if (used[nk]) break; // cannot happen with two ends per junction; guards the loop
      k = nk;
      forward = next === 2 * nk;
    }
    snapLines(curves);
    loops.push({ curves, pieces: from });
  }
  for (const l of loops) l.curves = mergeConics(l.curves, tol);
  return { loops, openEnds, branches, duplicates };
}

/** Puts each line's ends exactly on the ends of its neighbours in the loop. */
function snapLines(curves: DrawnCurve[]): void {
  const n = curves.length;
  const p = [0, 0];
  const q = [0, 0];
  for (let i = 0; i < n; i++) {
    const a = curves[i];
    const b = curves[(i + 1) % n];
    evaluateCurve(a.curve, 1, p);
    evaluateCurve(b.curve, 0, q);
    const ca = a.curve;
    const cb = b.curve;
    if (ca.kind === 'line' && cb.kind === 'line') {
      const mx = 0.5 * (p[0] + q[0]);
      const my = 0.5 * (p[1] + q[1]);
      a.curve = { ...ca, x1: mx, y1: my };
      b.curve = { ...cb, x0: mx, y0: my };
    } else if (ca.kind === 'line') {
      a.curve = { ...ca, x1: q[0], y1: q[1] };
    } else if (cb.kind === 'line') {
      b.curve = { ...cb, x0: p[0], y0: p[1] };
    }
  }
}

function sameTags(a: string[], b: string[]): boolean {
  return a.length === b.length && a.every((t, i) => t === b[i]);
}

/** b continues a on the same circle or ellipse, the same way round? */
function continues(a: Curve, b: Curve, tol: number): boolean {
  if (a.kind === 'arc' && b.kind === 'arc') {
    return Math.hypot(a.cx - b.cx, a.cy - b.cy) <= tol && Math.abs(a.r - b.r) <= tol && Math.sign(a.sweep) === Math.sign(b.sweep) && Math.abs(a.sweep + b.sweep) <= 2 * Math.PI + 1e-9;
  }
  if (a.kind === 'ellipse' && b.kind === 'ellipse') {
    const sameAxes = Math.abs(Math.sin(a.rot - b.rot)) * a.a <= tol && Math.cos(a.rot - b.rot) > 0;
    return Math.hypot(a.cx - b.cx, a.cy - b.cy) <= tol && Math.abs(a.a - b.a) <= tol && Math.abs(a.b - b.b) <= tol && sameAxes && Math.sign(a.sweep) === Math.sign(b.sweep) && Math.abs(a.sweep + b.sweep) <= 2 * Math.PI + 1e-9;
  }
  return false;
}

function merged(a: Curve, b: Curve): Curve {
  if (a.kind === 'arc' && b.kind === 'arc') return { ...a, sweep: a.sweep + b.sweep };
  if (a.kind === 'ellipse' && b.kind === 'ellipse') return { ...a, sweep: a.sweep + b.sweep };
  return a;
}

/** Merges runs of arcs of one circle or ellipse (with the same tags), around the loop's start too. */
function mergeConics(curves: DrawnCurve[], tol: number): DrawnCurve[] {
  const out: DrawnCurve[] = [];
  for (const c of curves) {
    const last = out[out.length - 1];
    if (last && sameTags(last.tags, c.tags) && continues(last.curve, c.curve, tol)) last.curve = merged(last.curve, c.curve);
    else out.push({ ...c });
  }
  while (out.length > 1) {
    const last = out[out.length - 1];
    const first = out[0];
    if (!(sameTags(last.tags, first.tags) && continues(last.curve, first.curve, tol))) break;
    out[0] = { ...last, curve: merged(last.curve, first.curve) };
    out.pop();
  }
  // A whole circle or ellipse: make its sweep exactly one turn.
  if (out.length === 1) {
    const c = out[0].curve;
    if ((c.kind === 'arc' || c.kind === 'ellipse') && Math.abs(Math.abs(c.sweep) - 2 * Math.PI) < 1e-9) out[0].curve = { ...c, sweep: Math.sign(c.sweep) * 2 * Math.PI };
  }
  return out;
}
