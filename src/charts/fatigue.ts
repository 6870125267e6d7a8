/**
 * Notch sensitivity q and the fatigue notch factor Kf, each with its source. Provenance tags
 * are [V] found in the named text, [D] derived, [M]
 * recalled. These are estimates from curve fits of scattered fatigue data: Shigley notes that
 * Kf = Kt is always safe when q is in doubt [V: Shigley 9th ed., p. 296].
 *
 * Sources:
 *  - R. G. Budynas & J. K. Nisbett, Shigley's Mechanical Engineering Design, 9th ed.
 *    (McGraw-Hill 2011), sec. 6-10, Eqs. 6-31 to 6-35 and Example 6-6 [V].
 *  - H. Neuber, Kerbspannungslehre, 2nd ed. (Springer 1958) [M for this citation; Shigley names
 *    Eq. 6-33 "the Neuber equation", V].
 *  - R. E. Peterson, "Notch sensitivity", in G. Sines & J. L. Waisman (eds.), Metal Fatigue
 *    (McGraw-Hill 1959); W. D. Pilkey & D. F. Pilkey, Peterson's Stress Concentration Factors,
 *    3rd ed. (Wiley 2008), sec. 1.9 [M].
 */

/** 1 kpsi in MPa: 1 lbf/in^2 = 4.4482216152605 N / (25.4 mm)^2 (NIST SP 811, 2008, B.8). */
export const MPA_PER_KPSI = (4.4482216152605 * 1000) / (25.4 * 25.4);
/** sqrt(1 in) in sqrt(mm). */
export const SQRT_MM_PER_SQRT_IN = Math.sqrt(25.4);

function checkRadius(r: number, fn: string): void {
  if (!(r > 0) || !Number.isFinite(r)) throw new RangeError(`${fn}: the notch radius r must be a positive length, got ${r}`);
}

/**
 * Fatigue notch factor Kf = 1 + q (Kt - 1), from the definition q = (Kf - 1)/(Kt - 1)
 * [V: Shigley 9th ed., sec. 6-10, p. 295-296; REFERENCES.md section 8]. Kt >= 1 is the elastic stress concentration factor, q in
 * [0, 1] the notch sensitivity (0: notch has no effect in fatigue; 1: Kf = Kt).
 */
export function fatigueNotchFactor(kt: number, q: number): number {
  if (!(kt >= 1) || !Number.isFinite(kt)) throw new RangeError(`fatigueNotchFactor: Kt must be a number >= 1, got ${kt}`);
  if (!(q >= 0 && q <= 1)) throw new RangeError(`fatigueNotchFactor: the notch sensitivity q must lie in [0, 1], got ${q}`);
  return 1 + q * (kt - 1);
}

/**
 * Neuber's notch sensitivity q = 1 / (1 + sqrt(a / r)) = 1 / (1 + sqrt(a) / sqrt(r))
 * [V: Shigley 9th ed., Eqs. 6-33 and 6-34]. sqrtA is the square root of Neuber's material
 * length a (as Shigley's fits give it: sqrt(in) or sqrt(mm)), r the notch radius in the same
 * length unit (in or mm). Shigley's charts (Figs. 6-20, 6-21) stop at r = 4 mm (0.16 in) and
 * say to use the q of r = 4 mm for larger radii [V]; this function evaluates the formula as it
 * stands, which gives a larger (safer) q beyond 4 mm.
 */
export function neuberNotchSensitivity(sqrtA: number, r: number): number {
  if (!(sqrtA >= 0) || !Number.isFinite(sqrtA)) throw new RangeError(`neuberNotchSensitivity: sqrt(a) must be a number >= 0, got ${sqrtA}`);
  checkRadius(r, 'neuberNotchSensitivity');
  return 1 / (1 + sqrtA / Math.sqrt(r));
}

/**
 * Peterson's notch sensitivity q = 1 / (1 + a / r) [M: Peterson 1959; Pilkey & Pilkey sec. 1.9],
 * a Peterson's material length and r the notch radius in the same unit. Note the ratio a / r
 * with no square root: a common mistake writes q = 1 / (1 + a / sqrt(r)), mixing Peterson's
 * and Neuber's forms, which is not even dimensionless (REFERENCES.md section 8).
 */
export function petersonNotchSensitivity(a: number, r: number): number {
  if (!(a >= 0) || !Number.isFinite(a)) throw new RangeError(`petersonNotchSensitivity: the material length a must be a number >= 0, got ${a}`);
  checkRadius(r, 'petersonNotchSensitivity');
  return 1 / (1 + a / r);
}

export type FatigueLoading = 'bending-axial' | 'torsion';

function checkLoading(loading: FatigueLoading, fn: string): void {
  if (loading !== 'bending-axial' && loading !== 'torsion') {
    throw new RangeError(`${fn}: the loading must be 'bending-axial' or 'torsion', got ${String(loading)}`);
  }
}

/**
 * Shigley's fit of Neuber's sqrt(a) for steels, Sut (ultimate tensile strength) in kpsi,
 * result in sqrt(in) [V: Shigley 9th ed., Eqs. 6-35a and 6-35b]:
 *   bending or axial: sqrt(a) = 0.246 - 3.08e-3 Sut + 1.51e-5 Sut^2 - 2.67e-8 Sut^3
 *   torsion:          sqrt(a) = 0.190 - 2.51e-3 Sut + 1.35e-5 Sut^2 - 2.67e-8 Sut^3
 * Range 50 <= Sut <= 250 kpsi: the kpsi counterpart of the SI form's range 340 to 1700 MPa
 * (49.3 to 246.6 kpsi; REFERENCES.md section 8 [V: the SI form of the fit]); the 9th-edition page
 * itself states no range, and its torsion chart (Fig. 6-21) draws curves for 60 to 200 kpsi.
 * Out of range: a RangeError.
 */
export function neuberSqrtASteelKpsi(sutKpsi: number, loading: FatigueLoading): number {
  const fn = 'neuberSqrtASteelKpsi';
  checkLoading(loading, fn);
  if (!(sutKpsi >= 50 && sutKpsi <= 250)) {
    throw new RangeError(`${fn}: Sut = ${sutKpsi} kpsi is outside the range of Shigley's fit for steels, 50 to 250 kpsi`);
  }
  const s = sutKpsi;
  return loading === 'bending-axial'
    ? 0.246 - 3.08e-3 * s + 1.51e-5 * s * s - 2.67e-8 * s * s * s
    : 0.19 - 2.51e-3 * s + 1.35e-5 * s * s - 2.67e-8 * s * s * s;
}

/**
 * The SI form of Shigley's fit, Sut in MPa, result in sqrt(mm), 340 <= Sut <= 1700 MPa
 * [V: the SI form of the Shigley fit, REFERENCES.md section 8]:
 *   bending or axial: sqrt(a) = 1.24 - 2.25e-3 S + 1.60e-6 S^2 - 4.11e-10 S^3
 *   torsion:          sqrt(a) = 0.958 - 1.83e-3 S + 1.43e-6 S^2 - 4.11e-10 S^3
 * (a known typo elsewhere writes 1.15e-5 for the kpsi form's 1.51e-5). Against the kpsi form
 * converted (x sqrt(25.4)) over 60 to 200 kpsi [D; tests/charts-fatigue.test.ts]: bending/axial
 * within 0.7%; torsion within 4.7% in sqrt(a) (the rounded coefficients nearly cancel where
 * sqrt(a) is small, at high strength), which moves q by less than 0.4% for r >= 1 mm.
 * Shigley's Example 6-6 converts Sut to kpsi instead, which neuberSqrtASteelKpsi reproduces.
 * Out of range: a RangeError.
 */
export function neuberSqrtASteelSI(sutMPa: number, loading: FatigueLoading): number {
  const fn = 'neuberSqrtASteelSI';
  checkLoading(loading, fn);
  if (!(sutMPa >= 340 && sutMPa <= 1700)) {
    throw new RangeError(`${fn}: Sut = ${sutMPa} MPa is outside the range of the SI fit for steels, 340 to 1700 MPa`);
  }
  const s = sutMPa;
  return loading === 'bending-axial'
    ? 1.24 - 2.25e-3 * s + 1.6e-6 * s * s - 4.11e-10 * s * s * s
    : 0.958 - 1.83e-3 * s + 1.43e-6 * s * s - 4.11e-10 * s * s * s;
}

/**
 * Peterson's material length for steels, a = 0.0254 (2070 / Su)^1.8 mm with Su in MPa
 * (= 0.001 (300 / Su[ksi])^1.8 in), for Su >= 550 MPa [M, medium confidence: recalled, not
 * checked against Peterson 1959 or Pilkey & Pilkey; the mm and inch forms agree within 0.2%,
 * which only shows they are one formula]. Below 550 MPa: a RangeError (the formula is recalled
 * only for the higher strengths).
 */
export function petersonLengthSteelMm(suMPa: number): number {
  if (!(suMPa >= 550) || !Number.isFinite(suMPa)) {
    throw new RangeError(`petersonLengthSteelMm: Su = ${suMPa} MPa is outside the range of Peterson's formula for steels, Su >= 550 MPa`);
  }
  return 0.0254 * Math.pow(2070 / suMPa, 1.8);
}

/**
 * Older discrete values of Peterson's a, in mm [M: recalled]: annealed or normalised steel
 * 0.25 mm (0.010 in), quenched-and-tempered steel 0.064 mm (0.0025 in), aluminium alloys
 * 0.51 mm (0.020 in).
 */
export const PETERSON_LENGTH_MM = { annealedSteel: 0.25, quenchedTemperedSteel: 0.064, aluminiumAlloy: 0.51 } as const;

/** Shigley's recommended notch sensitivity for all grades of cast iron, q = 0.20 (conservative) [V: Shigley 9th ed., p. 296]. */
export const CAST_IRON_NOTCH_SENSITIVITY = 0.2;
