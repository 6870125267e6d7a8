/** Kirsch's stress field (G. Kirsch, Z. VDI 42 (1898) 797-807) for the tests: hole radius A = 1, remote sxx = S = 100. */
const A = 1;
const S = 100;

/** Kirsch stresses for remote sxx = S (REFERENCES.md section 1, Cartesian form). */
export function kirsch(x: number, y: number): [number, number, number] {
  const r2 = x * x + y * y;
  const th = Math.atan2(y, x);
  const a2 = (A * A) / r2;
  const a4 = a2 * a2;
  const c2 = Math.cos(2 * th);
  const c4 = Math.cos(4 * th);
  const s2 = Math.sin(2 * th);
  const s4 = Math.sin(4 * th);
  return [
    S * (1 - a2 * (1.5 * c2 + c4) + 1.5 * a4 * c4),
    S * (-a2 * (0.5 * c2 - c4) - 1.5 * a4 * c4),
    S * (-a2 * (0.5 * s2 + s4) + 1.5 * a4 * s4),
  ];
}

