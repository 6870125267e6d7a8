/**
 * The nominal section. For a plate with a central hole the least-material cut across the load
 * passes through the hole centre and has W - d of material; the force through any cut between
 * the loaded end and the supports is the applied force (equilibrium); a cut given by the user
 * along the same line gives the same section, and one across part of the plate only the material
 * it crosses. Net and gross Kt then differ by exactly W / (W - d) (REFERENCES.md "General facts").
 */
import { describe, expect, it } from 'vitest';
import { expandTemplate } from '../src/model/templates.js';
import { analyseModel } from '../src/pipeline/analyse.js';

describe('nominal section', () => {
  const W = 60;
  const d = 18;
  const model = expandTemplate('plate-with-hole', { W, d });
  const auto = analyseModel(model);

  it('the automatic net section is the cut through the hole centre, W - d wide, carrying the load', () => {
    expect(auto.net.section.length).toBeCloseTo((W - d) / 2, 6);
    expect(Math.abs(auto.net.section.from[0])).toBeLessThan(1e-6 * W);
    expect(auto.net.section.force).toBeCloseTo(100 * (W / 2) * model.thickness, 6);
    expect(auto.gross.section.length).toBeCloseTo(W / 2, 6);
    expect(auto.kt.gross / auto.kt.net).toBeCloseTo(W / (W - d), 9);
  });

  it('a user-given cut on the same line gives the same nominal stress; a partial cut only its material', () => {
    const m = structuredClone(model);
    m.results = { section: { from: [0, 0], to: [0, W / 2] } };
    const a = analyseModel(m);
    expect(a.net.stress).toBeCloseTo(auto.net.stress, 6);
    const part = structuredClone(model);
    part.results = { section: { from: [10, 0], to: [10, W / 4] } };
    const b = analyseModel(part);
    expect(b.net.section.length).toBeCloseTo(W / 4, 6);
  });
});
