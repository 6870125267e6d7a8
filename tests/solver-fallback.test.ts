/**
 * When the direct factor would not fit in what the memory limit leaves, the analysis solves by
 * conjugate gradients (smoothed-aggregation multigrid preconditioner, to ||f - K u|| / ||f|| <= 1e-10 or a backward error of 1e-14) and
 * says so. Kt must then agree with the direct solve: the two differ only by the iteration's
 * residual, so to far better than the mesh error (1e-6 relative is used here).
 */
import { describe, expect, it } from 'vitest';
import { estimateAnalysisBytes } from '../src/mesh/estimate.js';
import { loadModelFile } from '../src/model/load.js';
import { analyseOnMesh, prepareModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { formatSummary } from '../src/report/summary.js';
import { ktOf } from './support/kt.js';

describe('iterative solve when the factor does not fit', () => {
  it('gives the direct solution, reports the method and iterations', () => {
    const { model } = loadModelFile('examples/strap-bolt-hole.json');
    const direct = analyseOnMesh(prepareModel(model));
    expect(direct.solveStats.method).toBe('cholesky');
    // Leave 1 MB beside the rest of the analysis: far less than this factor needs.
    const limit = estimateAnalysisBytes(direct.meshStats.triangles, direct.mesh.order as 1 | 2, 'iterative') + 1e6;
    expect(direct.solveStats.estimatedFactorBytes).toBeGreaterThan(1e6);
    const iterative = analyseOnMesh(prepareModel(model, { maxMemoryBytes: limit }));
    expect(iterative.solveStats.method).toBe('pcg');
    expect(iterative.solveStats.iterations).toBeGreaterThan(0);
    expect(iterative.solveStats.relativeResidual).toBeLessThanOrEqual(1e-10);
    expect(iterative.meshStats.triangles).toBe(direct.meshStats.triangles);
    expect(Math.abs(ktOf(iterative).net! / ktOf(direct).net! - 1)).toBeLessThan(1e-6);
    const result = buildResult(iterative, 'examples/strap-bolt-hole.json');
    expect(result.solver.method).toBe('pcg');
    expect(result.solver.preconditioner).toMatch(/smoothed-aggregation multigrid, \d+ levels/);
    expect(formatSummary(result)).toMatch(/conjugate gradients .* \d+ iterations/);
  });
});
