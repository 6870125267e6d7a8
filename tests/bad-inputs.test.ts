/**
 * The catalogue of bad inputs: every model raiser cannot analyse correctly gives a clear error
 * that names the problem and where it is (a JSON path, and for file problems the line), with the
 * right kind: bad input (exit 2, ModelError) or a model that cannot be analysed as given (exit 3,
 * AnalysisError). Each case lists the message it must give.
 */
import { mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { AnalysisError, ModelError } from '../src/model/errors.js';
import { loadModelText } from '../src/model/load.js';
import { analyseOnMesh, prepareModel } from '../src/pipeline/analyse.js';
import { raiser } from './support/cli.js';

/** A valid plate with a hole: 100 x 40, clamped at x = 0, pulled at x = 100. */
function base(): any {
  return {
    title: 'catalogue base (invented)',
    material: { E: 210000, nu: 0.3, yield: 355, ultimate: 510 },
    thickness: 5,
    geometry: {
      outline: { shape: 'path', path: [{ at: [0, 0], edge: 'bottom' }, { at: [100, 0], edge: 'pull' }, { at: [100, 40], edge: 'top' }, { at: [0, 40], edge: 'held' }] },
      holes: [{ shape: 'circle', center: [50, 20], diameter: 10, name: 'bore' }],
    },
    supports: [{ type: 'fixed', on: 'held' }],
    loads: [{ type: 'traction', on: 'pull', normal: 100 }],
  };
}

type Case = [name: string, input: string | ((m: any) => void), kind: 'model' | 'analysis', message: RegExp];

const path = (m: any) => m.geometry.outline.path;

const CASES: Case[] = [
  ['malformed JSON (a trailing comma)', '{ "thickness": 5, }', 'model', /:1:\d+.*trailing comma|comma/i],
  ['malformed JSON (an unclosed brace)', '{ "thickness": 5', 'model', /:1:\d+/],
  ['text that is not JSON at all', 'this is not a model', 'model', /JSON/],
  ['a JSON list instead of a model', '[1, 2, 3]', 'model', /not a model|list/i],
  ['a JSON number instead of a model', '42', 'model', /not a model|number/i],
  ['an empty object', '{}', 'model', /empty object \{\}, not a model/],
  ['an unknown top-level field, with a suggestion', (m) => (m.materail = m.material), 'model', /unknown field "materail".*did you mean "material"/],
  ['an unknown nested field', (m) => (m.material.Young = 1), 'model', /unknown field "Young"/],
  ['missing material', (m) => delete m.material, 'model', /"material" is missing/],
  ['nu = 0.5', (m) => (m.material.nu = 0.5), 'model', /material\.nu/],
  ['nu negative', (m) => (m.material.nu = -0.1), 'model', /material\.nu/],
  ['E negative', (m) => (m.material.E = -210000), 'model', /material\.E.*positive/],
  ['E zero', (m) => (m.material.E = 0), 'model', /material\.E/],
  ['zero thickness', (m) => (m.thickness = 0), 'model', /thickness.*positive/],
  ['negative thickness', (m) => (m.thickness = -2), 'model', /thickness.*positive/],
  ['a number too large to represent', '{ "thickness": 1e999 }', 'model', /too large/],
  ['a number written with its unit', (m) => (m.material.E = '210 GPa'), 'model', /material\.E/],
  ['a length unit that does not exist', (m) => (m.units = { length: 'furlong' }), 'model', /units\.length/],
  ['a force unit that does not exist', (m) => (m.units = { force: 'N/mm' }), 'model', /units\.force/],
  ['an open loop: a path of two vertices', (m) => (m.geometry.outline.path = [[0, 0], [100, 0]]), 'model', /path/],
  ['a zero-length segment (a vertex repeated)', (m) => path(m).splice(1, 0, { at: [0, 0] }), 'model', /same place|zero-length/],
  ['the first vertex repeated at the end', (m) => path(m).push([0, 0]), 'model', /same place|zero-length/],
  ['a self-intersecting outline (a bow tie)', (m) => ((path(m)[1].at = [100, 40]), (path(m)[2].at = [100, 0]), (path(m)[3].at = [0, 25])), 'model', /crosses itself/],
  ['a hole outside the outline', (m) => (m.geometry.holes[0].center = [200, 20]), 'model', /outside the outline/],
  ['a hole crossing the outline', (m) => (m.geometry.holes[0].center = [97, 20]), 'model', /crosses the outline/],
  ['two holes overlapping', (m) => m.geometry.holes.push({ shape: 'circle', center: [54, 20], diameter: 10 }), 'model', /hole 1.*hole 2|hole 2.*hole 1/],
  ['a hole touching the outline', (m) => (m.geometry.holes[0].center = [50, 5]), 'model', /touches the outline/],
  ['a hole inside a hole', (m) => m.geometry.holes.push({ shape: 'circle', center: [50, 20], diameter: 4 }), 'model', /inside hole 1/],
  ['an arc whose radius cannot span its chord', (m) => (path(m)[2] = { at: [100, 40], arc: { radius: 10, turn: 'ccw' } }), 'model', /cannot span a chord/],
  ['an arc centre not equally far from its ends', (m) => (path(m)[2] = { at: [100, 40], arc: { center: [60, 30], turn: 'ccw' } }), 'model', /must be equal/],
  ['an arc through a point on its chord', (m) => (path(m)[2] = { at: [100, 40], arc: { through: [50, 40] } }), 'model', /on one line/],
  ['a fillet larger than its corner allows', (m) => (path(m)[1].round = 45), 'model', /roundings at its ends need/],
  ['rounding a corner between edges in line', (m) => path(m).splice(1, 0, { at: [50, 0], round: 2 }), 'model', /in line/],
  ['a rounded rectangle with too large a radius', (m) => m.geometry.holes.push({ shape: 'rounded-rect', center: [20, 20], width: 8, height: 6, radius: 4 }), 'model', /larger than half/],
  ['a slot shorter than it is wide', (m) => m.geometry.holes.push({ shape: 'slot', center: [20, 20], length: 4, width: 6 }), 'model', /must exceed its width/],
  ['a circle with no size', (m) => delete m.geometry.holes[0].diameter, 'model', /neither "radius" nor "diameter"/],
  ['a circle whose radius and diameter disagree', (m) => (m.geometry.holes[0].radius = 4), 'model', /disagree/],
  ['an unknown hole shape, with a suggestion', (m) => (m.geometry.holes[0].shape = 'circel'), 'model', /did you mean "circle"/],
  ['an unknown support type', (m) => (m.supports[0].type = 'clamp'), 'model', /supports\[0\]/],
  ['a load on a tag that does not exist', (m) => (m.loads[0].on = 'pul'), 'model', /"pul".*did you mean "pull"/],
  ['a hole selector beyond the holes', (m) => (m.loads[0] = { type: 'pressure', on: { hole: 5 }, p: 10 }), 'model', /hole 5|hole.*5/],
  ['no supports', (m) => (m.supports = []), 'model', /supports/],
  ['supports that leave translation in x free', (m) => (m.supports = [{ type: 'roller', fix: 'y', on: 'held' }]), 'analysis', /free to translate in x/],
  ['supports that leave translation in y free', (m) => (m.supports = [{ type: 'roller', fix: 'x', on: 'held' }]), 'analysis', /free to translate in y/],
  ['one pin: rotation free', (m) => (m.supports = [{ type: 'pin', at: [0, 20] }]), 'analysis', /free to rotate about \(0, 20\)/],
  ['no loads', (m) => (m.loads = []), 'model', /loads/],
  ['a load of zero', (m) => (m.loads[0].normal = 0), 'model', /load/],
  ['a load on the edges a fixed support holds (the same tag twice)', (m) => (m.loads[0].on = 'held'), 'model', /straight into the support/],
  ['a symmetry plane on a curved edge', (m) => m.supports.push({ type: 'symmetry', on: { hole: 1 } }), 'model', /symmetry plane must be straight/],
  ['a symmetry plane on an inclined edge', (m) => ((m.geometry.outline.path[2].at = [100, 40]), (m.geometry.outline.path[3].at = [10, 40]), m.supports.push({ type: 'symmetry', on: 'held' })), 'model', /not parallel to x or y/],
  ['a moment on a curved edge', (m) => (m.loads[0] = { type: 'moment', on: { hole: 1 }, m: 1000 }), 'model', /straight edges/],
  ['a moment on edges that are not in line', (m) => (m.loads[0] = { type: 'moment', on: ['pull', 'top'], m: 1000 }), 'model', /one straight line/],
  ['a pin away from the boundary', (m) => (m.supports = [{ type: 'pin', at: [50, 35] }, ...m.supports]), 'model', /pins must lie on it/],
  ['a mesh size below the geometric tolerance', (m) => (m.mesh = { size: 1e-9 }), 'model', /below a millionth/],
  ['a raiser size above the global size', (m) => (m.mesh = { size: 2, raiserSize: 5 }), 'model', /raiserSize/],
  ['a model too large for memory, refused up front', (m) => (m.mesh = { size: 0.02, raiserSize: 0.02 }), 'model', /GB.*--max-memory|--max-memory/],
  ['a grading out of range', (m) => (m.mesh = { grading: 0.01 }), 'model', /mesh\.grading/],
  ['a minimum angle out of range', (m) => (m.mesh = { minAngle: 40 }), 'model', /mesh\.minAngle/],
  ['an expression naming an undeclared parameter', (m) => ((m.parameters = { d: 10 }), (m.geometry.holes[0].diameter = '=dd')), 'model', /"dd" is not a declared parameter.*did you mean "d"/],
  ['an expression with junk in it', (m) => ((m.parameters = { d: 10 }), (m.geometry.holes[0].diameter = '=d**2')), 'model', /diameter/],
  ['an expression calling code', (m) => (m.thickness = '=require("fs")'), 'model', /thickness/],
  ['a nominal section that crosses no material', (m) => (m.results = { section: { from: [200, 0], to: [200, 40] } }), 'model', /results\.section.*crosses no material/],
  ['a headline raiser that the part does not have', (m) => (m.results = { raiser: 'hole 7' }), 'model', /results\.raiser.*no stress raiser is called "hole 7"[\s\S]*the raisers are/],
  ['a raiser to report that the part does not have', (m) => (m.results = { raisers: ['notch'] }), 'model', /results\.raisers\[0\].*no stress raiser is called "notch"/],
  ['a nominal stress for a raiser the part does not have', (m) => (m.results = { nominal: { fillet: { stress: 100 } } }), 'model', /results\.nominal\.fillet.*no stress raiser is called "fillet"/],
  ['a raiser\'s nominal with neither a section nor a stress', (m) => (m.results = { nominal: { 'hole 1': {} } }), 'model', /results\.nominal\.hole 1.*neither a section nor a stress/],
  ['a section for a raiser that crosses no material', (m) => (m.results = { nominal: { 'hole 1': { section: { from: [300, 0], to: [300, 40] } } } }), 'model', /results\.nominal\.hole 1\.section.*crosses no material/],
  ['an unknown stress measure', (m) => (m.results = { measure: 'mises' }), 'model', /results\.measure/],
  ['a field given twice', '{ "thickness": 5, "thickness": 6 }', 'model', /given twice/],
  ['yield above ultimate', (m) => (m.material.yield = 600), 'model', /yield/],
  ['a misspelt plane state', (m) => (m.state = 'plane strain'), 'model', /state/],
  ['an ellipse with a negative semi-axis', (m) => m.geometry.holes.push({ shape: 'ellipse', center: [20, 20], a: -3, b: 2 }), 'model', /\.a/],
  ['a point with three coordinates', (m) => (m.geometry.holes[0].center = [50, 20, 0]), 'model', /center/],
  ['a bearing load on a hole that is not circular', (m) => ((m.geometry.holes[0] = { shape: 'slot', center: [50, 20], length: 16, width: 8, name: 'bore' }), (m.loads[0] = { type: 'bearing', on: { hole: 'bore' }, force: [1000, 0] })), 'model', /loads\[0\]\.on\.hole.*not circular/],
  ['a bearing load selecting edges by tag instead of a hole', (m) => (m.loads[0] = { type: 'bearing', on: 'pull', force: [1000, 0] }), 'model', /loads\[0\]\.on/],
  ['a bearing load of zero', (m) => (m.loads[0] = { type: 'bearing', on: { hole: 1 }, force: [0, 0] }), 'model', /every load is zero/],
  ['a rigid pin in a hole that is not circular', (m) => ((m.geometry.holes[0] = { shape: 'ellipse', center: [50, 20], a: 6, b: 4, name: 'bore' }), (m.loads[0] = { type: 'rigid-pin', on: { hole: 'bore' }, force: [1000, 0] })), 'model', /loads\[0\]\.on\.hole.*not circular/],
  ['a fixed rigid pin in a hole that is not circular', (m) => ((m.geometry.holes[0] = { shape: 'rounded-rect', center: [50, 20], width: 10, height: 10, radius: 4, name: 'bore' }), m.supports.push({ type: 'rigid-pin', on: { hole: 'bore' } })), 'model', /supports\[1\]\.on\.hole.*not circular/],
  ['a pin larger than its hole', (m) => (m.loads[0] = { type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0], diameter: 10.5 }), 'model', /loads\[0\]\.diameter.*larger than its hole/],
  ['a negative pin clearance', (m) => (m.loads[0] = { type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0], clearance: -0.1 }), 'model', /loads\[0\]\.clearance/],
  ['a clearance as large as the hole', (m) => (m.loads[0] = { type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0], clearance: 10 }), 'model', /loads\[0\]\.clearance.*leaves no pin/],
  ['a pin clearance and diameter that disagree', (m) => (m.loads[0] = { type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0], clearance: 0.1, diameter: 9.8 }), 'model', /loads\[0\]\.clearance.*disagrees/],
  ['a pin load no contact can carry: no force, so the pin has no position', (m) => m.loads.push({ type: 'rigid-pin', on: { hole: 1 }, force: [0, 0] }), 'model', /loads\[1\]\.force.*no force/],
  ['two pins in one hole', (m) => ((m.loads[0] = { type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0] }), m.supports.push({ type: 'rigid-pin', on: { hole: 'bore' } })), 'model', /loads\[0\]\.on\.hole.*already has a pin \(supports\[1\]\)/],
  ['another load on the hole of a rigid pin', (m) => m.loads.push({ type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0] }, { type: 'pressure', on: { hole: 1 }, p: 5 }), 'model', /loads\[2\]\.on.*rigid pin/],
  ['a point support on the hole of a rigid pin', (m) => ((m.loads[0] = { type: 'rigid-pin', on: { hole: 1 }, force: [1000, 0] }), m.supports.push({ type: 'pin', at: [55, 20], fix: 'y' })), 'model', /supports\[1\]\.at.*rigid pin/],
  ['a part held only by a fixed rigid pin: free to turn about it', (m) => (m.supports = [{ type: 'rigid-pin', on: { hole: 1 } }]), 'analysis', /free to rotate about \(50, 20\)/],
  ['a bearing load on a hole a fixed support holds', (m) => ((m.loads = [{ type: 'bearing', on: { hole: 1 }, force: [1000, 0] }]), m.supports.push({ type: 'fixed', on: { hole: 1 } })), 'model', /supports\[1\]\.on.*has a pin/],
];

function attempt(input: Case[1]): unknown {
  let text: string;
  if (typeof input === 'string') text = input;
  else {
    const m = base();
    input(m);
    text = JSON.stringify(m, null, 1);
  }
  try {
    const { model } = loadModelText(text, 'case.json');
    const prep = prepareModel(model, { maxMemoryBytes: 4 * 2 ** 30 });
    analyseOnMesh(prep);
  } catch (e) {
    return e;
  }
  return null;
}

describe('bad-input catalogue', () => {
  it('holds at least 50 cases', () => expect(CASES.length).toBeGreaterThanOrEqual(50));

  it('the base model of the catalogue is valid', () => expect(attempt(() => undefined)).toBeNull());

  for (const [name, input, kind, message] of CASES) {
    it(`${name}: ${kind === 'model' ? 'bad input' : 'cannot be analysed'}, saying ${message}`, () => {
      const e = attempt(input);
      expect(e, 'no error was raised').not.toBeNull();
      if (kind === 'model') expect(e, String((e as Error)?.stack)).toBeInstanceOf(ModelError);
      else expect(e, String((e as Error)?.stack)).toBeInstanceOf(AnalysisError);
      const text = e instanceof ModelError || e instanceof AnalysisError ? e.describe() : String(e);
      expect(text).toMatch(message);
    });
  }
});

describe('bad inputs at the command line', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-bad-'));

  it('a path that does not exist: exit 2, naming it', () => {
    const r = raiser(['solve', join(dir, 'missing.json')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('missing.json');
  });

  it('a folder instead of a file: exit 2', () => {
    mkdirSync(join(dir, 'folder'));
    expect(raiser(['solve', join(dir, 'folder')]).code).toBe(2);
  });

  it('a picture instead of a model: exit 2, without a stack trace', () => {
    const f = join(dir, 'photo.json');
    writeFileSync(f, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]));
    const r = raiser(['solve', f]);
    expect(r.code).toBe(2);
    expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/);
  });

  it('a model free to move: exit 3; with --debug the stack is shown', () => {
    const m = base();
    m.supports = [{ type: 'roller', fix: 'y', on: 'held' }];
    const f = join(dir, 'free.json');
    writeFileSync(f, JSON.stringify(m));
    expect(raiser(['solve', f, '--single-mesh']).code).toBe(3);
    expect(raiser(['solve', f, '--single-mesh', '--debug']).stderr).toMatch(/at .*\.js:\d+/);
  });
});
