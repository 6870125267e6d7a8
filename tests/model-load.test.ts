/**
 * Reading model files: every kind of bad input gives a ModelError a person can act on (where,
 * what was found, what is wrong, how to fix), all problems of a file are reported together,
 * and a good file comes back as the validated Model. The models here are invented test data.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ModelError, ModelErrorList } from '../src/model/errors.js';
import { loadModelText, parseModelText, readModelFile } from '../src/model/load.js';

/** An invented link plate: 100 x 40, one bolt hole, held on the left, pulled on the right. */
function plate(): Record<string, any> {
  return {
    title: 'invented test plate',
    material: { E: 210000, nu: 0.3 },
    thickness: 5,
    geometry: {
      outline: {
        shape: 'path',
        path: [[0, 0], { at: [100, 0], edge: 'pull' }, { at: [100, 40], edge: 'free' }, { at: [0, 40], edge: 'held' }],
      },
      holes: [{ shape: 'circle', center: [50, 20], diameter: 10, name: 'bolt', tag: 'bolt-edge' }],
    },
    supports: [{ type: 'fixed', on: 'held' }],
    loads: [{ type: 'traction', on: 'pull', normal: 50 }],
  };
}

const text = (o: unknown) => JSON.stringify(o, null, 2);

/** The problems thrown for a text, whether one ModelError or a list. */
function problems(t: string, file?: string): ModelError[] {
  try {
    parseModelText(t, file);
  } catch (e) {
    expect(e).toBeInstanceOf(ModelError);
    return e instanceof ModelErrorList ? [...e.problems] : [e as ModelError];
  }
  throw new Error('expected the model to be rejected');
}

function only(t: string): ModelError {
  const p = problems(t);
  expect(p.map((x) => x.message)).toHaveLength(1);
  return p[0];
}

const ZOD_WORDING = /Invalid input|Invalid option|Too small|Too big|Unrecognized key|expected (string|number|object|array)/;

const dir = mkdtempSync(join(tmpdir(), 'raiser-model-test-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('a good model', () => {
  it('comes back as the validated model, equal to the input', () => {
    const m = parseModelText(text(plate()));
    expect(m).toEqual(plate());
  });
  it('reads from a file, with a byte-order mark', () => {
    const f = join(dir, 'good.json');
    writeFileSync(f, '\ufeff' + text(plate()));
    expect(readModelFile(f).thickness).toBe(5);
  });
  it('accepts one tag on several edges and a tag shared by a loop and an edge', () => {
    const p = plate();
    p.geometry.outline.path[0] = { at: [0, 0], edge: 'pull' };
    p.geometry.holes[0].tag = 'free';
    expect(() => parseModelText(text(p))).not.toThrow();
  });
  it('warns, without failing, when E looks like the wrong unit', () => {
    const p = plate();
    p.material.E = 210;
    const { warnings } = loadModelText(text(p));
    expect(warnings).toHaveLength(1);
    expect(warnings[0].path).toBe('material.E');
    expect(warnings[0].message).toMatch(/E = 210 MPa is 0.21 GPa/);
    expect(warnings[0].line).toBe(4);
  });
});

describe('files that are not model files', () => {
  it('a missing file, suggesting the near name in the same folder', () => {
    writeFileSync(join(dir, 'bracket.json'), text(plate()));
    try {
      readModelFile(join(dir, 'braket.json'));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ModelError);
      expect((e as ModelError).message).toMatch(/^no such file/);
      expect((e as ModelError).hint).toBe(`did you mean "${join(dir, 'bracket.json')}"?`);
    }
  });
  it('a folder, listing the model files in it', () => {
    const sub = join(dir, 'cases');
    mkdirSync(sub);
    writeFileSync(join(sub, 'a.json'), '{}');
    expect(() => readModelFile(sub)).toThrow(/is a folder, not a model file/);
    try {
      readModelFile(sub);
    } catch (e) {
      expect((e as ModelError).hint).toMatch(/holds a\.json/);
    }
  });
  it('a PNG image, a UTF-16 file, a YAML file, an SVG drawing', () => {
    const png = join(dir, 'picture.json');
    writeFileSync(png, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0]));
    expect(() => readModelFile(png)).toThrow(/is a PNG image, not a model file/);
    const u16 = join(dir, 'u16.json');
    writeFileSync(u16, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('{}', 'utf16le')]));
    expect(() => readModelFile(u16)).toThrow(/saved as UTF-16/);
    expect(only('material:\n  E: 210000\n').message).toMatch(/looks like YAML/);
    expect(only('<svg xmlns="http://www.w3.org/2000/svg"></svg>').message).toMatch(/looks like an SVG drawing/);
  });
  it('JSON that is a list, a number, or an object with no model fields', () => {
    expect(only('[1, 2]').message).toBe('the file holds a JSON list of 2 items, not a model');
    expect(only(`[${text(plate())}]`).hint).toBe('a file holds one model; put each model in its own file');
    expect(only('3.5').message).toBe('the file holds a single number, not a model');
    expect(only('{}').message).toBe('the file holds an empty object {}, not a model');
    const e = only('{"name": "raiser", "version": "0.1.0", "dependencies": {}}');
    expect(e.message).toMatch(/not a raiser model: none of its fields/);
    expect(e.hint).toMatch(/"material", "thickness", "geometry" and "supports", with "loads" or "loadCases"/);
  });
  it('an empty file', () => {
    expect(only('  \n').message).toBe('the file is empty');
  });
});

describe('malformed JSON', () => {
  it('gives line, column, the offending line with a caret, and a fix', () => {
    const t = text(plate()).replace('"thickness": 5,', '"thickness": 5,,');
    const e = only(t);
    expect(e.line).toBe(7);
    expect(e.column).toBe(18);
    expect(e.message).toBe('not valid JSON: two commas in a row, or a comma at the start of an object');
    expect(e.excerpt).toBe('  "thickness": 5,,\n                 ^');
    expect(e.hint).toBe('remove the extra comma');
    const d = (() => {
      try {
        parseModelText(t, 'part.json');
      } catch (x) {
        return (x as ModelError).describe();
      }
    })();
    expect(d).toBe('part.json:7:18: not valid JSON: two commas in a row, or a comma at the start of an object\n      "thickness": 5,,\n                     ^\n  fix: remove the extra comma');
  });
  it('places a missing closing bracket at the end and names where it opened', () => {
    const t = text(plate()).replace(/\}\s*$/, '');
    const e = only(t);
    expect(e.message).toBe('not valid JSON: the file ends inside the object opened at line 1, column 1');
  });
  it('reports a field given twice', () => {
    const t = text(plate()).replace('"thickness": 5,', '"thickness": 5,\n  "thickness": 6,');
    const e = only(t);
    expect(e.path).toBe('thickness');
    expect(e.message).toMatch(/given twice in the same object \(first on line 7\)/);
    expect(e.line).toBe(8);
  });
});

describe('schema problems, in plain words', () => {
  it('reports every problem of a file at once, in file order, each with its path and line', () => {
    const p = plate();
    p.material.nu = 0.5;
    p.thickness = 0;
    p.geometry.holes[0].shape = 'circel';
    p.supports[0].type = 'fixd';
    p.loads[0].normal = '50';
    const err = (() => {
      try {
        parseModelText(text(p), 'plate.json');
      } catch (e) {
        return e as ModelErrorList;
      }
    })()!;
    expect(err).toBeInstanceOf(ModelErrorList);
    expect(err.problems.map((x) => x.path)).toEqual(['material.nu', 'thickness', 'geometry.holes[0].shape', 'supports[0].type', 'loads[0].normal']);
    const lines = err.problems.map((x) => x.line!);
    expect([...lines].sort((a, b) => a - b)).toEqual(lines);
    expect(err.problems.map((x) => x.message)).toEqual([
      'must be at least 0 and less than 0.5; found 0.5',
      'must be a positive number (greater than 0); found 0',
      '"circel" is not one of "path", "circle", "ellipse", "slot" or "rounded-rect": did you mean "circle"?',
      '"fixd" is not one of "fixed", "roller", "symmetry", "pin" or "rigid-pin": did you mean "fixed"?',
      'must be a number; found the text "50"',
    ]);
    expect(err.problems[4].hint).toBe('remove the quotes: 50');
    expect(err.message.split('\n')).toHaveLength(6);
    const d = err.describe();
    expect(d.startsWith('plate.json: 5 problems in the model\n  plate.json:5:11: at material.nu:')).toBe(true);
    expect(d).not.toMatch(ZOD_WORDING);
  });
  it('unknown fields get the closest allowed field, and absorb the "missing" twin', () => {
    const p = plate();
    p.geometry.holes[0] = { shape: 'circle', centre: [50, 20], diameter: 10 };
    p.thicknes = 5;
    delete p.thickness;
    const ps = problems(text(p));
    expect(ps.map((x) => [x.path, x.message])).toEqual([
      ['geometry.holes[0].centre', 'unknown field "centre": did you mean "center"?'],
      ['thicknes', 'unknown field "thicknes": did you mean "thickness"?'],
    ]);
  });
  it('a field with no close match lists the allowed fields', () => {
    const p = plate();
    p.material.colour = 'grey';
    const e = only(text(p));
    expect(e.message).toBe('unknown field "colour"');
    expect(e.hint).toBe('the fields allowed here are "name", "grade", "form", "E", "nu", "yield", "ultimate", "notchSensitivity" and "stressStrain"');
  });
  it('a number given with its unit', () => {
    const p = plate();
    p.material.E = '210 GPa';
    expect(only(text(p)).hint).toMatch(/write the number alone, without the unit "GPa"/);
  });
  it('a missing discriminator, guessed from the other fields', () => {
    const p = plate();
    p.supports[0] = { fix: 'x', on: 'held' };
    const e = only(text(p));
    expect(e.path).toBe('supports[0].type');
    expect(e.message).toBe('the required field "type" is missing');
    expect(e.hint).toMatch(/this looks like "type": "roller"/);
  });
  it('a selector with a misspelt key', () => {
    const p = plate();
    p.loads[0].on = { hol: 1 };
    const e = only(text(p));
    expect(e.path).toBe('loads[0].on.hol');
    expect(e.message).toBe('is not a selector: unknown field "hol": did you mean "hole"?');
    expect(e.hint).toMatch(/^a selector is a tag name/);
  });
  it('a selector of the wrong kind, inside a list', () => {
    const p = plate();
    p.loads[0].on = ['pull', 7, { x: 'a' }];
    const ps = problems(text(p));
    expect(ps.map((x) => [x.path, x.message])).toEqual([
      ['loads[0].on[1]', 'must be a selector; found 7'],
      ['loads[0].on[2].x', 'must be a number; found the text "a"'],
    ]);
  });
  it('vertices and arcs: a misspelt vertex field, a point with a text, an arc mixing two forms, a missing turn', () => {
    const p = plate();
    p.geometry.outline.path = [
      [0, 0],
      { at: [100, 0], rund: 2 },
      [100, 'forty'],
      { at: [0, 40], arc: { radius: 30, center: [0, 0], turn: 'cw' } },
      { at: [-5, 20], arc: { radius: 30 } },
    ];
    const ps = problems(text(p));
    expect(ps.map((x) => [x.path, x.message])).toEqual([
      ['geometry.outline.path[1].rund', 'unknown field "rund": did you mean "round"?'],
      ['geometry.outline.path[2][1]', 'must be a number; found the text "forty"'],
      ['geometry.outline.path[3].arc', 'mixes fields of different forms of arc ("radius", "center" and "turn")'],
      ['geometry.outline.path[4].arc.turn', 'the required field "turn" is missing'],
    ]);
    expect(ps[3].hint).toMatch(/^add "turn": one of "ccw" or "cw"/);
  });
  it('a vertex that is neither a point nor an object', () => {
    const p = plate();
    p.geometry.outline.path[1] = 100;
    const e = only(text(p));
    expect(e.message).toBe('must be a vertex; found 100');
    expect(e.hint).toMatch(/^a vertex is \[x, y\]/);
  });
  it('a point with three numbers', () => {
    const p = plate();
    p.geometry.holes[0].center = [1, 2, 3];
    expect(only(text(p)).message).toBe('must be a point [x, y], with exactly 2 items; found the list [1,2,3]');
  });
  it('a support given as a bare tag name', () => {
    const p = plate();
    p.supports = ['held'];
    const e = only(text(p));
    expect(e.message).toBe('must be a support; found the text "held"');
    expect(e.hint).toMatch(/\{"type": "symmetry", "on": "sym-x"\}/);
  });
  it('no supports and no loads, together', () => {
    const p = plate();
    p.supports = [];
    p.loads = [];
    expect(problems(text(p)).map((x) => x.message)).toEqual([
      'the model has no supports: the plate would be free to move',
      'the model has no loads: it needs at least one',
    ]);
  });
  it('never shows zod wording', () => {
    const p = plate();
    Object.assign(p, { state: 'plane', mesh: { element: 'cubic', grading: 3 }, results: { section: 'manual' }, units: { length: 'inch' } });
    p.geometry.outline = { shape: 'slot', center: 'middle' };
    p.loads[0] = { type: 'remote', sxx: true };
    const ps = problems(text(p));
    expect(ps.length).toBeGreaterThanOrEqual(8);
    for (const x of ps) expect(x.describe()).not.toMatch(ZOD_WORDING);
    expect(ps.find((x) => x.path === 'units.length')!.message).toBe('"inch" is not one of "mm", "cm", "m", "in" or "ft": did you mean "in"?');
  });
});

describe('semantic checks', () => {
  it('a tag no edge declares, with the closest declared tag', () => {
    const p = plate();
    p.loads[0].on = 'pul';
    const e = only(text(p));
    expect(e.path).toBe('loads[0].on');
    expect(e.message).toBe('no edge or loop has the tag "pul": did you mean "pull"?');
    expect(e.line).toBeGreaterThan(1);
  });
  it('a tag that is really a hole name', () => {
    const p = plate();
    p.supports.push({ type: 'fixed', on: 'bolt' });
    expect(only(text(p)).hint).toBe('to select that hole write {"hole": "bolt"}');
  });
  it('hole selectors out of range or misnamed', () => {
    const p = plate();
    p.supports.push({ type: 'fixed', on: { hole: 2 } }, { type: 'fixed', on: [{ hole: 'blot' }] });
    expect(problems(text(p)).map((x) => [x.path, x.message])).toEqual([
      ['supports[1].on.hole', 'there is no hole 2: the model has 1 hole'],
      ['supports[2].on[0].hole', 'no hole is named "blot": did you mean "bolt"?'],
    ]);
  });
  it('a hole selector in a model with no holes points at tags instead', () => {
    const p = plate();
    delete p.geometry.holes;
    p.loads.push({ type: 'pressure', on: { hole: 1 }, p: 10 });
    expect(only(text(p)).hint).toMatch(/a hole cut by a symmetry line is part of the outline/);
  });
  it('loads that carry nothing, and all-zero loads', () => {
    const p = plate();
    p.loads = [{ type: 'force', on: 'pull' }];
    expect(only(text(p)).message).toBe('this "force" load gives neither "fx" nor "fy"');
    p.loads = [{ type: 'traction', on: 'pull', normal: 0 }];
    expect(only(text(p)).message).toBe('every load is zero, so there is no stress and no Kt');
  });
  it('raiserSize larger than size is an error that suggests the swap', () => {
    const p = plate();
    p.mesh = { size: 2, raiserSize: 5 };
    const e = only(text(p));
    expect(e.path).toBe('mesh.raiserSize');
    expect(e.hint).toMatch(/did you swap them\?/);
  });
  it('a circle with no size, and one whose radius and diameter disagree', () => {
    const p = plate();
    delete p.geometry.holes[0].diameter;
    expect(only(text(p)).message).toBe('a circle needs its size: neither "radius" nor "diameter" is given');
    p.geometry.holes[0].radius = 4;
    p.geometry.holes[0].diameter = 10;
    expect(only(text(p)).message).toBe('radius 4 and diameter 10 disagree');
  });
  it('yield above ultimate', () => {
    const p = plate();
    p.material.yield = 500;
    p.material.ultimate = 400;
    expect(only(text(p)).path).toBe('material.yield');
  });
});
