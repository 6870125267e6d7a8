/**
 * The drawing of `"geometry": { "from": ... }` is handed on explicitly, never hung on the model:
 * loading returns it beside the model, the model stays the plain data of its file (no hidden
 * keys, unchanged by loading and analysing), a model and its JSON round trip analyse bit for bit
 * the same given the same drawing, and a geometry from a drawing is refused without one.
 * The drawing is meshes/import-plate-hole.svg, our own invented test drawing (a 200 x 50 mm plate
 * with a central bore; its ends carry the class "pull").
 *
 * These are checks of the program's structure, not of a published value: the equalities are
 * exact (toEqual on the displacement arrays) because the same arithmetic runs on the same data.
 */
import { describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildDomain } from '../src/geometry/domain.js';
import { loadModelText } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { loadModelAndDrawing } from '../src/pipeline/load.js';
import { caseModel, readSweepSource } from '../src/sweep/cases.js';
import { ktOf } from './support/kt.js';

const MESHES = join(import.meta.dirname, '..', 'meshes');

const MODEL = {
  material: { E: 210000, nu: 0.3 },
  thickness: 10,
  geometry: { from: 'import-plate-hole.svg' },
  supports: [
    { type: 'pin', at: [0, 25] },
    { type: 'pin', at: [200, 25], fix: 'y' },
  ],
  loads: [{ type: 'traction', on: 'pull', normal: 100 }],
  mesh: { size: 8, raiserSize: 1 },
};

/** Every symbol-keyed property found anywhere in a value, by its path. */
function symbolKeys(value: unknown, path = 'model'): string[] {
  if (value === null || typeof value !== 'object') return [];
  const found = Object.getOwnPropertySymbols(value).map((s) => `${path}[${String(s)}]`);
  for (const [k, v] of Object.entries(value)) found.push(...symbolKeys(v, `${path}.${k}`));
  return found;
}

describe('the drawing is passed explicitly', () => {
  const file = join(MESHES, 'plate-hole-from-svg.json');
  const input = structuredClone(MODEL);
  const loaded = loadModelAndDrawing(JSON.stringify(input), file);

  it('loading returns the drawing beside the model and leaves the input and the model plain data', () => {
    expect(input).toEqual(MODEL);
    expect(symbolKeys(input)).toEqual([]);
    expect(loaded.drawing?.file).toBe('import-plate-hole.svg');
    expect(loaded.drawing?.holes.length).toBe(1);
    expect(loaded.model.geometry).toEqual(MODEL.geometry);
    expect(symbolKeys(loaded.model)).toEqual([]);
    // The model is what its file says: it survives a JSON round trip unchanged.
    expect(JSON.parse(JSON.stringify(loaded.model))).toEqual(loaded.model);
  });

  it('a model and its JSON round trip analyse the same given the same drawing, and analysing changes neither model', () => {
    const model = loaded.model;
    const before = structuredClone(model);
    const copy = JSON.parse(JSON.stringify(model));
    const a = analyseModel(model, { drawing: loaded.drawing });
    const b = analyseModel(copy, { drawing: loaded.drawing });
    expect(model).toEqual(before);
    expect(copy).toEqual(before);
    expect(symbolKeys(model)).toEqual([]);
    expect(b.mesh.nNodes).toBe(a.mesh.nNodes);
    expect(b.u).toEqual(a.u);
    expect(b.stress).toEqual(a.stress);
    expect(b.peak).toEqual(a.peak);
    expect(ktOf(b)).toEqual(ktOf(a));
    // And the analysis is of the drawn plate: a peak at the bore.
    expect(a.peak.feature).toMatch(/hole 1/);
  });

  it('a geometry from a drawing is refused, saying so, when no drawing is given', () => {
    expect(() => buildDomain(loaded.model.geometry)).toThrow(/comes from the drawing "import-plate-hole.svg", and no drawing was given/);
    expect(() => analyseModel(JSON.parse(JSON.stringify(loaded.model)))).toThrow(/no drawing was given/);
    // The model layer alone loads the file without reading the drawing (it imports no geometry).
    const bare = loadModelText(JSON.stringify(MODEL), file);
    expect(bare.model).toEqual(loaded.model);
    expect(() => buildDomain(bare.model.geometry)).toThrow(/no drawing was given/);
  });

  it('the drawing checks the model: a tag the drawing lacks is an error only when the drawing is read', () => {
    const wrong = JSON.stringify({ ...MODEL, loads: [{ type: 'traction', on: 'pul', normal: 100 }] });
    expect(() => loadModelAndDrawing(wrong, file)).toThrow(/no edge or loop has the tag "pul": did you mean "pull"\?/);
    expect(() => loadModelText(wrong, file)).not.toThrow();
  });
});

describe('the cases of a sweep share the drawing', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-drawing-'));
  copyFileSync(join(MESHES, 'import-plate-hole.svg'), join(dir, 'plate.svg'));
  const file = join(dir, 'model.json');
  writeFileSync(
    file,
    JSON.stringify({ ...MODEL, parameters: { p: 100, s: 1 }, geometry: { from: 'plate.svg', scale: '=s' }, loads: [{ type: 'traction', on: 'pull', normal: '=p' }] }),
  );

  it('a case that varies a load uses the base drawing; one that varies the drawing\'s scale reads it again', () => {
    const src = readSweepSource(file, [{ name: 'p', values: [50, 200] }]);
    expect(src.drawing?.file).toBe('plate.svg');
    const load = caseModel(src, { p: 50 });
    expect(load.drawing).toBe(src.drawing);
    expect(load.model.loads![0]).toMatchObject({ normal: 50 });
    const scaled = caseModel(src, { s: 2 });
    expect(scaled.drawing).not.toBe(src.drawing);
    // Twice the scale, four times the area.
    const area = (m: typeof load) => Math.abs(buildDomain(m.model.geometry, m.drawing).area);
    expect(area(scaled) / area(load)).toBeCloseTo(4, 12);
  });
});
