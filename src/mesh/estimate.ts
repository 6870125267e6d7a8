/**
 * How many triangles a size field will ask for, before any meshing: the integral over the part
 * of 1 / (equilateral triangle area at the local size), 1 / (sqrt(3)/4 h^2), by adaptive
 * quadtree quadrature. A cell is integrated at its centre once the size cannot change much
 * across it (the field is Lipschitz with the grading as constant, so h varies by at most
 * g * half-diagonal over the cell); finer cells are split. The estimate is for refusing a model
 * that could not fit in memory up front, so it aims at a factor of two, not at a count.
 */
import type { Domain } from '../geometry/domain.js';
import { traceLoops } from '../geometry/validate.js';
import type { SizeField } from './sizefield.js';

export function estimateTriangles(domain: Domain, size: SizeField, maxCells = 200_000): number {
  const [x0, y0, x1, y1] = domain.bbox;
  const inside = insideGrid(domain, 256);
  const side = Math.max(x1 - x0, y1 - y0);
  const g = size.grading;
  const perArea = 4 / Math.sqrt(3);
  let cells = 0;
  let total = 0;
  const stack: [number, number, number, number][] = [[x0, y0, side, 0]];
  while (stack.length) {
    const [cx0, cy0, s, depth] = stack.pop()!;
    cells++;
    const xc = cx0 + s / 2;
    const yc = cy0 + s / 2;
    const h = size.at(xc, yc);
    const half = (s * Math.SQRT2) / 2;
    if ((g * half > 0.25 * h || s > 8 * h) && depth < 24 && cells < maxCells) {
      const q = s / 2;
      stack.push([cx0, cy0, q, depth + 1], [cx0 + q, cy0, q, depth + 1], [cx0, cy0 + q, q, depth + 1], [cx0 + q, cy0 + q, q, depth + 1]);
      continue;
    }
    // Area inside the part: four sample points per leaf.
    let frac = 0;
    for (const [fx, fy] of [
      [0.25, 0.25],
      [0.75, 0.25],
      [0.25, 0.75],
      [0.75, 0.75],
    ]) {
      if (inside(cx0 + fx * s, cy0 + fy * s)) frac += 0.25;
    }
    total += (frac * s * s * perArea) / (h * h);
  }
  return total;
}

/**
 * Which cells of an n x n grid over the bounding box lie in the material, by scanlines through
 * the cell centres (even-odd crossings of the traced boundary); returns a lookup by position.
 */
function insideGrid(domain: Domain, n: number): (x: number, y: number) => boolean {
  const { xy, segs } = traceLoops(domain);
  const [x0, y0, x1, y1] = domain.bbox;
  const dx = (x1 - x0) / n || 1;
  const dy = (y1 - y0) / n || 1;
  const cell = new Uint8Array(n * n);
  const xs: number[] = [];
  for (let j = 0; j < n; j++) {
    const y = y0 + (j + 0.5) * dy;
    xs.length = 0;
    for (let s = 0; s < segs.length / 2; s++) {
      const a = segs[2 * s];
      const b = segs[2 * s + 1];
      const ay = xy[2 * a + 1];
      const by = xy[2 * b + 1];
      if (ay > y === by > y) continue;
      xs.push(xy[2 * a] + ((y - ay) / (by - ay)) * (xy[2 * b] - xy[2 * a]));
    }
    xs.sort((p, q) => p - q);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const i0 = Math.max(0, Math.ceil((xs[k] - x0) / dx - 0.5));
      const i1 = Math.min(n - 1, Math.floor((xs[k + 1] - x0) / dx - 0.5));
      for (let i = i0; i <= i1; i++) cell[j * n + i] = 1;
    }
  }
  return (x, y) => {
    const i = Math.floor((x - x0) / dx);
    const j = Math.floor((y - y0) / dy);
    return i >= 0 && j >= 0 && i < n && j < n && cell[j * n + i] === 1;
  };
}

/** Degrees of freedom of a mesh of `triangles` triangles (2 per node; nodes per triangle 1/2 or 2). */
function estimateDofs(triangles: number, order: 1 | 2): number {
  return 2 * triangles * (order === 2 ? 2 : 0.5);
}

/**
 * Rough peak memory of a whole analysis (mesh, assembly, solve, recovery), bytes. With the direct
 * solver about 2 kB per DOF (measured: 1e6 DOF in about 2.6 GB, of which the factor ~0.9 GB);
 * without the factor (the iterative solver, whose preconditioner is a few times the matrix)
 * about 1 kB per DOF.
 */
export function estimateAnalysisBytes(triangles: number, order: 1 | 2, solver: 'direct' | 'iterative' = 'direct'): number {
  return 50e6 + (solver === 'direct' ? 2000 : 1000) * estimateDofs(triangles, order);
}
