/**
 * Design figures beside Kt: the notch sensitivity and fatigue notch factor at the peak, and the
 * Neuber-rule estimate of the local stress and strain when the elastic peak exceeds yield.
 * Estimates for design, not a fatigue or plasticity assessment.
 */
import { curvatureRadius } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import { nearestBoundaryPoint } from '../geometry/project.js';
import { PETERSON_LENGTH_MM, fatigueNotchFactor, neuberNotchSensitivity, neuberSqrtASteelSI, petersonLengthSteelMm, petersonNotchSensitivity } from '../charts/fatigue.js';
import type { Material } from '../model/schema.js';
import type { ResolvedUnits } from '../model/units.js';

/** The radius of curvature of the boundary at the peak (Infinity on a straight edge), length units. */
function notchRadiusAt(domain: Domain, x: number, y: number): number {
  const b = nearestBoundaryPoint(domain, x, y);
  if (b.edge < 0 || b.distance > 1e-6 * domain.scale) return Infinity;
  return curvatureRadius(domain.edges[b.edge].curve, b.t);
}

export interface FatigueEstimate {
  radius: number;
  methods: { name: string; q: number; kf: number; source: string }[];
  notes: string[];
  /** why no q could be had (methods is then empty), or null */
  withheld: string | null;
}

/**
 * q and Kf by Neuber's and Peterson's forms: from constants the model gives; for a bundled
 * aluminium grade from Peterson's constant for aluminium alloys; else from the fits for steels
 * and the ultimate strength. When none applies, the estimate has no methods and says why
 * (withheld), so the summary states it rather than leaving fatigue out.
 */
export function estimateFatigue(kt: number, radius: number, material: Material, units: ResolvedUnits): FatigueEstimate | null {
  if (!Number.isFinite(radius) || !(kt >= 1)) return null;
  const mm = units.toSI.length * 1000;
  const rMm = radius * mm;
  const out: FatigueEstimate = { radius, methods: [], notes: [], withheld: null };
  const family = material.basis?.family;
  const ns = material.notchSensitivity;
  if (ns?.neuberSqrtA !== undefined) {
    const q = neuberNotchSensitivity(ns.neuberSqrtA, radius);
    out.methods.push({ name: 'Neuber, given constant', q, kf: fatigueNotchFactor(kt, q), source: 'q = 1 / (1 + sqrt(a / r)): Shigley 9th ed. Eqs. 6-33, 6-34' });
  }
  if (ns?.petersonA !== undefined) {
    const q = petersonNotchSensitivity(ns.petersonA, radius);
    out.methods.push({ name: 'Peterson, given constant', q, kf: fatigueNotchFactor(kt, q), source: 'q = 1 / (1 + a / r): Peterson (1959), Pilkey & Pilkey sec. 1.9' });
  }
  if (out.methods.length === 0 && family === 'aluminium') {
    const a = PETERSON_LENGTH_MM.aluminiumAlloy;
    const q = petersonNotchSensitivity(a, rMm);
    out.methods.push({
      name: 'Peterson, constant for aluminium alloys',
      q,
      kf: fatigueNotchFactor(kt, q),
      source: `q = 1 / (1 + a / r), a = ${a} mm (0.020 in) for aluminium alloys: Peterson (1959) [recalled]`,
    });
    out.notes.push(`the grade ${material.basis!.grade} is an aluminium alloy: Peterson's single constant for aluminium alloys is used; the steel fits from the ultimate strength do not apply`);
  } else if (out.methods.length === 0 && material.ultimate !== undefined) {
    const sutMPa = (material.ultimate * units.toSI.stress) / 1e6;
    try {
      const sqrtA = neuberSqrtASteelSI(sutMPa, 'bending-axial');
      const q = neuberNotchSensitivity(sqrtA, rMm);
      out.methods.push({ name: 'Neuber, steel fit from the ultimate strength', q, kf: fatigueNotchFactor(kt, q), source: 'Shigley 9th ed. Eqs. 6-34, 6-35a (SI form), bending or axial' });
    } catch (err) {
      out.notes.push(`Neuber's steel fit does not apply: ${withoutRoutineName(err)}`);
    }
    try {
      const a = petersonLengthSteelMm(sutMPa);
      const q = petersonNotchSensitivity(a, rMm);
      out.methods.push({ name: 'Peterson, steel formula from the ultimate strength', q, kf: fatigueNotchFactor(kt, q), source: 'a = 0.0254 (2070 / Su)^1.8 mm, Peterson (1959) [recalled]' });
    } catch (err) {
      out.notes.push(`Peterson's steel formula does not apply: ${withoutRoutineName(err)}`);
    }
    out.notes.push('q from the ultimate strength uses fits for steels; for other metals give material.notchSensitivity');
  }
  if (out.methods.length === 0) {
    out.withheld =
      material.ultimate === undefined && material.basis
        ? `no notch sensitivity q: the grade ${material.basis.grade} has no ultimate strength here (${material.basis.unsetWhy ?? 'not set'}) and the model gives no notch-sensitivity constants; give material.ultimate or material.notchSensitivity`
        : material.ultimate === undefined
        ? 'no notch sensitivity q: the material has no ultimate strength, no notch-sensitivity constants and no bundled grade; give material.notchSensitivity, material.ultimate (steels) or material.grade'
        : `no notch sensitivity q: ${out.notes.filter((n) => n.endsWith('does not apply') || n.includes('does not apply:')).join('; ') || 'no fit applies'}; give material.notchSensitivity (Neuber's sqrt(a) or Peterson's a) or a bundled grade`;
    out.notes.length = 0;
    out.notes.push('Kf = Kt is always on the safe side');
    return out;
  }
  out.notes.push('Kf = 1 + q (Kt - 1) is an estimate for design from scattered fatigue data, not a fatigue assessment; Kf = Kt is always on the safe side');
  return out;
}

export interface NeuberEstimate {
  stress: number;
  strain: number;
  elasticStrain: number;
  source: string;
}

/**
 * Neuber's rule, sigma eps = (Kt S)^2 / E, with the Ramberg-Osgood law eps = sigma/E +
 * (sigma/K)^(1/n) (H. Neuber, J. Appl. Mech. 28 (1961) 544-550 [M]; W. Ramberg & W. R. Osgood,
 * NACA TN 902 (1943) [M]); solved for sigma by bisection on the monotone product.
 */
export function neuberLocal(ktTimesS: number, E: number, K: number, n: number): NeuberEstimate {
  const target = (ktTimesS * ktTimesS) / E;
  const strainOf = (s: number) => s / E + Math.pow(s / K, 1 / n);
  let lo = 0;
  let hi = Math.abs(ktTimesS);
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (mid * strainOf(mid) > target) hi = mid;
    else lo = mid;
    if (hi - lo <= 1e-14 * hi) break;
  }
  const s = 0.5 * (lo + hi);
  return { stress: s, strain: strainOf(s), elasticStrain: Math.abs(ktTimesS) / E, source: "Neuber's rule (Neuber 1961) with the Ramberg-Osgood law (1943)" };
}

/** A range error's message for people: without the name of the routine that raised it. */
function withoutRoutineName(err: unknown): string {
  return (err as Error).message.replace(/^[A-Za-z]\w*: /, '');
}

/** The governing raiser as the design estimates need it: its peak and its headline Kt. */
export interface GoverningPeak {
  /** where the peak is (the notch radius is taken at the boundary point there) */
  x: number;
  y: number;
  /** the elastic peak stress */
  stress: number;
  /** the headline Kt, or null when withheld */
  kt: number | null;
  /** whether the raiser's peak settled (not at a singular point) */
  settled: boolean;
}

/**
 * The design estimates of the governing raiser: q and Kf at its notch radius (null without a
 * headline Kt or a notch radius there), and Neuber's local stress and strain from its elastic
 * peak when the material gives a stress-strain curve and the peak settled (null otherwise).
 */
export function estimateDesign(domain: Domain, material: Material, units: ResolvedUnits, gov: GoverningPeak | null): { fatigue: FatigueEstimate | null; local: NeuberEstimate | null } {
  const radius = gov ? notchRadiusAt(domain, gov.x, gov.y) : Infinity;
  const fatigue = gov?.kt ? estimateFatigue(gov.kt, radius, material, units) : null;
  const ss = material.stressStrain;
  const local = ss && gov && gov.settled ? neuberLocal(Math.abs(gov.stress), material.E, ss.K, ss.n) : null;
  return { fatigue, local };
}
