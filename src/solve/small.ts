/**
 * Small dense symmetric systems (a few unknowns), solved through the eigen-decomposition by
 * cyclic Jacobi rotations (C.G.J. Jacobi 1846; G.H. Golub and C.F. Van Loan, Matrix Computations,
 * 4th ed. 2013, section 8.5): eigenvalues below relTol times the largest are treated as zero, so
 * a singular system gets its least-squares solution of least norm (the pseudo-inverse), and the
 * caller learns the rank.
 */

/**
 * Solves A x = b for symmetric A (n x n, row-major; only symmetry of the input is assumed, the
 * two triangles are averaged). Returns x = A^+ b and the numerical rank.
 */
export function solveSymmetricSmall(A: Float64Array, n: number, b: Float64Array, relTol = 1e-12): { x: Float64Array; rank: number } {
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = 0.5 * (A[i * n + j] + A[j * n + i]);
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += Math.abs(a[i * n + i]);
      for (let j = i + 1; j < n; j++) off += Math.abs(a[i * n + j]);
    }
    if (off <= 1e-300 || off <= 1e-16 * diag) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const theta = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p];
          const vkq = v[k * n + q];
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  let big = 0;
  for (let i = 0; i < n; i++) big = Math.max(big, Math.abs(a[i * n + i]));
  const x = new Float64Array(n);
  let rank = 0;
  for (let k = 0; k < n; k++) {
    const lam = a[k * n + k];
    if (!(Math.abs(lam) > relTol * big)) continue;
    rank++;
    let proj = 0;
    for (let i = 0; i < n; i++) proj += v[i * n + k] * b[i];
    for (let i = 0; i < n; i++) x[i] += (v[i * n + k] * proj) / lam;
  }
  return { x, rank };
}
