/**
 * The whole analysis (model file -> mesh -> solve -> recovery -> net section -> Kt) against
 * published stress concentration factors, on the reference models in meshes/ (each names its
 * source in its note). Default mesh settings, 6-node elements. Tolerances from
 * docs/REFERENCES.md ("What is weakest"): 2% for the hole in a strip and the ellipse, 5%
 * for shoulder fillets, 8% for U-notches, about the spread between independent fits.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ktHoleInStripGross, ktHoleInStripNet, ktInglis, ktOppositeUNotchesTension, ktSteppedBarBending, ktSteppedBarTension } from '../src/charts/formulas.js';
import { parseModelText } from '../src/model/load.js';
import { expandTemplate } from '../src/model/templates.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { governing, ktOf } from './support/kt.js';

function load(name: string) {
  return parseModelText(readFileSync(new URL(`../meshes/${name}`, import.meta.url), 'utf8'), name);
}

describe('finite-width plate with a central hole against the Peterson-Pilkey chart 4.1 fit (Howland 1930)', () => {
  for (const tag of ['0p1', '0p2', '0p3', '0p4', '0p5']) {
    it(`d/W = ${tag.replace('p', '.')}: Kt net and gross within 2%`, () => {
      const model = load(`hole-dW-${tag}.json`);
      const { W, d } = model.chart!.dims;
      const a = analyseModel(model);
      expect(governing(a).section!.length).toBeCloseTo((W - d) / 2, 6);
      expect(Math.abs(ktOf(a).net! / ktHoleInStripNet(d / W) - 1)).toBeLessThan(0.02);
      expect(Math.abs(ktOf(a).gross! / ktHoleInStripGross(d / W) - 1)).toBeLessThan(0.02);
      expect(a.peak.feature).toContain('hole');
    });
  }

  it('a small hole (d/W = 0.05) in a wide plate gives the Kirsch value 3 (fit: 3.011) within 2%', () => {
    const model = load('kirsch-wide-plate.json');
    const { W, d } = model.chart!.dims;
    const a = analyseModel(model);
    expect(ktHoleInStripGross(d / W)).toBeCloseTo(3.011, 2);
    expect(Math.abs(ktOf(a).gross! / 3 - 1)).toBeLessThan(0.02);
  });
});

describe('elliptical hole a/b = 2 in a wide plate against Inglis (1913)', () => {
  it('Kt gross = 1 + 2a/b = 5 within 2%, at the end of the axis across the load', () => {
    const model = load('ellipse-a2b-wide-plate.json');
    const { a: sa, b: sb } = model.chart!.dims;
    const a = analyseModel(model);
    expect(Math.abs(ktOf(a).gross! / ktInglis(sa, sb) - 1)).toBeLessThan(0.02);
    expect(Math.abs(a.peak.x)).toBeLessThan(0.05 * sb);
    expect(Math.abs(Math.abs(a.peak.y) - sa)).toBeLessThan(0.02 * sa);
  });
});

describe('stepped bar with shoulder fillets in tension against the Peterson-Pilkey chart 3.1 fit', () => {
  for (const name of ['stepped-bar-Dd-1p5-rd-0p1.json', 'stepped-bar-Dd-2-rd-0p1.json', 'stepped-bar-Dd-2-rd-0p2.json']) {
    it(`${name}: Kt within 5%, peak on the fillet`, () => {
      const model = load(name);
      const { D, d, r } = model.chart!.dims;
      const a = analyseModel(model);
      expect(governing(a).section!.length).toBeCloseTo(d / 2, 6);
      expect(Math.abs(ktOf(a).net! / ktSteppedBarTension(D, d, r) - 1)).toBeLessThan(0.05);
      expect(a.peak.feature).toContain('fillet');
    });
  }
});

describe('stepped bar with shoulder fillets in in-plane bending against the Peterson-Pilkey chart 3.4 fit (coefficients recalled)', () => {
  for (const [D, d, r] of [[40, 20, 2], [30, 20, 2]]) {
    it(`D/d = ${D / d}, r/d = ${r / d}: Kt on 6M/(t d^2) within 5%, peak on a fillet`, () => {
      const a = analyseModel(expandTemplate('stepped-bar', { D, d, r, loading: 'bending' }));
      expect(Math.abs(governing(a).loads!.N)).toBeLessThan(1e-9 * Math.abs(governing(a).loads!.M));
      expect(Math.abs(ktOf(a).net! / ktSteppedBarBending(D, d, r) - 1)).toBeLessThan(0.05);
      expect(a.peak.feature).toContain('fillet');
    });
  }
});

describe('U-notches in tension', () => {
  it('a semicircular edge notch in a wide bar gives Ling\'s semi-infinite plate value 3.065 within 2%', () => {
    // C.-B. Ling, "On the stresses in a notched plate under tension", J. Math. Phys. 26 (1948)
    // 284-289: Kt = 3.065 on the gross stress [M: value recalled, not checked against the paper].
    // Notch depth t = r = 5 in a bar 400 wide: t/H = 0.0125, close to the semi-infinite plate.
    const model = expandTemplate('u-notched-bar', { H: 400, t: 5, r: 5 });
    const a = analyseModel(model);
    expect(Math.abs(ktOf(a).gross! / 3.065 - 1)).toBeLessThan(0.02);
    expect(a.peak.feature).toContain('notch');
  });

  it('opposite U-notches, t/r = 4, 2t/H = 0.4: Kt net lies 0-15% above the Peterson-Pilkey chart 2.4 fit', () => {
    // The fit (REFERENCES.md section 5, M+) agrees with Neuber's combination rule, whose
    // shallow-notch term 1 + 2 sqrt(t/r) leaves out the free-edge magnification of an edge notch;
    // the converged result here (3.24 on meshes four times finer) is about 10% higher, and the
    // same analysis reproduces Ling's edge-notch value above. The check pins that deviation.
    const model = load('u-notches-opposite-tr-4.json');
    const { H, t, r } = model.chart!.dims;
    const a = analyseModel(model);
    expect(governing(a).section!.length).toBeCloseTo((H - 2 * t) / 2, 6);
    const ratio = ktOf(a).net! / ktOppositeUNotchesTension(H, t, r);
    expect(ratio).toBeGreaterThan(1);
    expect(ratio).toBeLessThan(1.15);
  });
});
