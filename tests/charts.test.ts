/**
 * Chart formulas against the check values they come from (docs/REFERENCES.md). The
 * coefficients are recalled [M]; these tests pin the code to the tabulated evaluations so a
 * typing error in a coefficient cannot pass.
 */
import { describe, expect, it } from 'vitest';
import {
  ktHoleInStripGross,
  ktHoleInStripHeywood,
  ktHoleInStripNet,
  ktInglis,
  ktNeuberDeepTension,
  ktNeuberOppositeNotchesTension,
  ktOppositeSemicircularNotchesTension,
  ktOppositeUNotchesTension,
  ktSteppedBarBending,
  ktSteppedBarTension,
} from '../src/charts/formulas.js';

describe('chart formulas reproduce their published evaluations', () => {
  it('hole in a strip: Pilkey chart 4.1 fit and Heywood at d/W = 0 ... 0.5 (REFERENCES.md section 3)', () => {
    const table: [number, number, number, number][] = [
      // d/W, fit Ktn, fit Ktg, Heywood Ktn
      [0.0, 3.004, 3.004, 3.0],
      [0.1, 2.732, 3.035, 2.729],
      [0.2, 2.519, 3.149, 2.512],
      [0.3, 2.358, 3.368, 2.343],
      [0.4, 2.24, 3.733, 2.216],
      [0.5, 2.157, 4.314, 2.125],
    ];
    for (const [dw, ktn, ktg, hey] of table) {
      expect(ktHoleInStripNet(dw)).toBeCloseTo(ktn, 3);
      expect(ktHoleInStripGross(dw)).toBeCloseTo(ktg, 2);
      expect(ktHoleInStripHeywood(dw)).toBeCloseTo(hey, 3);
    }
  });

  it('Inglis: Kt = 1 + 2a/b gives 5 for a/b = 2 and 3 for a circle (REFERENCES.md section 2)', () => {
    expect(ktInglis(2, 1)).toBe(5);
    expect(ktInglis(1, 1)).toBe(3);
  });

  it('stepped bar in tension: Pilkey chart 3.1 fit at the tabulated (D/d, r/d) points (REFERENCES.md section 4)', () => {
    const table: [number, number, number][] = [
      [1.5, 0.05, 2.769], [1.5, 0.1, 2.227], [1.5, 0.2, 1.838], [1.5, 0.4, 1.581],
      [2, 0.05, 3.189], [2, 0.1, 2.516], [2, 0.2, 1.992], [2, 0.4, 1.652],
      [3, 0.05, 3.433], [3, 0.1, 2.731], [3, 0.2, 2.152], [3, 0.4, 1.703],
    ];
    for (const [Dd, rd, kt] of table) expect(ktSteppedBarTension(Dd * 20, 20, rd * 20)).toBeCloseTo(kt, 2);
  });

  it('stepped bar in bending: the chart 3.4 fit tends to 1 as the step vanishes and is below the tension fit', () => {
    // No tabulated evaluation of the bending fit is at hand (coefficients recalled); these are
    // properties any correct fit has: Kt -> C1(t/r -> 0) = 1.006 for D = d, and bending
    // concentrates less than tension at the same shoulder (chart readings, common practice).
    expect(ktSteppedBarBending(20.0001, 20, 2)).toBeCloseTo(1.006, 2);
    for (const [D, r] of [[30, 2], [40, 2], [40, 4], [60, 4]]) expect(ktSteppedBarBending(D, 20, r)).toBeLessThan(ktSteppedBarTension(D, 20, r));
  });

  it('Neuber deep-notch factor in tension at a/r = 1, 4, 9, 25, 100 (REFERENCES.md section 5)', () => {
    const table: [number, number][] = [[1, 1.556], [4, 2.654], [9, 3.873], [25, 6.387], [100, 12.738]];
    for (const [ar, kd] of table) expect(ktNeuberDeepTension(ar)).toBeCloseTo(kd, 3);
  });

  it('opposite U-notches: the Pilkey chart 2.4 fit agrees with Neuber combination within about 1% (REFERENCES.md section 5, M+)', () => {
    for (const [H, t, r] of [[60, 10, 2.5], [60, 10, 5], [50, 5, 2.5], [40, 10, 1]]) {
      const p = ktOppositeUNotchesTension(H, t, r);
      const n = ktNeuberOppositeNotchesTension(H, t, r);
      expect(Math.abs(p / n - 1)).toBeLessThan(0.01);
    }
  });

  it('opposite semicircular notches (chart 2.3, recalled): Ling\'s 3.065 for a shallow notch, about 1 when the notches meet, falling in between', () => {
    expect(ktOppositeSemicircularNotchesTension(1e6, 1)).toBeCloseTo(3.065, 4);
    expect(ktOppositeSemicircularNotchesTension(2, 1)).toBeCloseTo(1.007, 10);
    let prev = Infinity;
    for (let x = 0; x <= 1.0001; x += 0.05) {
      const k = ktOppositeSemicircularNotchesTension(2, x);
      expect(k).toBeLessThan(prev);
      prev = k;
    }
  });
});
