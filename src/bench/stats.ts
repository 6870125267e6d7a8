/** What the benches share to summarise repeated runs. */

/** The median of the values (the mean of the middle two for an even count). */
export function median(xs: readonly number[]): number {
  const s = xs.slice().sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}
