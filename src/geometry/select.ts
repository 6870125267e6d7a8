/**
 * Boundary selectors: which domain edges a tag name or a geometric selector picks. Geometric
 * tests use a tolerance relative to the model size (1e-7 of the bounding-box diagonal), never
 * an absolute length.
 */
import type { Selector, Target } from '../model/schema.js';
import { evaluateCurve } from './curve.js';
import type { Domain, DomainEdge } from './domain.js';

const REL_TOL = 1e-7;

function endPoints(e: DomainEdge): [number, number, number, number] {
  const p = [0, 0];
  const q = [0, 0];
  evaluateCurve(e.curve, 0, p);
  evaluateCurve(e.curve, 1, q);
  return [p[0], p[1], q[0], q[1]];
}

/** Domain edges picked by one selector, in domain order. */
export function selectEdges(domain: Domain, sel: Selector): number[] {
  const tol = REL_TOL * domain.scale;
  const pick = (test: (e: DomainEdge) => boolean) => domain.edges.filter(test).map((e) => e.id);
  if (typeof sel === 'string') return pick((e) => e.tags.includes(sel));
  if ('x' in sel) return pick((e) => e.curve.kind === 'line' && Math.abs(e.curve.x0 - sel.x) <= tol && Math.abs(e.curve.x1 - sel.x) <= tol);
  if ('y' in sel) return pick((e) => e.curve.kind === 'line' && Math.abs(e.curve.y0 - sel.y) <= tol && Math.abs(e.curve.y1 - sel.y) <= tol);
  if ('line' in sel) {
    const [[ax, ay], [bx, by]] = sel.line;
    const len = Math.hypot(bx - ax, by - ay);
    if (len === 0) return [];
    const dist = (x: number, y: number) => Math.abs((bx - ax) * (y - ay) - (by - ay) * (x - ax)) / len;
    return pick((e) => {
      if (e.curve.kind !== 'line') return false;
      const [x0, y0, x1, y1] = endPoints(e);
      return dist(x0, y0) <= tol && dist(x1, y1) <= tol;
    });
  }
  if ('hole' in sel) {
    const h = sel.hole;
    const loop = domain.loops.find((l) => l.hole > 0 && (typeof h === 'number' ? l.hole === h : l.name === h));
    return loop ? loop.edges.slice() : [];
  }
  if ('outline' in sel) return domain.loops[0].edges.slice();
  if ('box' in sel) {
    const [[x0, y0], [x1, y1]] = sel.box;
    const p = [0, 0];
    return pick((e) => {
      for (let k = 0; k <= 16; k++) {
        evaluateCurve(e.curve, k / 16, p);
        if (p[0] < x0 - tol || p[0] > x1 + tol || p[1] < y0 - tol || p[1] > y1 + tol) return false;
      }
      return true;
    });
  }
  return [];
}

/** Union of the edges a target picks; `empty` lists the selectors that matched nothing. */
export function selectTarget(domain: Domain, target: Target): { edges: number[]; empty: Selector[] } {
  const list: Selector[] = Array.isArray(target) && !isPoint(target) ? (target as Selector[]) : [target as Selector];
  const set = new Set<number>();
  const empty: Selector[] = [];
  for (const s of list) {
    const got = selectEdges(domain, s);
    if (got.length === 0) empty.push(s);
    for (const e of got) set.add(e);
  }
  return { edges: [...set].sort((a, b) => a - b), empty };
}

function isPoint(t: unknown): boolean {
  return Array.isArray(t) && t.length === 2 && typeof t[0] === 'number';
}

/** Short text for a selector, for messages. */
export function describeSelector(s: Selector): string {
  if (typeof s === 'string') return `tag "${s}"`;
  if ('x' in s) return `the edges on x = ${s.x}`;
  if ('y' in s) return `the edges on y = ${s.y}`;
  if ('line' in s) return `the edges on the line through (${s.line[0].join(', ')}) and (${s.line[1].join(', ')})`;
  if ('hole' in s) return `hole ${typeof s.hole === 'number' ? s.hole : `"${s.hole}"`}`;
  if ('outline' in s) return 'the outline';
  return `the edges inside the box (${s.box[0].join(', ')}) - (${s.box[1].join(', ')})`;
}
