/**
 * Published stress concentration formulas, each with its source, its nominal-stress definition
 * and its range. Provenance tags: [V] found in the named text,
 * [D] derived from a closed-form solution, [M] recalled (coefficients not checked against the
 * book; cross-checks are stated where they exist).
 */

/**
 * Kirsch (1898): circular hole in an infinite plate, remote uniaxial stress: Kt = 3 (gross =
 * remote stress). G. Kirsch, Z. VDI 42 (1898) 797-807 [D]. Equibiaxial: 2; pure shear: 4 [D].
 */
export function ktKirsch(state: 'uniaxial' | 'equibiaxial' | 'shear' = 'uniaxial'): number {
  return state === 'uniaxial' ? 3 : state === 'equibiaxial' ? 2 : 4;
}

/**
 * Inglis (1913): elliptical hole in an infinite plate, semi-axis a across the load, b along it:
 * Kt = 1 + 2 a / b at the ends of a (gross = remote stress). C. E. Inglis, Trans. Inst. Naval
 * Architects 55 (1913) 219-241 [V: as quoted in fracture-mechanics texts; D].
 */
export function ktInglis(a: number, b: number): number {
  return 1 + (2 * a) / b;
}

/**
 * Central circular hole of diameter d in a strip of width W, tension; net nominal stress
 * P / ((W - d) t). Peterson's chart 4.1 fit to Howland's solution (R. C. J. Howland, Phil.
 * Trans. R. Soc. A 229 (1930) 49-86), in W. D. Pilkey & D. F. Pilkey, Peterson's Stress
 * Concentration Factors, 3rd ed. (2008): Ktn = 2 + 0.284 (1 - d/W) - 0.600 (1 - d/W)^2
 * + 1.32 (1 - d/W)^3 [M+: agrees with Howland's table within 0.5% and with chart readings
 * within 1%]. Used for d/W <= 0.5, the range of Howland's data.
 */
export function ktHoleInStripNet(dOverW: number): number {
  const q = 1 - dOverW;
  return 2 + 0.284 * q - 0.6 * q * q + 1.32 * q * q * q;
}

/** The same on the gross section, P / (W t): Ktg = Ktn / (1 - d/W). */
export function ktHoleInStripGross(dOverW: number): number {
  return ktHoleInStripNet(dOverW) / (1 - dOverW);
}

/** Heywood (1952), Designing by Photoelasticity: Ktn = 2 + (1 - d/W)^3 [M]. */
export function ktHoleInStripHeywood(dOverW: number): number {
  return 2 + Math.pow(1 - dOverW, 3);
}

/** Stepped-bar fit form: Kt = C1 + C2 x + C3 x^2 + C4 x^3, x = 2t/D, Ci = ci1 + ci2 sqrt(t/r) + ci3 t/r. */
function fitStepped(coef: readonly (readonly number[])[], D: number, d: number, r: number): number {
  const t = (D - d) / 2;
  const h = t / r;
  const s = Math.sqrt(h);
  const x = (2 * t) / D;
  const C = coef.map(([a, b, c]) => a + b * s + c * h);
  return C[0] + C[1] * x + C[2] * x * x + C[3] * x * x * x;
}

/**
 * Flat bar with shoulder fillets in tension: wide width D, narrow width d, fillet radius r;
 * nominal stress P / (d t). Pilkey & Pilkey, Peterson's Stress Concentration Factors, chart 3.1
 * fit [M: coefficients recalled; check values agree with Carvill's tables and Gere's chart
 * readings]. Range 0.1 <= t/r <= 20 with t = (D - d)/2; the wide part assumed long.
 */
export function ktSteppedBarTension(D: number, d: number, r: number): number {
  const h = (D - d) / 2 / r;
  const low = [
    [1.006, 1.008, -0.044],
    [-0.115, -0.584, 0.315],
    [0.245, -1.006, -0.257],
    [-0.135, 0.582, -0.017],
  ];
  const high = [
    [1.02, 1.009, -0.048],
    [-0.065, -0.165, -0.007],
    [-3.459, 1.266, -0.016],
    [3.505, -2.109, 0.069],
  ];
  return fitStepped(h <= 2 ? low : high, D, d, r);
}

/**
 * Flat bar with shoulder fillets in in-plane bending: nominal stress 6M / (t d^2) on the narrow
 * width d. Pilkey & Pilkey, Peterson's Stress Concentration Factors, chart 3.4 fit [M:
 * coefficients recalled, not checked against the book; the FE results of tests/charts-fe
 * agree within 2% at four points]. Range 0.1 <= t/r <= 20, t = (D - d)/2.
 */
export function ktSteppedBarBending(D: number, d: number, r: number): number {
  const h = (D - d) / 2 / r;
  const low = [
    [1.006, 0.967, 0.013],
    [-0.27, -2.372, 0.708],
    [0.662, 1.157, -0.908],
    [-0.405, 0.249, -0.2],
  ];
  const high = [
    [1.058, 1.002, -0.038],
    [-3.652, 1.639, -0.436],
    [6.17, -5.687, 1.175],
    [-2.558, 3.046, -0.701],
  ];
  return fitStepped(h <= 2 ? low : high, D, d, r);
}

/**
 * Opposite U-notches in a strip of full width H, notch depth t, root radius r, tension; nominal
 * stress P / ((H - 2t) thickness). Pilkey & Pilkey, chart 2.4 fit [M+: agrees with Neuber's
 * combination formula within about 1%]. Range 0.1 <= t/r <= 50.
 */
export function ktOppositeUNotchesTension(H: number, t: number, r: number): number {
  const h = t / r;
  const s = Math.sqrt(h);
  const x = (2 * t) / H;
  const c =
    h < 2
      ? [
          [0.955, 2.169, -0.081],
          [-1.557, -4.046, 1.032],
          [4.013, 0.424, -0.748],
          [-2.461, 1.538, -0.236],
        ]
      : [
          [1.037, 1.991, 0.002],
          [-1.886, -2.181, -0.048],
          [0.649, 1.086, 0.142],
          [1.218, -0.922, -0.086],
        ];
  const C = c.map(([a, b, k]) => a + b * s + k * h);
  return C[0] + C[1] * x + C[2] * x * x + C[3] * x * x * x;
}

/**
 * Opposite semicircular notches of radius r (notch depth = r) in a strip of full width H,
 * tension; nominal stress P / ((H - 2r) thickness). Pilkey & Pilkey (2008) chart 2.3, after
 * Ling (1947) and Isida: Kt = 3.065 - 3.472 x + 1.009 x^2 + 0.405 x^3, x = 2r/H, 0 <= x <= 1
 * [M+: coefficients recalled; checked by its limits: 3.065 at x = 0, Ling's semicircular edge
 * notch in a semi-infinite plate (J. Math. Phys. 26 (1948) 284), and 1.007 at x = 1, where the
 * notches meet and the net section has nothing left to concentrate in].
 */
export function ktOppositeSemicircularNotchesTension(H: number, r: number): number {
  const x = (2 * r) / H;
  return 3.065 - 3.472 * x + 1.009 * x * x + 0.405 * x * x * x;
}

/**
 * Neuber's combination for notches in tension (H. Neuber, Kerbspannungslehre, 1958) [M]:
 * shallow-notch Ke = 1 + 2 sqrt(t/r), deep-notch Kd (half net width a = d/2)
 * = 2 (a/r + 1) sqrt(a/r) / [(a/r + 1) atan sqrt(a/r) + sqrt(a/r)], combined
 * Kt = 1 + sqrt[(Ke-1)^2 (Kd-1)^2 / ((Ke-1)^2 + (Kd-1)^2)]; nominal on the net section.
 */
export function ktNeuberDeepTension(aOverR: number): number {
  const s = Math.sqrt(aOverR);
  return (2 * (aOverR + 1) * s) / ((aOverR + 1) * Math.atan(s) + s);
}

export function ktNeuberOppositeNotchesTension(H: number, t: number, r: number): number {
  const ke = 1 + 2 * Math.sqrt(t / r);
  const kd = ktNeuberDeepTension((H - 2 * t) / 2 / r);
  const a = (ke - 1) ** 2;
  const b = (kd - 1) ** 2;
  return 1 + Math.sqrt((a * b) / (a + b));
}

/**
 * Pin bearing on a circular hole in an infinite plate, idealised as the cosine pressure
 * p0 cos(phi), p0 = 4 F / (pi d t): the hoop stress on the hole is
 * p0 [2/pi + (3 - nu)/4 cos(phi)] - p(phi), largest at 90 degrees from the force, 8 F / (pi^2 d t),
 * so Kt = 8 / pi^2 = 0.8106 on the bearing stress F / (d t), for any nu. Derived here [D] from
 * J.H. Michell, Proc. London Math. Soc. 31 (1899) 100 (the derivation is in tests/bearing.test.ts).
 */
export function ktBearingInfinitePlate(): number {
  return 8 / (Math.PI * Math.PI);
}

/**
 * A plate pulled through a close-fitting pin in a hole of diameter d, width W, the hole at least W
 * from the end the pin pulls towards; net nominal stress P / ((W - d) t). The curve of M.M. Frocht
 * and H.N. Hill, J. Appl. Mech. 7 (1940) A5 (strain gauges on aluminium plates and
 * photoelasticity on bakelite, 2r/D = 0.086 to 0.76) as charted in Pilkey & Pilkey, Peterson's
 * Stress Concentration Factors, 3rd ed. (2008), chapter 5 (lug joints), fitted as
 * Ktn = 12.882 - 52.714 x + 89.762 x^2 - 51.667 x^3, x = d/W, for 0.15 <= x <= 0.75 [M: the
 * coefficients are recalled, not checked against the book]. The experiments had real pins, with
 * friction and some play; the design-table note that clearance raises Kt by 35 to 50 percent
 * [V: REFERENCES.md section 11] is about the same tests.
 */
export function ktPinInPlateCloseFitNet(dOverW: number): number {
  const x = dOverW;
  return 12.882 - 52.714 * x + 89.762 * x * x - 51.667 * x * x * x;
}
