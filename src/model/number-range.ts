/**
 * The magnitudes every nonzero number of a model (and of a drawing it reads) must lie between.
 * Squares and products of lengths, stresses and moduli (areas, energies, von Mises sums of
 * squares) then stay inside the double range with room to spare: a traction of 1e200 crashed
 * the section code, a modulus of 5e-324 (a denormal) made every model "free to move", and a
 * part of 1e-120 gave Kt 1.62 for 2.44.
 */
export const NUMBER_RANGE = [1e-100, 1e100] as const;

/** True for 0 and for finite numbers whose size lies in NUMBER_RANGE. */
export function inNumberRange(v: number): boolean {
  const a = Math.abs(v);
  return a === 0 || (a >= NUMBER_RANGE[0] && a <= NUMBER_RANGE[1]);
}
