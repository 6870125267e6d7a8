/**
 * Property-based tests (fast-check): random plates with random holes, slots, ellipses, rounded
 * rectangles and corner fillets, at random sizes, positions, rotations and scales from 1e-3 to
 * 1e4.
 *  - Every valid plate meshes with the quality guarantee (smallest angle >= 25 degrees away from
 *    sharp input corners) and passes the mesh checker (run inside generateMesh), within a vertex
 *    budget (a refinement that would not end is an error, never a hang).
 *  - Every valid plate analyses to finite stresses with Kt >= 1 (the peak of the largest
 *    principal stress is at least the mean normal stress on the net section, F / A).
 *  - Every broken plate and every random JSON value gives a clear error (ModelError or
 *    AnalysisError), never another exception.
 * fast-check prints the seed and the shrunk counterexample of a failure.
 * The run counts are sized for CI; RAISER_FUZZ=10 multiplies them by ten for a long search.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildDomain } from '../src/geometry/domain.js';
import { validateDomain } from '../src/geometry/validate.js';
import { generateMesh } from '../src/mesh/generate.js';
import { AnalysisError, ModelError } from '../src/model/errors.js';
import { loadModelText } from '../src/model/load.js';
import { analyseOnMesh, prepareModel } from '../src/pipeline/analyse.js';
import { plate, toModel } from './support/random-plate.js';
import { ktOf } from './support/kt.js';
import { KT_LIMIT } from '../src/post/kt.js';

const FACTOR = Math.max(1, Number(process.env.RAISER_FUZZ ?? 1) || 1);
const runs = (n: number) => Math.round(n * FACTOR);

const clearError = (e: unknown) => e instanceof ModelError || e instanceof AnalysisError;

describe('random valid plates', () => {
  // Twice the default element size: the quality and checker properties do not depend on it,
  // and a thousand plates then mesh in well under a minute.
  it(`mesh with the quality guarantee and pass the mesh checker (${runs(1000)} plates)`, () => {
    fc.assert(
      fc.property(plate, fc.boolean(), (p, quadratic) => {
        const model = toModel(p);
        const domain = buildDomain(model.geometry);
        validateDomain(domain);
        const { stats } = generateMesh(domain, { order: quadratic ? 2 : 1, sizeFactor: 2, maxVertices: 400_000 });
        expect(stats.minAngleUnforcedDeg).toBeGreaterThan(25 - 1e-6);
        expect(stats.refine.rejected).toBe(0);
      }),
      // a synchronous property cannot be stopped by the test timeout: the runs, and the shrinking of a
      // failure (thousands of meshes), stop at the time limit and report what they have
      { numRuns: runs(1000), interruptAfterTimeLimit: 180_000 * FACTOR, markInterruptAsFailure: true },
    );
  }, 240_000 * FACTOR);

  it(`analyse to finite stresses; every printed Kt is of the peak's sign, within the limit, and below 1 only with a warning (${runs(60)} plates)`, () => {
    fc.assert(
      fc.property(plate, (p) => {
        const a = analyseOnMesh(prepareModel(toModel(p), { maxMemoryBytes: 4 * 2 ** 30 }));
        for (const v of a.stress) expect(Number.isFinite(v)).toBe(true);
        for (const ev of a.evaluation.raisers) {
          for (const k of ev.kt) {
            if (k.value === null) {
              expect(k.withheld).toBeTruthy();
              continue;
            }
            expect(Number.isFinite(k.value)).toBe(true);
            // Of the peak's sign: the nominal stress has the sign of the peak.
            expect(Math.sign(k.nominal)).toBe(Math.sign(ev.peak.stress));
            expect(k.value).toBeLessThanOrEqual(KT_LIMIT);
            if (k.value < 1) expect(ev.warnings.some((w) => w.includes(`Kt ${k.kind}`) && w.includes('below 1'))).toBe(true);
          }
        }
        // The plates are tension strips: a governing hole has a net Kt of at least 1; a plate
        // without raisers has none.
        const net = ktOf(a).net;
        if (a.raisers.length === 0) expect(ktOf(a).value).toBeNull();
        else if (net !== null) expect(net).toBeGreaterThanOrEqual(0.99);
      }),
      { numRuns: runs(60), interruptAfterTimeLimit: 180_000 * FACTOR, markInterruptAsFailure: true },
    );
  }, 240_000 * FACTOR);
});

describe('random invalid input', () => {
  const breakers: ((m: any) => void)[] = [
    (m) => (m.geometry.holes = [{ shape: 'circle', center: m.geometry.outline.path[0].at, diameter: m.thickness * 10 }]), // a hole on the corner
    (m) => (m.material.nu = 0.5),
    (m) => (m.thickness = -m.thickness),
    (m) => (m.geometry.outline.path[1].round = 1e9),
    (m) => (m.geometry.outline.path[2].at = m.geometry.outline.path[1].at),
    (m) => (m.supports = [{ type: 'roller', fix: 'x', on: 'bottom' }]),
    (m) => (m.loads[0].on = 'nowhere'),
    (m) => (m.geometry.holes = [{ shape: 'slot', center: [0, 0], length: 1, width: 2 }]),
    (m) => (m.mesh = { size: 1e-12 }),
    (m) => (m.geometry.outline.path = m.geometry.outline.path.slice(0, 2)),
  ];

  it('a broken plate always gives a clear error, never a crash (300 cases)', () => {
    fc.assert(
      fc.property(plate, fc.integer({ min: 0, max: breakers.length - 1 }), (p, k) => {
        const m: any = toModel(p);
        breakers[k](m);
        let err: unknown = null;
        try {
          const { model } = loadModelText(JSON.stringify(m), 'broken.json');
          analyseOnMesh(prepareModel(model, { maxMemoryBytes: 4 * 2 ** 30 }));
        } catch (e) {
          err = e;
        }
        expect(err, `breaker ${k} raised nothing`).not.toBeNull();
        expect(clearError(err), String((err as Error)?.stack)).toBe(true);
      }),
      { numRuns: runs(300) },
    );
  }, 240_000 * FACTOR);

  it('any JSON value is either a model or a clear error (2000 values)', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (v) => {
        try {
          loadModelText(JSON.stringify(v), 'random.json');
        } catch (e) {
          expect(clearError(e), String((e as Error)?.stack)).toBe(true);
        }
      }),
      { numRuns: runs(2000) },
    );
  }, 240_000 * FACTOR);
});
