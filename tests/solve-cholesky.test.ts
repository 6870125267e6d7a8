import { afterAll, describe, it, expect } from 'vitest';
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import {
  adjacencyGraph,
  analyzeCholesky,
  assembleSymmetric,
  backwardError,
  DEFAULT_PIVOT_TOLERANCE,
  factorCholesky,
  factorCholeskySimplicial,
  orderAmd,
  type Ordering,
  orderNatural,
  orderNestedDissection,
  relativeResidual,
  restrictOrdering,
  solveCholesky,
  solveCholeskySimplicial,
  SolverPivotError,
  SolverThreads,
  solveSpd,
  type SymmetricCsc,
} from '../src/solve/index.js';
import { cantileverProblem, jitteredRectangleMesh, planeStressStiffness } from '../src/bench/fixtures/cantilever.js';
import { denseSymbolic, gridLaplacian, randomSpd, relativeMaxDifference } from './support/matrices.js';
import { randomVector } from '../src/bench/fixtures/random.js';
import { chooseSplit } from '../src/solve/multifrontal.js';
import { postorderTree } from '../src/solve/etree.js';
import { InternalError } from '../src/model/errors.js';

function toDense(a: SymmetricCsc): Matrix {
  const m = Matrix.zeros(a.n, a.n);
  for (let j = 0; j < a.n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      m.set(a.rowIndex[p], j, a.values[p]);
      m.set(j, a.rowIndex[p], a.values[p]);
    }
  }
  return m;
}

function denseSolve(a: SymmetricCsc, b: Float64Array): number[] {
  return new CholeskyDecomposition(toDense(a)).solve(Matrix.columnVector(Array.from(b))).to1DArray();
}

interface Case {
  readonly name: string;
  readonly a: SymmetricCsc;
}

const cases: Case[] = [
  { name: 'random SPD n=50 density 0.1', a: randomSpd(50, 0.1, 1) },
  { name: 'random SPD n=120 density 0.03', a: randomSpd(120, 0.03, 2) },
  { name: 'random SPD n=30 dense', a: randomSpd(30, 1, 3) },
  // one supernode of 100 columns: several pivot panels and every edge case of the 4 x 2 blocking
  { name: 'random SPD n=100 dense', a: randomSpd(100, 1, 5) },
  { name: 'random SPD n=150 density 0.3', a: randomSpd(150, 0.3, 6) },
  { name: '5-point Laplacian 12 x 9', a: gridLaplacian(12, 9, 5) },
  { name: '9-point Laplacian 11 x 10', a: gridLaplacian(11, 10, 9) },
  { name: 'plane-stress cantilever 12 x 6', a: cantileverProblem(12, 6, 4).matrix },
];

function orderings(a: SymmetricCsc): [string, Ordering][] {
  return [
    ['natural', orderNatural(a.n)],
    ['AMD', orderAmd(adjacencyGraph(a))],
  ];
}

describe('symbolic analysis', () => {
  it('a parent array with a cycle is refused as an internal fault (InternalError, exit 1), not a silent postorder', () => {
    // 0 -> 1 -> 2 -> 0: no root, so no postorder can list the nodes; only a bug upstream makes one
    expect(() => postorderTree(Int32Array.from([1, 2, 0]))).toThrow(InternalError);
    expect(() => postorderTree(Int32Array.from([1, 2, 0]))).toThrow(/cycle/);
    expect(Array.from(postorderTree(Int32Array.from([2, 2, -1])))).toEqual([0, 1, 2]);
  });

  it('elimination tree and column counts equal those of boolean dense elimination', () => {
    for (const { a } of cases) {
      for (const [, ord] of orderings(a)) {
        const sym = analyzeCholesky(a, ord);
        const ref = denseSymbolic(a, sym.perm);
        expect(Array.from(sym.parent)).toEqual(Array.from(ref.parent));
        expect(Array.from(sym.colCount)).toEqual(Array.from(ref.colCount));
        let nnz = 0;
        let fl = 0;
        for (const c of ref.colCount) {
          nnz += c;
          fl += c * c;
        }
        expect(sym.nnzL).toBe(nnz);
        expect(sym.flops).toBe(fl);
      }
    }
  });

  it('the final ordering is a postorder: every parent comes after its child', () => {
    const a = cantileverProblem(10, 5).matrix;
    const sym = analyzeCholesky(a, orderAmd(adjacencyGraph(a)));
    for (let j = 0; j < a.n; j++) if (sym.parent[j] !== -1) expect(sym.parent[j]).toBeGreaterThan(j);
  });

  it('supernode rows start with their own columns and then increase; each column is in one supernode', () => {
    const a = gridLaplacian(15, 15, 9);
    const sym = analyzeCholesky(a, orderAmd(adjacencyGraph(a)));
    expect(sym.superStart[0]).toBe(0);
    expect(sym.superStart[sym.nSuper]).toBe(a.n);
    for (let s = 0; s < sym.nSuper; s++) {
      const f = sym.superStart[s];
      const k = sym.superStart[s + 1] - f;
      expect(k).toBeGreaterThan(0);
      const rows = sym.superRows.subarray(sym.rowPtr[s], sym.rowPtr[s + 1]);
      for (let t = 0; t < k; t++) expect(rows[t]).toBe(f + t);
      for (let t = 1; t < rows.length; t++) expect(rows[t]).toBeGreaterThan(rows[t - 1]);
      if (sym.superParent[s] !== -1) expect(sym.superParent[s]).toBeGreaterThan(s);
    }
    expect(sym.storedValues).toBeGreaterThanOrEqual(sym.nnzL);
  });
});

describe('numeric factorisation against a dense Cholesky solve', () => {
  for (const { name, a } of cases) {
    it(`supernodal and simplicial solves agree with ml-matrix to 1e-12 on ${name}`, () => {
      const b = randomVector(a.n, 7);
      const xd = denseSolve(a, b);
      for (const [, ord] of orderings(a)) {
        const sym = analyzeCholesky(a, ord);
        for (const kernel of ['js', 'simd'] as const) {
          const x = solveCholesky(factorCholesky(a, sym, { kernel }), b);
          expect(relativeMaxDifference(x, xd)).toBeLessThan(1e-10);
          expect(relativeResidual(a, x, b)).toBeLessThan(1e-12);
        }
        const xs = solveCholeskySimplicial(factorCholeskySimplicial(a, sym), b);
        expect(relativeMaxDifference(xs, xd)).toBeLessThan(1e-10);
        expect(relativeResidual(a, xs, b)).toBeLessThan(1e-12);
      }
    });
  }

  it('fundamental (unrelaxed) and relaxed supernodes give the same solution', () => {
    const a = cantileverProblem(16, 8, 2).matrix;
    const b = randomVector(a.n, 3);
    const ord = orderAmd(adjacencyGraph(a));
    const relaxed = analyzeCholesky(a, ord);
    const fundamental = analyzeCholesky(a, ord, { rules: [] });
    expect(fundamental.storedValues).toBeLessThanOrEqual(relaxed.storedValues);
    expect(fundamental.nSuper).toBeGreaterThan(relaxed.nSuper);
    const x1 = solveCholesky(factorCholesky(a, relaxed), b);
    const x2 = solveCholesky(factorCholesky(a, fundamental), b);
    expect(relativeMaxDifference(x1, x2)).toBeLessThan(1e-12);
  });

  it('the supernodal factor holds the same L as the simplicial one', () => {
    const a = gridLaplacian(9, 7, 9);
    const sym = analyzeCholesky(a, orderAmd(adjacencyGraph(a)));
    const sup = factorCholesky(a, sym);
    const sim = factorCholeskySimplicial(a, sym);
    let maxDiff = 0;
    for (let s = 0; s < sym.nSuper; s++) {
      const f = sym.superStart[s];
      const k = sym.superStart[s + 1] - f;
      const rows = sym.superRows.subarray(sym.rowPtr[s], sym.rowPtr[s + 1]);
      let o = sym.valuePtr[s];
      for (let r = 0; r < rows.length; r++) {
        const cnt = Math.min(r + 1, k);
        for (let t = 0; t < cnt; t++) {
          const j = f + t;
          // find L(rows[r], j) in the simplicial column j (0 if absent: a stored zero of a relaxed supernode)
          let v = 0;
          for (let p = sim.colPtr[j]; p < sim.colPtr[j + 1]; p++) if (sim.rowIndex[p] === rows[r]) v = sim.values[p];
          maxDiff = Math.max(maxDiff, Math.abs(sup.values[o + t] - v));
        }
        o += cnt;
      }
    }
    expect(maxDiff).toBeLessThan(1e-13);
  });

  it('several right-hand sides at once give the same solutions as one at a time', () => {
    const a = cantileverProblem(10, 5, 6).matrix;
    const n = a.n;
    const b = randomVector(3 * n, 8);
    const sym = analyzeCholesky(a, orderAmd(adjacencyGraph(a)));
    const f = factorCholesky(a, sym);
    const xAll = solveCholesky(f, b, 3);
    const fs = factorCholeskySimplicial(a, sym);
    const xsAll = solveCholeskySimplicial(fs, b, 3);
    for (let r = 0; r < 3; r++) {
      const x1 = solveCholesky(f, b.slice(r * n, (r + 1) * n));
      expect(Array.from(xAll.subarray(r * n, (r + 1) * n))).toEqual(Array.from(x1));
      expect(relativeResidual(a, xsAll.subarray(r * n, (r + 1) * n), b.subarray(r * n, (r + 1) * n))).toBeLessThan(1e-12);
    }
  });

  it('does not modify the matrix or the right-hand side', () => {
    const a = gridLaplacian(6, 6);
    const vals = a.values.slice();
    const b = randomVector(36, 1);
    const b0 = b.slice();
    solveSpd(a, b);
    expect(Array.from(a.values)).toEqual(Array.from(vals));
    expect(Array.from(b)).toEqual(Array.from(b0));
  });

  it('factor memory stays below 16 bytes per nonzero of L on a stiffness matrix', () => {
    const p = cantileverProblem(40, 20, 1);
    const { stats } = solveSpd(p.matrix, randomVector(p.matrix.n, 2), {
      coords: p.mesh.coords,
      nodeAdjacency: p.adjacency,
      fullDofOfRow: p.fullDofOfRow,
    });
    expect(stats.bytesPerNnzL).toBeLessThan(16);
  });
});

describe('two threads', () => {
  // the second thread these tests lend the solver, stopped after them
  const workers = new SolverThreads();
  afterAll(() => workers.close());

  it('a factorisation split with a worker thread gives bit-for-bit the single-thread result', () => {
    const p = cantileverProblem(60, 30, 3);
    const a = p.matrix;
    const b = randomVector(a.n, 5);
    const ord = orderNestedDissection(p.adjacency, p.mesh.coords, 2);
    const sym = analyzeCholesky(a, restrictOrdering(ord.perm, p.rowOfFullDof));
    for (const kernel of ['js', 'simd'] as const) {
      const one = factorCholesky(a, sym, { kernel });
      const two = factorCholesky(a, sym, { workers, parallelMinFlops: 0, kernel });
      expect(one.threads).toBe(1);
      expect(two.threads).toBe(2);
      expect(Array.from(two.values)).toEqual(Array.from(one.values));
      expect(relativeResidual(a, solveCholesky(two, b), b)).toBeLessThan(1e-12);
    }
  });

  it('triangular solves split over two threads agree with one thread to rounding, for several right-hand sides', () => {
    const p = cantileverProblem(60, 30, 8);
    const a = p.matrix;
    const b = randomVector(3 * a.n, 6);
    const sym = analyzeCholesky(a, restrictOrdering(orderNestedDissection(p.adjacency, p.mesh.coords, 2).perm, p.rowOfFullDof));
    const f = factorCholesky(a, sym, { workers, parallelMinFlops: 0 });
    expect(f.split).not.toBeNull();
    const r1 = { threads: 0 };
    const r2 = { threads: 0 };
    const x1 = solveCholesky(f, b, 3, { report: r1 });
    const x2 = solveCholesky(f, b, 3, { workers, parallelMinValues: 0, report: r2 });
    expect(r1.threads).toBe(1);
    expect(r2.threads).toBe(2);
    expect(relativeMaxDifference(x2, x1)).toBeLessThan(1e-13);
    for (let r = 0; r < 3; r++) {
      const sl = (v: Float64Array): Float64Array => v.subarray(r * a.n, (r + 1) * a.n);
      expect(relativeResidual(a, sl(x2), sl(b))).toBeLessThan(1e-12);
    }
  });

  it('a pivot failure inside the worker subtree is reported with the same column as on one thread', () => {
    // a negative diagonal entry planted in a column of the worker's subtree
    const p = cantileverProblem(40, 20, 2);
    const a = p.matrix;
    const sym = analyzeCholesky(a, restrictOrdering(orderNestedDissection(p.adjacency, p.mesh.coords, 2).perm, p.rowOfFullDof));
    const split = chooseSplit(sym.superStart, sym.superParent, sym.rowPtr);
    expect(split).not.toBeNull();
    const inWorker = sym.superStart[(split!.first + split!.c) >> 1];
    const bad = { ...a, values: a.values.slice() };
    const col = sym.perm[inWorker];
    bad.values[bad.colPtr[col]] = -1; // diagonal entry of that DOF
    const errors: SolverPivotError[] = [];
    for (const second of [undefined, workers]) {
      try {
        factorCholesky(bad, sym, { workers: second, parallelMinFlops: 0 });
      } catch (e) {
        errors.push(e as SolverPivotError);
      }
    }
    expect(errors).toHaveLength(2);
    expect(errors[0]).toBeInstanceOf(SolverPivotError);
    expect(errors[1]).toBeInstanceOf(SolverPivotError);
    expect(errors[1].permutedIndex).toBe(errors[0].permutedIndex);
    expect(errors[0].permutedIndex).toBeGreaterThanOrEqual(sym.superStart[split!.first]);
    expect(errors[0].permutedIndex).toBeLessThan(sym.superStart[split!.c + 1]);
    expect(errors[1].pivot).toBe(errors[0].pivot);
  });
});

describe('pivot guard', () => {
  it('a free-floating plane-stress stiffness (three rigid body modes) throws SolverPivotError', () => {
    const k = planeStressStiffness(jitteredRectangleMesh(8, 4, 2, 1, 5));
    for (const ord of [orderNatural(k.n), orderAmd(adjacencyGraph(k))]) {
      const sym = analyzeCholesky(k, ord);
      for (const factor of [factorCholesky, factorCholeskySimplicial]) {
        let caught: unknown;
        try {
          factor(k, sym);
        } catch (e) {
          caught = e;
        }
        expect(caught).toBeInstanceOf(SolverPivotError);
        const err = caught as SolverPivotError;
        expect(err.originalIndex).toBe(sym.perm[err.permutedIndex]);
        expect(err.pivot).toBeLessThanOrEqual(err.threshold);
      }
    }
  });

  it('the same stiffness with its left edge fixed factorises', () => {
    const a = cantileverProblem(8, 4, 5).matrix;
    expect(() => factorCholesky(a, analyzeCholesky(a, orderAmd(adjacencyGraph(a))))).not.toThrow();
  });

  it('an indefinite diagonal matrix fails at its negative entry whatever the ordering', () => {
    const d = [3, 1, -2, 5, 4];
    const a = assembleSymmetric(5, Int32Array.from([0, 1, 2, 3, 4]), Int32Array.from([0, 1, 2, 3, 4]), Float64Array.from(d), 'full');
    const reversed: Ordering = { perm: Int32Array.from([4, 3, 2, 1, 0]), invPerm: Int32Array.from([4, 3, 2, 1, 0]) };
    for (const ord of [orderNatural(5), reversed]) {
      const sym = analyzeCholesky(a, ord);
      for (const factor of [factorCholesky, factorCholeskySimplicial]) {
        try {
          factor(a, sym);
          expect.unreachable('factorisation of an indefinite matrix succeeded');
        } catch (e) {
          expect(e).toBeInstanceOf(SolverPivotError);
          expect((e as SolverPivotError).originalIndex).toBe(2);
          expect((e as SolverPivotError).pivot).toBe(-2);
        }
      }
    }
  });

  it('an indefinite tridiagonal matrix fails at the first column whose leading minor is not positive', () => {
    // T = tridiag(-1, 2, -1) of order 8 with T(5,5) = 0.5: the pivots are
    // (k+1)/k for k = 1..5, then 0.5 - 5/6 < 0 at column 5 (natural order)
    const n = 8;
    const r: number[] = [];
    const c: number[] = [];
    const v: number[] = [];
    for (let i = 0; i < n; i++) {
      r.push(i);
      c.push(i);
      v.push(i === 5 ? 0.5 : 2);
      if (i + 1 < n) {
        r.push(i + 1);
        c.push(i);
        v.push(-1);
      }
    }
    const a = assembleSymmetric(n, Int32Array.from(r), Int32Array.from(c), Float64Array.from(v), 'triangle');
    const sym = analyzeCholesky(a, orderNatural(n));
    for (const factor of [factorCholesky, factorCholeskySimplicial]) {
      try {
        factor(a, sym);
        expect.unreachable('factorisation of an indefinite matrix succeeded');
      } catch (e) {
        expect(e).toBeInstanceOf(SolverPivotError);
        const err = e as SolverPivotError;
        expect(err.permutedIndex).toBe(5);
        expect(err.originalIndex).toBe(5);
        expect(err.pivot).toBeCloseTo(0.5 - 5 / 6, 14);
      }
    }
  });

  it('a NaN entry is reported as a failed pivot', () => {
    const a = gridLaplacian(4, 4);
    const bad = { ...a, values: a.values.slice() };
    bad.values[bad.colPtr[7]] = NaN; // diagonal of column 7
    const sym = analyzeCholesky(bad, orderNatural(16));
    expect(() => factorCholesky(bad, sym)).toThrow(SolverPivotError);
    expect(() => factorCholeskySimplicial(bad, sym)).toThrow(SolverPivotError);
  });

  it('the default tolerance is relative to the largest diagonal, so scaling the matrix changes nothing', () => {
    expect(DEFAULT_PIVOT_TOLERANCE).toBeGreaterThan(0);
    const a = cantileverProblem(8, 4, 5).matrix;
    const b = randomVector(a.n, 1);
    for (const scale of [1e-9, 1e9]) {
      const s = { ...a, values: a.values.map((x) => x * scale) };
      const { x, stats } = solveSpd(s, b);
      expect(stats.relativeResidual).toBeLessThan(1e-12);
      expect(x.length).toBe(a.n);
    }
  });
});

describe('solveSpd', () => {
  it('uses AMD below 50,000 equations and without coordinates, nested dissection when asked for with coordinates, both solving to 1e-12', () => {
    const p = cantileverProblem(20, 10, 9);
    const b = randomVector(p.matrix.n, 4);
    const geo = { coords: p.mesh.coords, nodeAdjacency: p.adjacency, dofsPerNode: 2, fullDofOfRow: p.fullDofOfRow };
    const withGeo = solveSpd(p.matrix, b, { ...geo, ordering: 'nested-dissection' });
    const without = solveSpd(p.matrix, b);
    expect(withGeo.stats.ordering).toBe('nested-dissection');
    expect(without.stats.ordering).toBe('amd');
    expect(solveSpd(p.matrix, b, geo).stats.ordering).toBe('amd'); // small: AMD fills less
    expect(withGeo.stats.relativeResidual).toBeLessThan(1e-12);
    expect(without.stats.relativeResidual).toBeLessThan(1e-12);
    expect(relativeMaxDifference(withGeo.x, without.x)).toBeLessThan(1e-10);
    const s = withGeo.stats;
    expect(s.n).toBe(p.matrix.n);
    expect(s.nnzL).toBeGreaterThan(s.n);
    expect(s.flops).toBeGreaterThan(s.nnzL);
    for (const t of Object.values(s.seconds)) expect(t).toBeGreaterThanOrEqual(0);
  });

  it('a 1 x 1 system and an empty one are solved', () => {
    const one = assembleSymmetric(1, Int32Array.of(0), Int32Array.of(0), Float64Array.of(4), 'full');
    expect(Array.from(solveSpd(one, Float64Array.of(2)).x)).toEqual([0.5]);
    const none = assembleSymmetric(0, new Int32Array(0), new Int32Array(0), new Float64Array(0), 'full');
    expect(solveSpd(none, new Float64Array(0)).x.length).toBe(0);
  });

  it('a reduced matrix without fullDofOfRow is refused for nested dissection rather than silently misordered', () => {
    const p = cantileverProblem(6, 3, 9);
    expect(() => solveSpd(p.matrix, new Float64Array(p.matrix.n).fill(1), { coords: p.mesh.coords, nodeAdjacency: p.adjacency, ordering: 'nested-dissection' })).toThrow(RangeError);
  });

  it('the nested dissection ordering restricted to free DOFs equals the one solveSpd uses', () => {
    const p = cantileverProblem(10, 4, 2);
    const full = orderNestedDissection(p.adjacency, p.mesh.coords, 2);
    const r = restrictOrdering(full.perm, p.rowOfFullDof);
    expect(r.perm.length).toBe(p.matrix.n);
    for (let k = 0; k < r.perm.length; k++) expect(p.fullDofOfRow[r.perm[k]] % 2 === 0 ? 0 : 1).toBe(k % 2);
  });
});

describe('normwise backward error', () => {
  // eta(x) = ||b - A x||inf / (||A||inf ||x||inf + ||b||inf): Rigal & Gaches (1967); Higham,
  // Accuracy and Stability of Numerical Algorithms (2002), thm. 7.1.
  it('equals the definition evaluated densely, and is at round-off for the direct solve', () => {
    const a = cantileverProblem(12, 6, 2).matrix;
    const A = toDense(a);
    const b = randomVector(a.n, 3);
    const { x } = solveSpd(a, b);
    expect(backwardError(a, x, b)).toBeLessThan(1e-15);
    const y = Float64Array.from(x, (v, i) => v * (1 + 1e-6 * Math.sin(i)));
    const r = Matrix.columnVector(Array.from(b)).sub(A.mmul(Matrix.columnVector(Array.from(y)))).to1DArray();
    let normA = 0;
    for (let i = 0; i < a.n; i++) normA = Math.max(normA, A.getRow(i).reduce((s, v) => s + Math.abs(v), 0));
    const inf = (v: ArrayLike<number>) => Math.max(...Array.from(v, Math.abs));
    const expected = inf(r) / (normA * inf(y) + inf(b));
    expect(Math.abs(backwardError(a, y, b) - expected)).toBeLessThan(1e-9 * expected);
  });
});
