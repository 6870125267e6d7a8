/**
 * The slender U-notch in one edge of a strip under tension, from the edge crack it approximates:
 * the crack's boundary-correction factor (Tada, Paris & Irwin), the Creager-Paris peak stress at
 * a blunt crack's root, and their combination. Used by the chart library (src/charts/library.ts)
 * and by the verification suite (src/verify/exact.ts re-exports them). Provenance tags: [V] found
 * in the named text, [D] derived from a published closed form and checked, [M] recalled.
 */

function checkPositive(name: string, v: number, fn: string): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${fn}: ${name} must be a positive number, got ${v}`);
}

function checkFinite(name: string, v: number, fn: string): void {
  if (!Number.isFinite(v)) throw new RangeError(`${fn}: ${name} must be a finite number, got ${v}`);
}

/**
 * Boundary-correction factor F(a/W) of a single edge crack of length a in a strip of width W
 * under remote tension sigma, ends free to rotate: K_I = sigma sqrt(pi a) F(a/W), with
 *   F = 1.12 - 0.231 (a/W) + 10.55 (a/W)^2 - 21.72 (a/W)^3 + 30.39 (a/W)^4,  a/W <= 0.6.
 * H. Tada, P. C. Paris & G. R. Irwin, The Stress Analysis of Cracks Handbook, 3rd ed. (ASME
 * 2000), single edge crack in a strip, a fit to W. F. Brown & J. E. Srawley's collocation
 * results, stated there as good to 0.5% for a/W <= 0.6 [M+: coefficients recalled; the same
 * polynomial appears, unattributed, on public pages of fatigue formulas; it agrees within 0.5%
 * for 0.15 <= a/W <= 0.6 with Tada's closed form for any a/W,
 *   F = sqrt(2W/(pi a) tan(pi a/2W)) [0.752 + 2.02 a/W + 0.37 (1 - sin(pi a/2W))^3] / cos(pi a/2W),
 * as quoted in T. L. Anderson, Fracture Mechanics, 3rd ed. (2005), Table 2.4 (V: read in a
 * text extraction of that table), but only within 1.3% near a/W = 0.06, where the fit dips
 * below it; checked in tests/verify-exact.test.ts]. F(0) = 1.12, the edge crack in a half
 * plane. Out of range: a RangeError.
 */
export function edgeCrackFactor(aOverW: number): number {
  if (!(aOverW >= 0 && aOverW <= 0.6)) {
    throw new RangeError(`edgeCrackFactor: a/W = ${aOverW} is outside the range of the fit, 0 <= a/W <= 0.6`);
  }
  const s = aOverW;
  return 1.12 + s * (-0.231 + s * (10.55 + s * (-21.72 + s * 30.39)));
}

/** K_I = sigma sqrt(pi a) F(a/W) of a single edge crack of length a in a strip of width W (see edgeCrackFactor). Units: stress x sqrt(length). */
export function edgeCrackStressIntensity(sigma: number, a: number, W: number): number {
  const fn = 'edgeCrackStressIntensity';
  checkFinite('the remote stress sigma', sigma, fn);
  checkPositive('the crack length a', a, fn);
  checkPositive('the strip width W', W, fn);
  return sigma * Math.sqrt(Math.PI * a) * edgeCrackFactor(a / W);
}

/**
 * Peak stress at the root of a slender notch from the stress intensity factor of the crack it
 * approximates: sigma_max = 2 K_I / sqrt(pi rho), rho the root radius. M. Creager & P. C.
 * Paris, "Elastic field equations for blunt cracks with reference to stress corrosion
 * cracking", Int. J. Fract. Mech. 3 (1967) 247-252 [M for the citation; D for the formula:
 * REFERENCES.md section 6]. It is the leading term as rho -> 0: on the Inglis ellipse (src/verify/exact.ts)
 * (K = p sqrt(pi a)) it gives 2 sqrt(a/rho) against the exact 1 + 2 sqrt(a/rho), so its
 * relative error is of the order of 1 / Kt. Units: K in stress x sqrt(length), rho in length.
 */
export function creagerParisPeakStress(K: number, rho: number): number {
  checkFinite('the stress intensity factor K', K, 'creagerParisPeakStress');
  checkPositive('the root radius rho', rho, 'creagerParisPeakStress');
  return (2 * K) / Math.sqrt(Math.PI * rho);
}

/**
 * Peak stress of a slender U-notch of depth t and root radius rho in one edge of a strip of
 * width W under remote tension sigma (ends free to rotate), derived here [D, not published as
 * such] by combining Creager & Paris with the edge-crack K above:
 *   sigma_max = 2 K_I(a_c) / sqrt(pi rho),  K_I(a_c) = sigma sqrt(pi a_c) F(a_c / W),
 * with the equivalent crack ending rho/2 behind the notch root, a_c = t - rho/2: Creager &
 * Paris place the origin of the sharp-crack field there [M: their convention as recalled].
 * Taking a_c = t instead changes the result by a factor sqrt(t / (t - rho/2)), about
 * 1 + rho/(4t): within the accuracy of the method.
 * Assumptions and accuracy: a slender notch, t / rho >> 1 (the root curvature dominates the
 * local field; the flanks are parallel, as for a crack); linear elastic, plane; the crack fit's
 * range a_c / W <= 0.6. Expect errors of the order of 1/Kt, on the low side: the leading term
 * omits the constant (on the ellipse exactly 1/Kt: 9% at depth/rho = 25, 5% at 100, 2.4% at
 * 400), plus about 0.5% from the fit (1.3% near a/W = 0.06, see edgeCrackFactor's cross-check).
 * Returns sigma_max, Kt = sigma_max / sigma on the gross section, and a_c.
 */
export function edgeNotchPeakStress(sigma: number, depth: number, rho: number, W: number): { sigmaMax: number; ktGross: number; crackLength: number } {
  const fn = 'edgeNotchPeakStress';
  checkPositive('the remote tension sigma', sigma, fn);
  checkPositive('the notch depth t', depth, fn);
  checkPositive('the root radius rho', rho, fn);
  checkPositive('the strip width W', W, fn);
  if (!(rho < depth)) {
    throw new RangeError(`${fn}: the root radius ${rho} is not small against the notch depth ${depth}; the Creager-Paris estimate needs a slender notch (depth / rho >> 1)`);
  }
  const ac = depth - rho / 2;
  const K = edgeCrackStressIntensity(sigma, ac, W);
  const sigmaMax = creagerParisPeakStress(K, rho);
  return { sigmaMax, ktGross: sigmaMax / sigma, crackLength: ac };
}
