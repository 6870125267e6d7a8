/**
 * Discretisation error from a series of meshes: Richardson extrapolation and the Grid
 * Convergence Index.
 *
 * P. J. Roache, "Perspective: a method for uniform reporting of grid refinement studies",
 * J. Fluids Eng. 116 (1994) 405-413; P. J. Roache, Verification and Validation in Computational
 * Science and Engineering (1998); I. B. Celik et al., "Procedure for estimation and reporting of
 * uncertainty due to discretization in CFD applications", J. Fluids Eng. 130 (2008) 078001
 * (the iteration for the observed order with a non-constant refinement ratio); ASME V&V 20-2009.
 *
 * With meshes 1 (finest), 2, 3 of representative sizes h1 < h2 < h3 and results f1, f2, f3:
 *   r21 = h2/h1, r32 = h3/h2, e21 = f2 - f1, e32 = f3 - f2, s = sign(e32/e21),
 *   p = |ln|e32/e21| + q(p)| / ln r21, q(p) = ln((r21^p - s)/(r32^p - s)),
 *   f_ext = (r21^p f1 - f2)/(r21^p - 1), e_a = |(f1 - f2)/f1|, GCI = Fs e_a/(r21^p - 1).
 * Fs = 1.25 with three or more meshes in the asymptotic range (observed order within
 * [p_th/2, 2 p_th], capped at p_th, and GCI32 within a factor 2 of r^p GCI21); otherwise the
 * theoretical order is used with Fs = 3 (Roache 2011, J. Fluids Eng. 133, 115501: "if pRE is
 * unreasonable one at least reverts to using pth and FS = 3"). Because remeshed (non-nested)
 * meshes scatter, the finest difference e21 is not taken smaller than e32 / r32^p.
 */

export interface GciResult {
  /** the finest value */
  value: number;
  /** Richardson-extrapolated value */
  extrapolated: number;
  /** observed order (NaN when the differences do not allow one) */
  observedOrder: number;
  /** the order used for the band */
  orderUsed: number;
  safetyFactor: number;
  /** relative error band on the finest value: GCI_fine as a fraction */
  gci: number;
  /** GCI of the coarser pair over r^p GCI_fine: near 1 in the asymptotic range (NaN with two meshes) */
  asymptoticRatio: number;
  /** 'monotone', 'oscillating', 'diverging' or 'two-meshes' */
  behaviour: 'monotone' | 'oscillating' | 'diverging' | 'two-meshes' | 'unchanged';
  notes: string[];
}

/** Observed order for (possibly) non-constant refinement ratios, by Celik's fixed-point iteration. */
export function observedOrder(r21: number, r32: number, e21: number, e32: number): number {
  const ratio = e32 / e21;
  const s = Math.sign(ratio);
  let p = Math.abs(Math.log(Math.abs(ratio)) / Math.log(r21));
  for (let it = 0; it < 100; it++) {
    const q = Math.log((Math.pow(r21, p) - s) / (Math.pow(r32, p) - s));
    const next = Math.abs(Math.log(Math.abs(ratio)) + q) / Math.log(r21);
    if (!Number.isFinite(next)) return NaN;
    if (Math.abs(next - p) < 1e-12) return next;
    p = next;
  }
  return p;
}

/**
 * The error band of the finest of a series of results. `h` and `f` run from coarse to fine;
 * `theoreticalOrder` is the element's order of convergence for the quantity.
 */
export function gridConvergence(h: readonly number[], f: readonly number[], theoreticalOrder: number): GciResult {
  const n = f.length;
  if (n < 2 || h.length !== n) throw new RangeError('gridConvergence needs at least two meshes, with one size per result');
  const f1 = f[n - 1];
  const f2 = f[n - 2];
  const h1 = h[n - 1];
  const h2 = h[n - 2];
  const r21 = h2 / h1;
  const notes: string[] = [];
  const ea = Math.abs((f1 - f2) / f1);
  const band = (p: number, fs: number) => (fs * ea) / (Math.pow(r21, p) - 1);
  const extrap = (p: number) => (Math.pow(r21, p) * f1 - f2) / (Math.pow(r21, p) - 1);
  if (f1 === f2) {
    return { value: f1, extrapolated: f1, observedOrder: NaN, orderUsed: theoreticalOrder, safetyFactor: n >= 3 ? 1.25 : 3, gci: 0, asymptoticRatio: NaN, behaviour: 'unchanged', notes: ['the last two meshes give the same value'] };
  }
  if (n === 2) {
    notes.push('two meshes only: the theoretical order is assumed, with the safety factor 3');
    return { value: f1, extrapolated: extrap(theoreticalOrder), observedOrder: NaN, orderUsed: theoreticalOrder, safetyFactor: 3, gci: band(theoreticalOrder, 3), asymptoticRatio: NaN, behaviour: 'two-meshes', notes };
  }
  const f3 = f[n - 3];
  const h3 = h[n - 3];
  const r32 = h3 / h2;
  const e21 = f2 - f1;
  const e32 = f3 - f2;
  if (e32 === 0 || e21 / e32 < 0) {
    notes.push('the results oscillate between the last three meshes: no order can be observed, so the theoretical order is used with the safety factor 3');
    // The swing of the coarser pair, scaled down by the order, bounds the error too.
    const eEff = Math.max(Math.abs(e21), Math.abs(e32) / Math.pow(r32, theoreticalOrder));
    const gci = (3 * eEff) / Math.abs(f1) / (Math.pow(r21, theoreticalOrder) - 1);
    return { value: f1, extrapolated: extrap(theoreticalOrder), observedOrder: NaN, orderUsed: theoreticalOrder, safetyFactor: 3, gci, asymptoticRatio: NaN, behaviour: 'oscillating', notes };
  }
  if (Math.abs(e21) >= Math.abs(e32)) {
    // No order, no extrapolation; the band is three times the larger of the last two changes, so
    // it covers what moved (changes at the level of remeshing noise stay small; a quantity that
    // really grows keeps a band as wide as its growth).
    notes.push(`the change between meshes does not shrink (${(100 * Math.abs(e32 / f2)).toPrecision(2)}% then ${(100 * Math.abs(e21 / f1)).toPrecision(2)}%): no order of convergence; the band is three times the larger change`);
    const gci = (3 * Math.max(Math.abs(e21), Math.abs(e32))) / Math.abs(f1);
    return { value: f1, extrapolated: NaN, observedOrder: NaN, orderUsed: NaN, safetyFactor: 3, gci, asymptoticRatio: NaN, behaviour: 'diverging', notes };
  }
  const p = observedOrder(r21, r32, e21, e32);
  // The asymptotic range: the observed order within [p_th/2, 2 p_th] and the two pairs telling
  // the same story (GCI32 ~ r^p GCI21 within a factor of 2, Roache's check).
  const pClamped = Math.min(p, theoreticalOrder);
  const asym = Math.abs(e32) / (Math.pow(r32, pClamped) * Math.abs(e21));
  let pUsed = pClamped;
  let fs = 1.25;
  if (!(p >= 0.5 * theoreticalOrder && p <= 2 * theoreticalOrder) || !(asym >= 0.5 && asym <= 2)) {
    notes.push(
      `not in the asymptotic range (observed order ${p.toFixed(2)} against the theoretical ${theoreticalOrder}; the coarser pair changes ${asym.toFixed(2)} times as much as expected): the theoretical order is used with the safety factor 3`,
    );
    pUsed = theoreticalOrder;
    fs = 3;
  } else if (p > theoreticalOrder) {
    notes.push(`observed order ${p.toFixed(2)} exceeds the theoretical ${theoreticalOrder}: the band uses the theoretical order, the more cautious choice`);
  }
  // Non-nested meshes scatter: the finest difference may be small by chance, so it is not
  // taken smaller than the coarser difference scaled down by the order in use.
  const eEff = Math.max(Math.abs(e21), Math.abs(e32) / Math.pow(r32, pUsed));
  const gci = (fs * eEff) / Math.abs(f1) / (Math.pow(r21, pUsed) - 1);
  return { value: f1, extrapolated: extrap(pUsed), observedOrder: p, orderUsed: pUsed, safetyFactor: fs, gci, asymptoticRatio: asym, behaviour: 'monotone', notes };
}
