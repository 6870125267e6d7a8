/**
 * Bundled material grades (src/model/materials.ts): each grade's values against its standard,
 * grade lookup, thickness bands, overrides, and the notch sensitivity of aluminium grades.
 *
 * Provenance beside each check: [V] read in the stored public copy named in the table's
 * `checkedIn`; [M] recalled from the standard, not checked against a copy.
 */
import { describe, expect, it } from 'vitest';
import { findGrade, lookupGrade, MATERIAL_GRADES, type ProductForm } from '../src/model/materials.js';
import { loadModelText, parseModelText } from '../src/model/load.js';
import { ModelError } from '../src/model/errors.js';
import { resolveUnits } from '../src/model/units.js';
import { estimateFatigue } from '../src/post/design.js';

/** [grade, form, thickness mm, yield MPa, Rm min MPa, Rm max MPa or undefined, source]. */
const STANDARD_VALUES: [string, ProductForm, number, number, number, number | undefined, string][] = [
  // EN 10025-2:2004 Table 7 [V]: ReH by band <=16, 16-40, 40-63, 63-80, 80-100, 100-150, ...; Rm <3, 3-100, 100-150, 150-250.
  ['S235JR', 'plate', 2, 235, 360, 510, 'EN 10025-2 Table 7 [V]'],
  ['S235JR', 'plate', 20, 225, 360, 510, 'EN 10025-2 Table 7 [V]'],
  ['S235JR', 'plate', 120, 195, 350, 500, 'EN 10025-2 Table 7 [V]'],
  ['S275JR', 'plate', 10, 275, 410, 560, 'EN 10025-2 Table 7 [V]'],
  ['S275JR', 'section', 70, 245, 410, 560, 'EN 10025-2 Table 7 [V]'],
  ['S355JR', 'plate', 2.5, 355, 510, 680, 'EN 10025-2 Table 7 [V]'],
  ['S355JR', 'plate', 16, 355, 470, 630, 'EN 10025-2 Table 7 [V]'],
  ['S355JR', 'plate', 16.5, 345, 470, 630, 'EN 10025-2 Table 7 [V]'],
  ['S355JR', 'plate', 50, 335, 470, 630, 'EN 10025-2 Table 7 [V]'],
  ['S355JR', 'plate', 90, 315, 470, 630, 'EN 10025-2 Table 7 [V]'],
  ['S355JR', 'plate', 180, 285, 450, 600, 'EN 10025-2 Table 7 [V]'],
  ['S355J2', 'plate', 300, 265, 450, 600, 'EN 10025-2 Table 7, flat products 250-400 mm [V]'],
  // ASTM A36 plates [V]: yield 250 MPa (220 over 200 mm), tensile 400-550 MPa.
  ['A36', 'plate', 25, 250, 400, 550, 'ASTM A36 [V]'],
  ['A36', 'plate', 210, 220, 400, 550, 'ASTM A36, footnote A [V]'],
  // ASTM A572-04 Grade 50 [V]: yield 345, tensile 450 MPa.
  ['A572 Gr 50', 'plate', 20, 345, 450, undefined, 'ASTM A572 Grade 50 [V]'],
  // EN 10088-2 annealed [M].
  ['304', 'plate', 10, 210, 520, 720, 'EN 10088-2 1.4301 hot-rolled plate [M]'],
  ['316L', 'sheet', 2, 240, 530, 680, 'EN 10088-2 1.4404 cold-rolled strip [M]'],
  // EN 485-2 6082 T6/T651 [V] (two stored copies; Rm 300 taken for 6-12.5 mm where they differ).
  ['6082-T6', 'sheet', 2, 260, 310, undefined, 'EN 485-2 [V]'],
  ['6082-T6', 'plate', 10, 255, 300, undefined, 'EN 485-2 [V]'],
  ['6082-T6', 'plate', 40, 240, 295, undefined, 'EN 485-2 [V]'],
  ['6082-T6', 'extrusion', 4, 250, 290, undefined, 'EN 755-2 open profiles [M]'],
  ['6082-T6', 'extrusion', 10, 260, 310, undefined, 'EN 755-2 open profiles [M]'],
  ['6061-T6', 'plate', 10, 240, 290, undefined, 'EN 485-2 [M]'],
  ['6061-T6', 'extrusion', 10, 241, 262, undefined, 'ASTM B221 35 / 38 ksi [V], converted'],
  ['5083-O', 'plate', 10, 125, 275, 350, 'EN 485-2 5083 O/H111 [M]'],
  ['7075-T6', 'plate', 5, 460, 540, undefined, 'EN 485-2 7075 T6 [M]'],
  ['2024-T3', 'sheet', 1, 290, 440, undefined, 'ASTM B209M 2024-T3 [M]'],
];

describe('each bundled grade against its standard', () => {
  for (const [name, form, t, y, rm, rmMax, source] of STANDARD_VALUES) {
    it(`${name} ${form} ${t} mm: yield ${y}, Rm ${rm}${rmMax ? `-${rmMax}` : ''} MPa (${source})`, () => {
      const g = findGrade(name)!;
      expect(g).toBeDefined();
      const b = lookupGrade(g, form, t);
      expect(b.yield).toBe(y);
      expect(b.ultimate).toBe(rm);
      expect(b.ultimateMax).toBe(rmMax ?? null);
      expect(b.standard).toBeTruthy();
    });
  }

  it('every grade is tested above, and every table says its provenance; [V] tables say where they were read', () => {
    const tested = new Set(STANDARD_VALUES.map(([n]) => findGrade(n)!.names[0]));
    for (const g of MATERIAL_GRADES) {
      expect(tested.has(g.names[0])).toBe(true);
      for (const t of g.tables) {
        expect(['V', 'M']).toContain(t.provenance);
        if (t.provenance === 'V') expect(t.checkedIn).toBeTruthy();
        for (const b of t.bands) expect(b.upTo).toBeGreaterThan(b.over);
      }
    }
  });

  it('E and nu: 210 GPa and 0.3 for steels (EN 1993-1-1 3.2.6), 70 GPa and 0.3 for aluminium (EN 1999-1-1 3.2.5) [M]', () => {
    expect(findGrade('S355JR')!.E).toBe(210000);
    expect(findGrade('6082-T6')!.E).toBe(70000);
    for (const g of MATERIAL_GRADES) expect(g.nu).toBe(0.3);
  });
});

/** A small plate model with the given material and thickness (an invented case). */
function plate(material: object, thickness = 10, units?: object): string {
  return JSON.stringify({
    units,
    material,
    thickness,
    geometry: { outline: { shape: 'path', path: [[0, 0], [100, 0], [100, 40], [0, 40]] }, holes: [{ shape: 'circle', center: [50, 20], radius: 5 }] },
    supports: [{ type: 'fixed', on: { x: 0 } }],
    loads: [{ type: 'traction', on: { x: 100 }, normal: 100 }],
  });
}

describe('grade selection in a model', () => {
  it('a grade fills E, nu, yield and ultimate; case, spaces and hyphens do not matter', () => {
    const m = parseModelText(plate({ grade: 's355 jr' }, 20));
    expect(m.material.E).toBe(210000);
    expect(m.material.nu).toBe(0.3);
    expect(m.material.yield).toBe(345); // 16 < t <= 40 mm, EN 10025-2 Table 7 [V]
    expect(m.material.ultimate).toBe(470);
    expect(m.material.basis!.band).toEqual({ over: 16, upTo: 40 });
    expect(m.material.basis!.form).toBe('plate');
    expect(m.material.basis!.formGiven).toBe(false);
    expect(parseModelText(plate({ grade: 'EN AW 6082 T6' })).material.yield).toBe(255);
  });

  it('the form picks the table: 6082-T6 at 4 mm is 260 MPa as plate (EN 485-2) and 250 MPa as extrusion (EN 755-2 [M])', () => {
    expect(parseModelText(plate({ grade: '6082-T6', form: 'plate' }, 4)).material.yield).toBe(260);
    const ex = parseModelText(plate({ grade: '6082-T6', form: 'extrusion' }, 4)).material;
    expect(ex.yield).toBe(250);
    expect(ex.basis!.standard).toContain('EN 755-2');
  });

  it('the thickness is converted to mm: 0.75 in of S355JR is 19.05 mm, band 16-40', () => {
    const m = parseModelText(plate({ grade: 'S355JR' }, 0.75, { length: 'in', force: 'lbf' }));
    expect(m.material.basis!.thicknessMm).toBeCloseTo(19.05, 9);
    expect(m.material.nu).toBe(0.3);
    // 345 MPa in psi: 345e6 / (4.4482216152605 / 0.0254^2) = 50038 psi.
    expect(m.material.yield! / (345e6 / (4.4482216152605 / 0.0254 ** 2))).toBeCloseTo(1, 12);
  });

  it('fields given in the model override the table', () => {
    const m = parseModelText(plate({ grade: 'S355JR', yield: 400, E: 205000 }));
    expect(m.material.yield).toBe(400);
    expect(m.material.E).toBe(205000);
    expect(m.material.ultimate).toBe(470);
  });

  it('an unknown grade is an error at material.grade naming the close ones', () => {
    try {
      parseModelText(plate({ grade: 'S356JR' }));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ModelError);
      expect((e as ModelError).path).toBe('material.grade');
      expect((e as ModelError).message).toContain('S356JR');
      expect((e as ModelError).hint).toContain('S355JR');
    }
  });

  it('a thickness outside the bands warns and leaves yield and ultimate unset', () => {
    const loaded = loadModelText(plate({ grade: 'S355JR' }, 300));
    expect(loaded.model.material.yield).toBeUndefined();
    expect(loaded.model.material.ultimate).toBeUndefined();
    expect(loaded.model.material.E).toBe(210000);
    expect(loaded.warnings.some((w) => w.path === 'material.grade' && /outside the bands/.test(w.message))).toBe(true);
  });

  it('a material with neither E nor a grade is an error', () => {
    expect(() => parseModelText(plate({ nu: 0.3 }))).toThrow(/Young's modulus/);
  });
});

describe('notch sensitivity of aluminium grades (Peterson\'s a for aluminium alloys)', () => {
  it('a 6082-T6 plate with a hole of radius 5 mm, Kt 2.5: q and Kf from a = 0.51 mm', () => {
    // Peterson (1959) [M], REFERENCES.md section 8: a = 0.51 mm (0.020 in) for aluminium alloys.
    // By hand: q = 1 / (1 + a / r) = 1 / (1 + 0.51 / 5) = 1 / 1.102 = 0.907441;
    //          Kf = 1 + q (Kt - 1) = 1 + 0.907441 * 1.5 = 2.361162.
    const m = parseModelText(plate({ grade: '6082-T6' }));
    const f = estimateFatigue(2.5, 5, m.material, resolveUnits(m.units))!;
    expect(f.withheld).toBeNull();
    expect(f.methods).toHaveLength(1);
    expect(f.methods[0].q).toBeCloseTo(0.907441, 6);
    expect(f.methods[0].kf).toBeCloseTo(2.361162, 6);
    expect(f.methods[0].source).toContain('0.51 mm');
  });

  it('without a grade, constants or an ultimate strength in the steel fits\' range, the estimate says why q is withheld', () => {
    const m = parseModelText(plate({ E: 70000, nu: 0.33, ultimate: 310 }));
    const f = estimateFatigue(2.5, 5, m.material, resolveUnits(m.units))!;
    expect(f.methods).toHaveLength(0);
    expect(f.withheld).toMatch(/no notch sensitivity q/);
    const none = estimateFatigue(2.5, 5, parseModelText(plate({ E: 70000, nu: 0.33 })).material, resolveUnits(undefined))!;
    expect(none.withheld).toMatch(/no ultimate strength/);
  });

  it('steel grades keep the steel fits: S355JR (Rm 470 MPa) gives Neuber\'s q from the SI fit', () => {
    // Shigley 9th ed. Eq. 6-35a, SI form (REFERENCES.md section 8): sqrt(a) = 1.24 - 2.25e-3 S + 1.60e-6 S^2 - 4.11e-10 S^3
    // at S = 470: 1.24 - 1.0575 + 0.35344 - 0.042672 = 0.493269 sqrt(mm); q at r = 5: 1 / (1 + 0.493269 / 2.236068) = 1 / 1.220596 = 0.819272.
    const m = parseModelText(plate({ grade: 'S355JR' }));
    const f = estimateFatigue(2.5, 5, m.material, resolveUnits(m.units))!;
    expect(f.methods[0].name).toContain('Neuber');
    expect(f.methods[0].q).toBeCloseTo(0.819272, 5);
  });
});
