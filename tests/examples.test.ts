/**
 * Every file in examples/ runs through the command line, and what it prints is checked: the
 * summary and the JSON agree, Kt is where the analysis first put it (regression values, to 1%,
 * for these invented scenarios, each with a plausibility bound from a published chart where
 * one is near), the convergence study meets the default 1% target and its band contains the
 * regression value, the peak is on the feature a designer would expect, and the cautions print.
 */
import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ktHoleInStripNet } from '../src/charts/formulas.js';
import { fmt } from '../src/report/summary.js';
import { raiser } from './support/cli.js';

interface Expect {
  /** the governing raiser and its headline Kt */
  governing: RegExp;
  kind: 'net' | 'gross' | 'remote' | 'given';
  /** regression values of every raiser's Kt, to 1% (null: withheld) */
  raisers: { name: RegExp; kt: Partial<Record<'net' | 'gross' | 'remote' | 'bearing', number | null>> }[];
  /** a published value the headline must lie near, with the reason */
  bound?: { value: number; within: number; why: string };
  plasticity: boolean;
  /** singular points the summary must report */
  singular?: RegExp[];
  /** pins in holes: how many, and that the contact was solved */
  pins?: number;
}

const EXPECTED: Record<string, Expect> = {
  'strap-bolt-hole.json': {
    // The net section through the off-centre hole carries the load off its centroid, so its
    // nominal stress has a bending part: N / A_net + M y / I_net = 116.3 + 11.9 MPa at the
    // hole's upper edge. The gross Kt (83.3 MPa nominal) is unchanged by that.
    governing: /bolt hole/, kind: 'net', plasticity: false,
    raisers: [{ name: /bolt hole/, kt: { net: 2.280, gross: 3.509 } }],
    // A centred hole of the same d/W = 17/60 has Ktn = 2.38 (Pilkey chart 4.1 fit); moving it
    // 6 mm off centre narrows one ligament and bends the net section.
    bound: { value: ktHoleInStripNet(17 / 60), within: 0.1, why: 'centred hole, same d/W' },
  },
  'strap-two-cases.json': {
    // The strap of strap-bolt-hole.json under two load cases; "pull" (40 kN) governs with the
    // highest peak, so the top-level fields are that case's: the same Kt as the one-case example
    // (2.280) to within its band and the 1% of these regression values. The "sideways" case is
    // checked in tests/load-cases.test.ts.
    governing: /bolt hole/, kind: 'net', plasticity: false,
    raisers: [{ name: /bolt hole/, kt: { net: 2.278, gross: 3.506 } }],
    bound: { value: ktHoleInStripNet(17 / 60), within: 0.1, why: 'centred hole, same d/W' },
  },
  'stepped-link.json': {
    governing: /lanyard hole/, kind: 'net', plasticity: true,
    raisers: [
      { name: /lanyard hole/, kt: { net: 2.103, gross: 3.506 } },
      // the fillet, 50 -> 32 wide with r = 4: D/d = 1.5625, r/d = 0.125 (Pilkey chart 3.1 fit about 2.1)
      { name: /fillet at corner 4/, kt: { net: 2.175 } },
    ],
  },
  'mounting-plate.json': {
    governing: /adjustment slot/, kind: 'remote', plasticity: false,
    raisers: [
      { name: /adjustment slot/, kt: { net: 4.401, gross: 4.867, remote: 4.089 } },
      { name: /window/, kt: { net: 3.445, gross: 4.533, remote: 3.807 } },
    ],
  },
  'notched-bar-bending.json': {
    governing: /notch/, kind: 'net', plasticity: false,
    raisers: [{ name: /notch/, kt: { net: 2.149, gross: 2.806 } }],
  },
  'link-plate.json': {
    governing: /loaded pin hole/, kind: 'net', plasticity: false,
    raisers: [
      { name: /loaded pin hole/, kt: { net: 3.727, gross: 5.453 } },
      { name: /slot/, kt: { net: 2.074, gross: 2.469 } },
      // held as a rigid ring: its peak sits on an idealised support, so no Kt
      { name: /held pin hole/, kt: { net: null, gross: null } },
    ],
  },
  'bracket.json': {
    // von Mises at the inside corner, on 6 M / (t d^2) across the arm at the fillet's end
    governing: /fillet at corner 3/, kind: 'net', plasticity: true,
    raisers: [{ name: /fillet at corner 3/, kt: { net: 1.977 } }],
  },
  'link-plate-pins.json': {
    // a fixed pin and a pulling pin, both with 0.1 mm clearance: the peak sits on a pin hole
    // beside its contact arc, and no held edge leaves a singular point
    // d = W - d here (36 wide, 18 mm holes), so the net and bearing nominal stresses agree
    governing: /held pin hole/, kind: 'net', plasticity: false, pins: 2,
    raisers: [
      { name: /held pin hole/, kt: { net: 3.963, bearing: 3.963 } },
      { name: /pulled pin hole/, kt: { net: 3.957, bearing: 3.957 } },
      { name: /lightening slot/, kt: { net: 1.656, gross: 2.292 } },
    ],
  },
};

describe('examples', () => {
  const files = readdirSync(new URL('../examples', import.meta.url)).filter((f) => f.endsWith('.json'));

  it('every example has its expectations here, and every expectation its example', () => {
    expect(files.sort()).toEqual(Object.keys(EXPECTED).sort());
  });

  for (const file of files) {
    it(`${file}: solves, and prints the Kt of every raiser the JSON holds`, () => {
      const e = EXPECTED[file];
      const json = raiser(['solve', `examples/${file}`, '--json']);
      expect(json.code).toBe(0);
      const r = JSON.parse(json.stdout);
      expect(r.kt.raiser).toMatch(e.governing);
      expect(r.kt.kind).toBe(e.kind);
      expect(r.convergence.status).toBe('converged');
      expect(r.convergence.estimatedError).toBeLessThanOrEqual(0.01);
      expect(r.kt.band[0]).toBeLessThanOrEqual(r.kt.value);
      expect(r.kt.band[1]).toBeGreaterThanOrEqual(r.kt.value);
      expect(r.convergence.meshes.length).toBeGreaterThanOrEqual(3);
      expect(r.raisers).toHaveLength(e.raisers.length);
      for (const want of e.raisers) {
        const got = r.raisers.find((x: any) => want.name.test(x.name));
        expect(got, String(want.name)).toBeTruthy();
        for (const [kind, value] of Object.entries(want.kt)) {
          if (value === null) expect(got.kt[kind].value).toBeNull();
          else {
            // to 1%, or to its own band where that is wider (a raiser held by a rigid ring converges slowly)
            expect(Math.abs(got.kt[kind].value / value - 1), `${got.name} Kt ${kind}`).toBeLessThan(Math.max(0.01, got.kt[kind].error ?? 0));
            // every band contains its own value and covers the last change of its series
            if (got.kt[kind].band) expect(got.kt[kind].band[0]).toBeLessThanOrEqual(got.kt[kind].value);
          }
        }
      }
      expect(r.safety.localPlasticity ?? false).toBe(e.plasticity);
      if (e.bound) expect(Math.abs(r.kt.value / e.bound.value - 1), e.bound.why).toBeLessThan(e.bound.within);
      expect(r.mesh.minAngleDeg).toBeGreaterThan(25 - 1e-6);
      expect(r.load.equilibriumError).toBeLessThan(1e-9);
      expect(r.peak.atSharpCorner).toBe(false);
      if (e.pins) {
        expect(r.pins.items).toHaveLength(e.pins);
        for (const p of r.pins.items) expect(p.contact.arcs.length).toBe(1);
        expect(r.pins.contactIterations).toBeGreaterThanOrEqual(1);
      } else expect(r.pins).toBeNull();

      const text = raiser(['solve', `examples/${file}`]);
      expect(text.code).toBe(0);
      expect(text.stdout).toContain(`Kt ${r.kt.kind} ${fmt(r.kt.value, 4)}`);
      for (const x of r.raisers) {
        expect(text.stdout).toContain(x.name);
        for (const [kind, k] of Object.entries(x.kt) as [string, any][]) {
          if (k.value !== null) expect(text.stdout).toContain(`${`Kt ${kind}`.padEnd(10)} ${fmt(k.value, 4)}`);
        }
      }
      for (const sp of e.singular ?? []) expect(text.stdout).toMatch(sp);
      expect(text.stdout).toContain(`${fmt(r.peak.stress)} ${r.units.stress}`);
      expect(text.stdout).toContain('qualified engineer');
      if (e.plasticity) expect(text.stdout).toContain('LOCAL PLASTICITY EXPECTED');
      if (e.pins) expect(text.stdout).toContain(`contact found in ${r.pins.contactIterations} active-set iteration`);
    });
  }

  it('every example says it is an invented scenario', async () => {
    const { readFileSync } = await import('node:fs');
    for (const f of files) expect(JSON.parse(readFileSync(new URL(`../examples/${f}`, import.meta.url), 'utf8')).note).toMatch(/^Invented example scenario/);
  });
});
