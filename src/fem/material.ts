/**
 * Isotropic linear elasticity in the plane: the constitutive matrix D with
 * {sxx, syy, txy} = D {exx, eyy, gxy} (engineering shear strain).
 *
 * Plane stress: D = E / (1 - nu^2) [1 nu 0; nu 1 0; 0 0 (1 - nu)/2].
 * Plane strain: D = E / ((1 + nu)(1 - 2 nu)) [1-nu nu 0; nu 1-nu 0; 0 0 (1 - 2 nu)/2],
 * and szz = nu (sxx + syy). (S. Timoshenko & J. N. Goodier, Theory of Elasticity, 3rd ed., 1970, ch. 2.)
 */
export type PlaneState = 'plane-stress' | 'plane-strain';

/** Row-major 3x3 constitutive matrix. */
export function constitutiveMatrix(E: number, nu: number, state: PlaneState): Float64Array {
  const D = new Float64Array(9);
  if (state === 'plane-stress') {
    const c = E / (1 - nu * nu);
    D[0] = c;
    D[1] = c * nu;
    D[3] = c * nu;
    D[4] = c;
    D[8] = (c * (1 - nu)) / 2;
  } else {
    const c = E / ((1 + nu) * (1 - 2 * nu));
    D[0] = c * (1 - nu);
    D[1] = c * nu;
    D[3] = c * nu;
    D[4] = c * (1 - nu);
    D[8] = (c * (1 - 2 * nu)) / 2;
  }
  return D;
}
