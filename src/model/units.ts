/**
 * Unit sets. A model declares a length unit and a force unit; stress (and E) is force per
 * length squared, and moments are force times length. raiser computes in the file's own units
 * (Kt is a ratio and needs none); these factors are for reports and for converting defaults.
 *
 * Factors to SI, from NIST Special Publication 811 (2008 edition), "Guide for the Use of the
 * International System of Units (SI)", Appendix B.8 (factors for units listed alphabetically),
 * where the inch, foot and pound-force factors rest on exact definitions:
 *   1 in  = 0.0254 m exactly (so 1 ft = 12 in = 0.3048 m exactly);
 *   1 lbf = 0.453 592 37 kg x 9.806 65 m/s^2 = 4.448 221 615 260 5 N exactly
 *           (the avoirdupois pound times standard gravity, both exact by definition);
 *   1 kip = 1000 lbf.
 * The metric prefixes are exact powers of ten.
 */
import { FORCE_UNITS, LENGTH_UNITS } from './schema.js';

export type LengthUnit = (typeof LENGTH_UNITS)[number];
export type ForceUnit = (typeof FORCE_UNITS)[number];

/** metres per unit */
export const LENGTH_TO_M: Readonly<Record<LengthUnit, number>> = {
  mm: 1e-3,
  cm: 1e-2,
  m: 1,
  in: 0.0254,
  ft: 0.3048,
};

/** newtons per unit */
export const FORCE_TO_N: Readonly<Record<ForceUnit, number>> = {
  N: 1,
  kN: 1e3,
  MN: 1e6,
  lbf: 4.4482216152605,
  kip: 4448.2216152605,
};

/**
 * Names of force / length^2 where there is a common one. SI: N/m^2 = Pa, N/mm^2 = MN/m^2 = MPa,
 * kN/m^2 = kPa, kN/mm^2 = GPa. US customary: lbf/in^2 = psi, kip/in^2 = ksi, lbf/ft^2 = psf,
 * kip/ft^2 = ksf. Other pairs are written out, for example kN/cm^2.
 */
const STRESS_NAMES: Partial<Record<`${ForceUnit}/${LengthUnit}`, string>> = {
  'N/m': 'Pa',
  'N/mm': 'MPa',
  'kN/m': 'kPa',
  'kN/mm': 'GPa',
  'MN/m': 'MPa',
  'lbf/in': 'psi',
  'kip/in': 'ksi',
  'lbf/ft': 'psf',
  'kip/ft': 'ksf',
};

export interface ResolvedUnits {
  length: LengthUnit;
  force: ForceUnit;
  /** name of force / length^2: 'MPa', 'psi', ... or 'kN/cm^2' when there is no common one */
  stress: string;
  /** name of force x length, for moments: 'N*mm', 'lbf*in', ... */
  moment: string;
  /** multiply a value in the model's units by these to get m, N and Pa (N*m for moments) */
  toSI: { length: number; force: number; stress: number; moment: number };
}

/** The unit set of a model; mm and N (stress in MPa) unless the model says otherwise. */
export function resolveUnits(units?: { length?: LengthUnit; force?: ForceUnit }): ResolvedUnits {
  const length = units?.length ?? 'mm';
  const force = units?.force ?? 'N';
  const l = LENGTH_TO_M[length];
  const f = FORCE_TO_N[force];
  return {
    length,
    force,
    stress: STRESS_NAMES[`${force}/${length}`] ?? `${force}/${length}^2`,
    moment: `${force}*${length}`,
    toSI: { length: l, force: f, stress: f / (l * l), moment: f * l },
  };
}

/** Factor that turns a stress in `from` units into a stress in `to` units. */
export function stressFactor(from: ResolvedUnits, to: ResolvedUnits): number {
  return from.toSI.stress / to.toSI.stress;
}
