/**
 * Invariances of Kt (dimensionless, so independent of size, units, orientation and, for a
 * plane-stress plate loaded by tractions with traction-free holes, of the elastic constants:
 * J. H. Michell, Proc. London Math. Soc. 31 (1899) 100-124 [M], REFERENCES.md "General facts").
 * A change of E leaves the discrete problem the same, so Kt agrees to round-off. A change of size
 * does too, except that boundary points on a circle are exactly cocircular, so some Delaunay
 * tie-breaks depend on the last bit of the scaled coordinates and a few elements may differ;
 * the peak, taken between nodes along the boundary, then moves with them: Kt agrees to 1e-3,
 * far inside its error band. Mirror images and quarter turns give a different (but equally good)
 * mesh, so they agree within the mesh's own scatter (1%); nu changes the discrete solution
 * slightly (0.5%).
 */
import { describe, expect, it } from 'vitest';
import { expandTemplate } from '../src/model/templates.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { transformModel } from './support/transform.js';
import { ktOf } from './support/kt.js';

const base = expandTemplate('plate-with-hole', { W: 50, d: 15 });
const ref = analyseModel(base);

describe('Kt invariance (plate with a hole, d/W = 0.3)', () => {
  for (const scale of [1e-6, 1e6]) {
    it(`the model scaled by ${scale} gives the same Kt to 1e-3`, () => {
      const a = analyseModel(transformModel(base, { scale }));
      expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(1e-3);
      expect(Math.abs(ktOf(a).gross! / ktOf(ref).gross! - 1)).toBeLessThan(1e-3);
    });
  }

  it('another E gives the same Kt to round-off', () => {
    const m = structuredClone(base);
    m.material.E = 70000;
    const a = analyseModel(m);
    expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(1e-9);
  });

  it('nu from 0.05 to 0.45 changes Kt by less than 0.5% (plane stress)', () => {
    for (const nu of [0.05, 0.45]) {
      const m = structuredClone(base);
      m.material.nu = nu;
      const a = analyseModel(m);
      expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(0.005);
    }
  });

  it('the mirror image gives the same Kt within 1%, and the peak at the mirrored place', () => {
    const a = analyseModel(transformModel(base, { mirrorX: true }));
    expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(0.01);
    // The mirrored place, within 1% of the hole radius (the peak lies between nodes).
    expect(Math.abs(a.peak.x + ref.peak.x)).toBeLessThan(0.01 * 7.5);
    expect(Math.abs(a.peak.y - ref.peak.y)).toBeLessThan(0.01 * 7.5);
  });

  for (const quarterTurns of [1, 2, 3]) {
    it(`a rotation by ${90 * quarterTurns} degrees gives the same Kt within 1%`, () => {
      const a = analyseModel(transformModel(base, { quarterTurns }));
      expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(0.01);
      expect(Math.abs(ktOf(a).gross! / ktOf(ref).gross! - 1)).toBeLessThan(0.01);
    });
  }

  it('the same plate in metres and newtons gives the same Kt and the stress in Pa', () => {
    const m = transformModel(base, { scale: 1e-3 });
    m.units = { length: 'm', force: 'N' };
    m.material.E *= 1e6;
    for (const l of m.loads!) if (l.type === 'traction' && l.normal) l.normal *= 1e6;
    const a = analyseModel(m);
    expect(a.units.stress).toBe('Pa');
    expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(1e-3);
    expect(Math.abs(a.peak.stress / (ref.peak.stress * 1e6) - 1)).toBeLessThan(1e-3);
  });
});
