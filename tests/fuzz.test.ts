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
import { existsSync, mkdirSync, mkdtempSync, utimesSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildDomain } from '../src/geometry/domain.js';
import { validateDomain } from '../src/geometry/validate.js';
import { generateMesh } from '../src/mesh/generate.js';
import { DrawingError } from '../src/geometry/import/types.js';
import { readDxf } from '../src/geometry/import/dxf.js';
import { readSvg } from '../src/geometry/import/svg.js';
import { AnalysisError, ModelError } from '../src/model/errors.js';
import { lockOutputDir, releaseOutputLock } from '../src/report/output-dir.js';
import { DXF_RECT, dxf, nestedBlocks, svgUseFanOut } from './support/hostile.js';
import { loadModelText } from '../src/model/load.js';
import { analyseOnMesh, prepareModel } from '../src/pipeline/analyse.js';
import type { Model } from '../src/model/schema.js';
import { plate, toModel } from './support/random-plate.js';
import { ktOf } from './support/kt.js';
import { KT_LIMIT } from '../src/post/kt.js';
import { transformModel } from './support/transform.js';

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

/**
 * Where a part lies and how large it is written change nothing: the mesher works in the part's
 * own frame (src/mesh/frame.ts). The mesh of a copy scaled by a power of two is the same to the
 * bit; a copy moved by 1e6 or scaled by 1e-6 or 1e6 has the same mesh node for node (relative
 * coordinates within rounding) and Kt to 1e-9. Farther than 1e9 part sizes, or outside the
 * number range, the model is refused (tests/bad-inputs.test.ts).
 */
describe('position and scale change nothing', () => {
  /** An invented plate with a fillet, a hole and a slot, at numbers a translation keeps exact. */
  const part = (): Model => ({
    title: 'invariance plate (invented)',
    material: { E: 210000, nu: 0.3 },
    thickness: 5,
    geometry: {
      outline: { shape: 'path', path: [{ at: [0, 0], edge: 'bottom' }, { at: [100, 0], edge: 'pull', round: 4 }, { at: [100, 40], edge: 'top' }, { at: [0, 40], edge: 'held' }] },
      holes: [
        { shape: 'circle', center: [50, 20], diameter: 10 },
        { shape: 'slot', center: [80, 20], length: 8, width: 4 },
      ],
    },
    supports: [{ type: 'fixed', on: 'held' }],
    loads: [{ type: 'traction', on: 'pull', normal: 100 }],
  } as Model);
  const solve = (m: Model) => analyseOnMesh(prepareModel(m, { maxMemoryBytes: 4 * 2 ** 30 }));

  it('the same part at the origin, at x = 1e6 and scaled by 1e-6 and 1e6: the same mesh node for node and Kt to 1e-9', () => {
    const ref = solve(part());
    for (const t of [{ translate: [1e6, 0] as [number, number] }, { scale: 1e-6 }, { scale: 1e6 }]) {
      const k = t.scale ?? 1;
      const [tx] = t.translate ?? [0, 0];
      const a = solve(transformModel(part(), t));
      expect(a.mesh.nNodes).toBe(ref.mesh.nNodes);
      expect(Array.from(a.mesh.elements)).toEqual(Array.from(ref.mesh.elements));
      let worst = 0;
      for (let i = 0; i < a.mesh.nodes.length; i++) {
        const rel = (a.mesh.nodes[i] - (i % 2 === 0 ? tx : 0)) / k;
        worst = Math.max(worst, Math.abs(rel - ref.mesh.nodes[i]));
      }
      // Relative coordinates agree to rounding of the part's size (1e-9 of it; 1e-10 at 1e6 is the ulp of 1e6).
      expect(worst).toBeLessThan(1e-9 * 100);
      expect(Math.abs(ktOf(a).net! / ktOf(ref).net! - 1)).toBeLessThan(1e-9);
      expect(Math.abs(ktOf(a).gross! / ktOf(ref).gross! - 1)).toBeLessThan(1e-9);
    }
  });

  it(`random plates scaled by a power of two mesh to the bit as at their own size, with the same Kt (${runs(12)} plates)`, () => {
    fc.assert(
      fc.property(plate, fc.integer({ min: -200, max: 200 }), (p, j) => {
        const k = 2 ** j;
        const model = toModel(p);
        const ref = solve(model);
        const a = solve(transformModel(model, { scale: k }));
        expect(Array.from(a.mesh.elements)).toEqual(Array.from(ref.mesh.elements));
        // To the bit, but for coordinates that are subnormal at either scale (a rotation by an
        // angle of 1e-300, say): scaling by a power of two is exact only between normal numbers,
        // so those agree to the subnormal spacing, 2^-1074, at the smaller scale.
        const MIN_NORMAL = 2 ** -1022;
        for (let i = 0; i < a.mesh.nodes.length; i++) {
          const r = ref.mesh.nodes[i];
          if (r !== 0 && Math.min(Math.abs(r), Math.abs(r) * k) < MIN_NORMAL) expect(Math.abs(a.mesh.nodes[i] / k - r)).toBeLessThanOrEqual((2 * Number.MIN_VALUE) / Math.min(1, k));
          else expect(a.mesh.nodes[i] / k).toBe(r);
        }
        // The mesh is the same to the bit; the solve and recovery round a little differently
        // (square roots, sums in the scaled units): the peak agrees to 1e-10. A raiser's net
        // section is the least material over the cut's direction, a flat minimum, so the 1e-14 of
        // round-off can move the chosen direction by its square root, about 1e-8 of a radian, and
        // Kt by as much: 1e-7 allowed, five orders below any error band.
        const kRef = ktOf(ref).net;
        if (kRef === null) expect(ktOf(a).net).toBeNull();
        else expect(Math.abs(ktOf(a).net! / kRef - 1)).toBeLessThan(1e-7);
        expect(Math.abs(a.peak.stress / ref.peak.stress - 1)).toBeLessThan(1e-10);
      }),
      { numRuns: runs(12), interruptAfterTimeLimit: 120_000 * FACTOR, markInterruptAsFailure: true },
    );
  }, 180_000 * FACTOR);
});

/**
 * Hostile input of every kind, generated: each gives a model or a clear error (ModelError,
 * AnalysisError, or for a drawing reader a DrawingError), never another exception, and the
 * work stays bounded by the limits (src/geometry/import/limits.ts, src/model/load.ts).
 */
describe('hostile input, generated', () => {
  const DRAWING = { modelUnitMetres: 0.001, modelUnitName: 'mm', scale: 1, ignore: [] as string[], file: 'fuzz' };
  const clearOrDrawing = (e: unknown) => clearError(e) || e instanceof DrawingError;
  const baseText = JSON.stringify(toModel({ W: 100, H: 40, scale: 1, angle: 0, fillets: [0, 0, 0, 0], holes: [] }));

  it(`lists and objects nested to any depth give a model or a clear error (${runs(60)} cases)`, () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 20_000 }), fc.constantFrom('[', '{"a":'), fc.constantFrom('note', 'material', 'geometry', 'zzz'), (depth, open, field) => {
        const close = open === '[' ? ']' : '}';
        const nested = open.repeat(depth) + (open === '[' ? '' : '1') + close.repeat(depth);
        const text = baseText.replace(/^\{/, `{"${field}":${nested},`);
        try {
          loadModelText(text, 'nested.json');
        } catch (e) {
          expect(clearError(e), String((e as Error)?.stack)).toBe(true);
          if (depth > 32) expect((e as Error).message).toMatch(/nested \d+ deep|given twice|unknown field|must be|problems/);
        }
      }),
      { numRuns: runs(60) },
    );
  });

  it(`"__proto__", "constructor" and "prototype" anywhere are refused as unknown fields (${runs(200)} cases)`, () => {
    const key = fc.constantFrom('__proto__', 'constructor', 'prototype');
    fc.assert(
      fc.property(key, fc.jsonValue({ maxDepth: 2 }), fc.nat(), (k, v, at) => {
        // Put the field into one of the model's objects, chosen by position.
        const objects = [...baseText.matchAll(/\{/g)].map((m) => m.index!);
        const pos = objects[at % objects.length] + 1;
        const text = `${baseText.slice(0, pos)}${JSON.stringify(k)}:${JSON.stringify(v)},${baseText.slice(pos)}`;
        let err: unknown = null;
        try {
          loadModelText(text, 'proto.json');
        } catch (e) {
          err = e;
        }
        expect(err, 'a reserved field was accepted').not.toBeNull();
        expect(clearError(err), String((err as Error)?.stack)).toBe(true);
        expect((err as ModelError).describe()).toContain(`unknown field "${k}"`);
      }),
      { numRuns: runs(200) },
    );
  });

  it(`SVG <use> fan-out and nesting of any shape is read or refused, within the expansion limit (${runs(25)} cases)`, () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 12 }), (depth, fan) => {
        try {
          const r = readSvg(svgUseFanOut(depth, fan), DRAWING);
          expect(r.pieces.length).toBeLessThanOrEqual(200_000);
        } catch (e) {
          expect(clearOrDrawing(e), String((e as Error)?.stack)).toBe(true);
        }
      }),
      { numRuns: runs(25) },
    );
  });

  it(`DXF block INSERTs nested and fanned out of any shape are read or refused, within the expansion limit (${runs(25)} cases)`, () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 20 }), fc.integer({ min: 1, max: 12 }), (depth, fan) => {
        try {
          const r = readDxf(dxf(`${DXF_RECT}0\nINSERT\n2\nB${depth}\n10\n0\n20\n0\n`, nestedBlocks(depth, fan)), DRAWING);
          expect(r.pieces.length).toBeLessThanOrEqual(200_000);
        } catch (e) {
          expect(clearOrDrawing(e), String((e as Error)?.stack)).toBe(true);
        }
      }),
      { numRuns: runs(25) },
    );
  });

  it(`any expression text gives a finite number or a clear error (${runs(2000)} cases)`, () => {
    const piece = fc.constantFrom('(', ')', '+', '-', '*', '/', '^', ',', '1', '0', '1e308', 'd', 'pi', 'sqrt(', 'max(', 'tand(', 'constructor(', '__proto__', ' ', '.', 'e');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 60 }), (parts) => {
        const text = JSON.stringify({ ...JSON.parse(baseText), parameters: { d: 2 }, thickness: `=${parts.join('')}` });
        try {
          loadModelText(text, 'expr.json');
        } catch (e) {
          expect(clearError(e), String((e as Error)?.stack)).toBe(true);
        }
      }),
      { numRuns: runs(2000) },
    );
  });

  it(`an output folder's lock file of any content is taken over when its owner is gone, or refused naming why (${runs(100)} cases)`, () => {
    const root = mkdtempSync(join(tmpdir(), 'raiser-lockfuzz-'));
    let n = 0;
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.jsonValue().map((v) => JSON.stringify(v)), fc.record({ pid: fc.integer({ min: -5, max: 2 ** 22 }), host: fc.constantFrom(hostname(), 'elsewhere'), started: fc.string() }).map((o) => JSON.stringify(o))), fc.boolean(), (content, old) => {
        const dir = join(root, String(n++));
        mkdirSync(dir);
        const lock = join(dir, '.raiser-lock');
        writeFileSync(lock, content);
        if (old) utimesSync(lock, new Date(0), new Date(0));
        try {
          lockOutputDir(dir);
          releaseOutputLock(dir);
          expect(existsSync(lock)).toBe(false);
        } catch (e) {
          expect(e).toBeInstanceOf(ModelError);
          expect((e as ModelError).message).toMatch(/in use by another raiser run|being locked by another raiser run/);
        }
      }),
      { numRuns: runs(100) },
    );
  });
});
