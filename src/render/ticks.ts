/**
 * Round values for axes, legends, iso-lines and scale bars, and their labels.
 *
 * The step is 1, 2, 2.5 or 5 times a power of ten, the smallest that gives at most `most`
 * intervals over the range (the "nice numbers" of P. S. Heckbert, "Nice numbers for graph
 * labels", Graphics Gems, 1990, with 2.5 added for stress ranges such as 0 to 250).
 */

/** The nice step for about `most` intervals over [lo, hi]. */
export function niceStep(lo: number, hi: number, most = 6): number {
  const span = Math.abs(hi - lo);
  if (!(span > 0) || !Number.isFinite(span)) return Math.abs(lo) > 0 ? Math.pow(10, Math.floor(Math.log10(Math.abs(lo)))) : 1;
  const raw = span / Math.max(1, most);
  const p = Math.pow(10, Math.floor(Math.log10(raw)));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= raw * (1 - 1e-9)) return m * p;
  return 10 * p;
}

/** The multiples of step inside [lo, hi] (both ends included within a tiny tolerance). */
export function ticksIn(lo: number, hi: number, step: number): number[] {
  const out: number[] = [];
  if (!(step > 0)) return out;
  const a = Math.min(lo, hi);
  const b = Math.max(lo, hi);
  const eps = 1e-9 * step;
  for (let k = Math.ceil((a - eps) / step); k * step <= b + eps; k++) {
    const v = k * step;
    out.push(Math.abs(v) < eps ? 0 : v);
    if (out.length > 1000) break;
  }
  return out;
}

/** Decimals needed to write every multiple of step exactly (2.5 needs one, 0.25 two). */
export function decimalsFor(step: number): number {
  for (let d = 0; d <= 12; d++) {
    const s = step * Math.pow(10, d);
    if (Math.abs(s - Math.round(s)) < 1e-6 * Math.max(1, s)) return d;
  }
  return 12;
}

/**
 * Labels for tick values: all with the decimals of the step; in exponent form (mantissa and a
 * common power of ten is left to the caller) when the values are very large or small.
 */
export function formatTicks(values: readonly number[], step: number): string[] {
  const big = Math.max(...values.map(Math.abs), 0);
  if (big >= 1e6 || (big > 0 && big < 1e-3)) return values.map((v) => (v === 0 ? '0' : v.toExponential(Math.max(0, decimalsFor(step / Math.pow(10, Math.floor(Math.log10(big))))))));
  const d = decimalsFor(step);
  return values.map((v) => minus(v.toFixed(d)));
}

/** A value with `digits` significant figures, without exponent for everyday magnitudes. */
export function formatValue(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e7) return minus(Number(v.toPrecision(digits)).toString());
  return minus(v.toExponential(digits - 1));
}

/** Typographic minus sign for negative numbers (U+2212, in DejaVu Sans). */
function minus(s: string): string {
  return s.startsWith('-') ? '\u2212' + s.slice(1) : s;
}

/** The largest 1, 2 or 5 times a power of ten not above `most` (scale bars). */
export function roundDown125(most: number): number {
  if (!(most > 0)) return 0;
  const p = Math.pow(10, Math.floor(Math.log10(most)));
  for (const m of [5, 2, 1]) if (m * p <= most * (1 + 1e-12)) return m * p;
  return p;
}
