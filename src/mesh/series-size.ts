/**
 * The sizes of a certified series of meshes: where it starts, and the family each later mesh
 * belongs to (the adapted size limit scaled by 1/sqrt(2) per mesh, a known refinement ratio at
 * the peak, as Richardson extrapolation assumes).
 */
import type { SizeLimit } from './background.js';

/** The refinement ratio between consecutive meshes of a series. */
export const SERIES_RATIO = Math.SQRT2;

/**
 * The size factor of the first mesh of a series for a relative error target. The default mesh
 * aims at about 0.5% on the peak with 6-node elements (about 1% with 3-node); the series starts
 * from the size that should give the target, error ~ h^p, so a loose target does not pay for a
 * fine first mesh nor a tight one for many coarse meshes.
 */
export function firstSeriesSizeFactor(order: 1 | 2, target: number): number {
  const base = order === 2 ? 0.005 : 0.01;
  return Math.min(2, Math.max(0.35, Math.pow(target / base, 1 / order)));
}

/** A size limit scaled by f everywhere (undefined without a limit). */
export function scaleSizeLimit(limit: SizeLimit | null, f: number): SizeLimit | undefined {
  if (!limit) return undefined;
  return { at: (x, y) => f * limit.at(x, y) };
}
