/**
 * How many triangles a size field will ask for, before any meshing: the integral over the part
 * of 1 / (equilateral triangle area at the local size), 1 / (sqrt(3)/4 h^2), by adaptive
 * quadtree quadrature. A cell is integrated at its centre once the size cannot change much
 * across it (the field is Lipschitz with the grading as constant, so h varies by at most
 * g * half-diagonal over the cell); finer cells are split. The estimate is for refusing a model
 * that could not fit in memory up front, so it aims at a factor of two, not at a count.
 */
import type { Domain } from '../geometry/domain.js';
import { pointInLoop } from '../geometry/intersect.js';
import { traceLoops } from '../geometry/validate.js';
import type { SizeField } from './sizefield.js';

export function estimateTriangles(domain: Domain, size: SizeField, maxCells = 200_000): number {
  const trace = traceLoops(domain);
  const inside = (x: number, y: number) => {
    if (!pointInLoop(trace, 0, x, y)) return false;
    for (let l = 1; l < domain.loops.length; l++) if (pointInLoop(trace, l, x, y)) return false;
    return true;
  };
  const [x0, y0, x1, y1] = domain.bbox;
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

/** Rough peak memory of a whole analysis (mesh, assembly, sparse Cholesky, recovery), bytes. */
export function estimateAnalysisBytes(triangles: number, order: 1 | 2): number {
  // Nodes per triangle: 1/2 for 3-node meshes, 2 for 6-node; 2 DOF per node; about 2 kB per
  // DOF for the factor, the matrix and the work arrays (measured: 1e6 DOF in about 2 GB).
  const dofs = 2 * triangles * (order === 2 ? 2 : 0.5);
  return 50e6 + 2000 * dofs;
}
