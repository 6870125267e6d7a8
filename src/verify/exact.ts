/**
 * Closed-form elastic fields used to verify the finite element results, and a derived peak
 * stress for slender edge notches. Provenance tags: [V] found in
 * the named text, [D] derived from a published closed form and checked, [M] recalled.
 *
 * Stress fields are functions (x, y) -> [sxx, syy, sxy] in the units of the remote stress; y up,
 * angles counter-clockwise from +x, the hole centred at the origin. They are plane fields of an
 * infinite plate: in plane stress and plane strain alike the stresses do not depend on E or nu.
 *
 * Points just inside a hole (as the quadrature points of straight-sided elements whose chords
 * cut into it) get the analytic continuation of the field across the hole boundary, which is
 * smooth there; points deep inside the hole, where the continuation meets its singularity, are
 * refused with a RangeError.
 */

export type StressAt = (x: number, y: number) => [number, number, number];
export type DisplacementAt = (x: number, y: number) => [number, number];

function checkPositive(name: string, v: number, fn: string): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${fn}: ${name} must be a positive number, got ${v}`);
}

function checkFinite(name: string, v: number, fn: string): void {
  if (!Number.isFinite(v)) throw new RangeError(`${fn}: ${name} must be a finite number, got ${v}`);
}

/**
 * Principal decomposition of a plane stress state: s1 along the direction phi (radians from x),
 * s2 along phi + pi/2.
 */
function principal(sxx: number, syy: number, sxy: number): { s1: number; s2: number; phi: number } {
  const c = 0.5 * (sxx + syy);
  const r = Math.hypot(0.5 * (sxx - syy), sxy);
  return { s1: c + r, s2: c - r, phi: 0.5 * Math.atan2(2 * sxy, sxx - syy) };
}

/**
 * Kirsch's uniaxial field in its own frame (remote stress 1 along x'), Cartesian form of
 * REFERENCES.md section 1 [D], with the trigonometric terms written through
 * cos 2t = (x^2 - y^2)/r^2, sin 2t = 2 x y / r^2.
 */
function kirschUnit(a2: number, x: number, y: number, out: number[]): void {
  const r2 = x * x + y * y;
  const c2 = (x * x - y * y) / r2;
  const s2 = (2 * x * y) / r2;
  const c4 = c2 * c2 - s2 * s2;
  const s4 = 2 * s2 * c2;
  const q = a2 / r2;
  const q2 = q * q;
  out[0] = 1 - q * (1.5 * c2 + c4) + 1.5 * q2 * c4;
  out[1] = -q * (0.5 * c2 - c4) - 1.5 * q2 * c4;
  out[2] = -q * (0.5 * s2 + s4) + 1.5 * q2 * s4;
}

/** Adds s * (the tensor L given in the frame rotated by angle (cos c, sin s)) to acc. */
function addRotatedTensor(L: number[], scale: number, c: number, s: number, acc: number[]): void {
  const lxx = L[0];
  const lyy = L[1];
  const lxy = L[2];
  acc[0] += scale * (c * c * lxx - 2 * c * s * lxy + s * s * lyy);
  acc[1] += scale * (s * s * lxx + 2 * c * s * lxy + c * c * lyy);
  acc[2] += scale * (c * s * (lxx - lyy) + (c * c - s * s) * lxy);
}

/**
 * Circular hole of radius a at the origin in an infinite plate under the remote plane stress
 * state (sxx, syy, sxy): G. Kirsch, "Die Theorie der Elastizitaet und die Beduerfnisse der
 * Festigkeitslehre", Z. VDI 42 (1898) 797-807, uniaxial field in the Cartesian form of
 * REFERENCES.md section 1 [D: identical to the polar form, itself V: Wikipedia "Kirsch
 * equations"]. The general state is the sum of two uniaxial fields along its principal
 * directions (linear elasticity superposes), each rotated into place. On the hole the hoop
 * stress is s1 (1 - 2 cos 2(t - phi)) + s2 (1 + 2 cos 2(t - phi)) [D]: 3 under uniaxial
 * tension, 2 equibiaxial, 4 in pure shear (Kt on the remote stress).
 * Defined for r >= a; refused (RangeError) for r < a/2.
 */
export function kirschField(a: number, sxx: number, syy: number, sxy: number): StressAt {
  const fn = 'kirschField';
  checkPositive('the hole radius a', a, fn);
  checkFinite('sxx', sxx, fn);
  checkFinite('syy', syy, fn);
  checkFinite('sxy', sxy, fn);
  const { s1, s2, phi } = principal(sxx, syy, sxy);
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const a2 = a * a;
  const L = [0, 0, 0];
  return (x, y) => {
    if (!(x * x + y * y >= 0.25 * a2)) {
      throw new RangeError(`${fn}: the point (${x}, ${y}) lies deep inside the hole of radius ${a} (r < a/2), where the plate has no material`);
    }
    const acc = [0, 0, 0];
    // s1 along (c, s): local coordinates x' = x c + y s, y' = -x s + y c.
    kirschUnit(a2, x * c + y * s, -x * s + y * c, L);
    addRotatedTensor(L, s1, c, s, acc);
    // s2 along (-s, c).
    kirschUnit(a2, -x * s + y * c, -x * c - y * s, L);
    addRotatedTensor(L, s2, -s, c, acc);
    return acc as [number, number, number];
  };
}

/**
 * The displacements of Kirsch's field (REFERENCES.md section 1: the Cartesian form of the
 * standard solution, as in J. R. Barber, Elasticity [M], proven there by strains -> Hooke's
 * law -> the stresses [D]; tests/verify-exact.test.ts repeats that proof numerically), for the
 * remote state (sxx, syy, sxy), superposed along the principal directions like the stresses:
 *   ux' = s a/(8 mu) [ (r/a)(k+1) cos t + (2a/r)((1+k) cos t + cos 3t) - (2a^3/r^3) cos 3t ]
 *   uy' = s a/(8 mu) [ (r/a)(k-3) sin t + (2a/r)((1-k) sin t + sin 3t) - (2a^3/r^3) sin 3t ]
 * with mu = E / (2 (1 + nu)), k = (3 - nu)/(1 + nu) in plane stress, 3 - 4 nu in plane strain.
 * No rigid-body part: the field is symmetric about both principal axes.
 */
export function kirschDisplacement(
  a: number,
  sxx: number,
  syy: number,
  sxy: number,
  E: number,
  nu: number,
  state: 'plane-stress' | 'plane-strain',
): DisplacementAt {
  const fn = 'kirschDisplacement';
  checkPositive('the hole radius a', a, fn);
  checkFinite('sxx', sxx, fn);
  checkFinite('syy', syy, fn);
  checkFinite('sxy', sxy, fn);
  checkPositive("Young's modulus E", E, fn);
  if (!(nu > -1 && nu < 0.5)) throw new RangeError(`${fn}: Poisson's ratio must lie in (-1, 0.5), got ${nu}`);
  const mu = E / (2 * (1 + nu));
  const k = state === 'plane-stress' ? (3 - nu) / (1 + nu) : 3 - 4 * nu;
  const { s1, s2, phi } = principal(sxx, syy, sxy);
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const a2 = a * a;
  /** Unit uniaxial displacement in the local frame, scaled by 8 mu / a. */
  const unit = (x: number, y: number, out: number[]) => {
    const r = Math.hypot(x, y);
    const ct = x / r;
    const st = y / r;
    const c3 = ct * (4 * ct * ct - 3);
    const s3 = st * (3 - 4 * st * st);
    const ra = r / a;
    const ar = a / r;
    const ar3 = ar * ar * ar;
    out[0] = ra * (k + 1) * ct + 2 * ar * ((1 + k) * ct + c3) - 2 * ar3 * c3;
    out[1] = ra * (k - 3) * st + 2 * ar * ((1 - k) * st + s3) - 2 * ar3 * s3;
  };
  const f = a / (8 * mu);
  const U = [0, 0];
  return (x, y) => {
    if (!(x * x + y * y >= 0.25 * a2)) {
      throw new RangeError(`${fn}: the point (${x}, ${y}) lies deep inside the hole of radius ${a} (r < a/2), where the plate has no material`);
    }
    unit(x * c + y * s, -x * s + y * c, U);
    let ux = s1 * f * (c * U[0] - s * U[1]);
    let uy = s1 * f * (s * U[0] + c * U[1]);
    // s2 along (-s, c): local axes e1 = (-s, c), e2 = (-c, -s).
    unit(-x * s + y * c, -x * c - y * s, U);
    ux += s2 * f * (-s * U[0] - c * U[1]);
    uy += s2 * f * (c * U[0] - s * U[1]);
    return [ux, uy];
  };
}

/**
 * Elliptical hole with semi-axes a (along x) and b (along y) at the origin in an infinite
 * plate, remote uniaxial stress p at angle alpha (radians) to x. C. E. Inglis, "Stresses in a
 * plate due to the presence of cracks and sharp corners", Trans. Inst. Naval Architects 55
 * (1913) 219-241 [V: citation]; here from the complex potentials of N. I. Muskhelishvili, Some
 * Basic Problems of the Mathematical Theory of Elasticity (1953), sec. 82 [M], as given in
 * REFERENCES.md section 2 [D: checked numerically there and again in tests/verify-exact.test.ts]:
 *
 *   z = R (zeta + m / zeta), R = (a + b)/2, m = (a - b)/(a + b), |zeta| >= 1 in the plate;
 *   phi(zeta) = p R/4 [zeta + (2 e^{2i alpha} - m)/zeta]
 *   psi(zeta) = -p R/2 [e^{-2i alpha} zeta + e^{2i alpha}/(m zeta)
 *                       - (1 + m^2)(e^{2i alpha} - m)/m * zeta/(zeta^2 - m)]
 *   sxx + syy = 4 Re Phi,  syy - sxx + 2i sxy = 2 (conj(z) Phi' + Psi),  Phi = phi'(z), Psi = psi'(z).
 *
 * The two 1/m terms of psi are combined here into one fraction without 1/m,
 *   e^{2ia}/(m zeta) - (1+m^2)(e^{2ia} - m)/m zeta/(zeta^2 - m)
 *     = ((1 + m^2 - m e^{2ia}) zeta^2 - e^{2ia}) / (zeta (zeta^2 - m)),
 * (multiply out: the numerator over the common denominator m zeta (zeta^2 - m) is m times the
 * one shown), so the circle a = b (m = 0) is evaluated directly and gives Kirsch's field.
 * Derivatives with respect to z follow by the chain rule, d/dz = (1/z'(zeta)) d/dzeta with
 * z'(zeta) = R (1 - m/zeta^2):
 *   Phi = p/4 (zeta^2 - c)/(zeta^2 - m), c = 2 e^{2ia} - m;
 *   Phi' = p/2 (c - m) zeta^3 / (R (zeta^2 - m)^3).
 * The inverse map takes the root of R zeta^2 - z zeta + R m = 0 of larger modulus (|zeta| >= 1
 * outside the hole; the other root has modulus |m|/|zeta| <= |m| < 1).
 * On the hole, at x = a cos v, y = b sin v, the hoop stress is [D]
 *   s_t / p = (1 - m^2 + 2m cos 2 alpha - 2 cos 2(v - alpha)) / (1 - 2m cos 2v + m^2),
 * and Kt = 1 + 2a/b for the load along y at (+-a, 0), 1 + 2b/a for the load along x at (0, +-b).
 * Refused (RangeError) deep inside the hole, where |zeta| < (1 + sqrt|m|)/2.
 */
export function inglisField(a: number, b: number, p: number, alphaRad: number): StressAt {
  const fn = 'inglisField';
  checkPositive('the semi-axis a', a, fn);
  checkPositive('the semi-axis b', b, fn);
  checkFinite('the remote stress p', p, fn);
  checkFinite('the load angle alpha', alphaRad, fn);
  const R = 0.5 * (a + b);
  const m = (a - b) / (a + b);
  const e2r = Math.cos(2 * alphaRad);
  const e2i = Math.sin(2 * alphaRad);
  // c = 2 e^{2ia} - m; g = 1 + m^2 - m e^{2ia} (coefficient of zeta^2 in psi's fraction).
  const cr = 2 * e2r - m;
  const ci = 2 * e2i;
  const gr = 1 + m * m - m * e2r;
  const gi = -m * e2i;
  const zetaMin = 0.5 * (1 + Math.sqrt(Math.abs(m)));
  const disc = 4 * R * R * m;
  return (x, y) => {
    // zeta = (z +- sqrt(z^2 - 4 R^2 m)) / (2R), the sign giving the larger modulus.
    const wr = x * x - y * y - disc;
    const wi = 2 * x * y;
    const h = Math.hypot(wr, wi);
    let sr: number, si: number;
    if (wr >= 0) {
      sr = Math.sqrt(0.5 * (h + wr));
      si = sr > 0 ? wi / (2 * sr) : 0;
    } else {
      si = Math.sqrt(0.5 * (h - wr));
      sr = wi / (2 * si);
    }
    // Choose the sign that adds rather than cancels: Re(conj(z) * sqrt) >= 0.
    if (x * sr + y * si < 0) {
      sr = -sr;
      si = -si;
    }
    const zr = (x + sr) / (2 * R);
    const zi = (y + si) / (2 * R);
    const mod = Math.hypot(zr, zi);
    if (!(mod >= zetaMin)) {
      throw new RangeError(`${fn}: the point (${x}, ${y}) lies deep inside the elliptical hole (semi-axes ${a}, ${b}), where the plate has no material`);
    }
    // zeta^2, zeta^3, zeta^2 - m.
    const q2r = zr * zr - zi * zi;
    const q2i = 2 * zr * zi;
    const q3r = q2r * zr - q2i * zi;
    const q3i = q2r * zi + q2i * zr;
    const dr = q2r - m;
    const di = q2i;
    // Phi = p/4 (zeta^2 - c) / (zeta^2 - m).
    const d2 = dr * dr + di * di;
    const nr = q2r - cr;
    const ni = q2i - ci;
    const phiR = (0.25 * p * (nr * dr + ni * di)) / d2;
    // Phi' = p/2 (c - m) zeta^3 / (R (zeta^2 - m)^3).
    const d3r = (dr * dr - di * di) * dr - 2 * dr * di * di;
    const d3i = (dr * dr - di * di) * di + 2 * dr * di * dr;
    const d3 = d3r * d3r + d3i * d3i;
    const tr = (cr - m) * q3r - ci * q3i;
    const ti = (cr - m) * q3i + ci * q3r;
    const k = (0.5 * p) / R;
    const dPr = (k * (tr * d3r + ti * d3i)) / d3;
    const dPi = (k * (ti * d3r - tr * d3i)) / d3;
    // psi(zeta) = -pR/2 [e^{-2ia} zeta + G(zeta)], G = (g zeta^2 - e^{2ia}) / (zeta^3 - m zeta).
    // psi'(zeta) = -pR/2 [e^{-2ia} + G'], G' = (2 g zeta (zeta^3 - m zeta) - (g zeta^2 - e^{2ia})(3 zeta^2 - m)) / (zeta^3 - m zeta)^2.
    const Nr = gr * q2r - gi * q2i - e2r;
    const Ni = gr * q2i + gi * q2r - e2i;
    const Dr = q3r - m * zr;
    const Di = q3i - m * zi;
    const dNr = 2 * (gr * zr - gi * zi);
    const dNi = 2 * (gr * zi + gi * zr);
    const dDr = 3 * q2r - m;
    const dDi = 3 * q2i;
    const numR = dNr * Dr - dNi * Di - (Nr * dDr - Ni * dDi);
    const numI = dNr * Di + dNi * Dr - (Nr * dDi + Ni * dDr);
    const D2r = Dr * Dr - Di * Di;
    const D2i = 2 * Dr * Di;
    const D2 = D2r * D2r + D2i * D2i;
    const gpR = (numR * D2r + numI * D2i) / D2;
    const gpI = (numI * D2r - numR * D2i) / D2;
    const psR = -0.5 * p * R * (e2r + gpR);
    const psI = -0.5 * p * R * (-e2i + gpI);
    // Psi = psi'(zeta) / z'(zeta), z'(zeta) = R (1 - m / zeta^2) = R (zeta^2 - m) / zeta^2.
    // 1 / z' = zeta^2 / (R (zeta^2 - m)).
    const ir = (q2r * dr + q2i * di) / (R * d2);
    const ii = (q2i * dr - q2r * di) / (R * d2);
    const PsR = psR * ir - psI * ii;
    const PsI = psR * ii + psI * ir;
    // syy - sxx + 2i sxy = 2 (conj(z) Phi' + Psi).
    const er = 2 * (x * dPr + y * dPi + PsR);
    const ei = 2 * (x * dPi - y * dPr + PsI);
    const sum = 4 * phiR;
    return [0.5 * (sum - er), 0.5 * (sum + er), 0.5 * ei];
  };
}

// The edge crack, Creager & Paris and the slender edge notch built on them are published
// closed forms that the chart library uses too: they live in src/charts/edge-notch.ts.
export { creagerParisPeakStress, edgeCrackFactor, edgeCrackStressIntensity, edgeNotchPeakStress } from '../charts/edge-notch.js';
