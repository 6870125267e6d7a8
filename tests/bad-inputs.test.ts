/**
 * The catalogue of bad inputs: every model raiser cannot analyse correctly gives a clear error
 * that names the problem and where it is (a JSON path, and for file problems the line), with the
 * right kind: bad input (exit 2, ModelError) or a model that cannot be analysed as given (exit 3,
 * AnalysisError). Each case lists the message it must give.
 */
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, mkdirSync, readdirSync, readFileSync, symlinkSync, truncateSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { AnalysisError, ModelError } from '../src/model/errors.js';
import { loadModelText } from '../src/model/load.js';
import { analyseOnMesh, prepareModel } from '../src/pipeline/analyse.js';
import { readSaved } from '../src/report/saved.js';
import { raiser } from './support/cli.js';
import { runBounded } from './support/bounded.js';
import { DXF_RECT, drawingModel, dxf, dxfLine, dxfSpline, lwPolylineCircle, manyCircles, manyFields, nestedBlocks, svgDeepGroups, svgEntityDeclarations, svgEntityExpansion, svgUseFanOut } from './support/hostile.js';

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

const BIN = fileURLToPath(new URL('../dist/cli/raiser.js', import.meta.url));

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
  ['a model too large for memory, refused up front (a valid model: an analysis refusal, once "bad input")', (m) => (m.mesh = { size: 0.02, raiserSize: 0.02 }), 'analysis', /GB.*--max-memory|--max-memory/],
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
  // Hostile and careless text: refused before any object is built from it, in time and memory linear in the text.
  ['a "__proto__" field (it would set the fields of the object it sits in)', JSON.stringify(base()).replace('"thickness":5', '"thickness":5,"__proto__":{"state":"plane-strain"}'), 'model', /1:\d+: at __proto__: unknown field "__proto__"/],
  ['a "__proto__" field inside a hole', JSON.stringify(base()).replace('"diameter":10,', '"__proto__":{"diameter":20},'), 'model', /at geometry\.holes\[0\]\.__proto__: unknown field "__proto__"/],
  ['"constructor" and "prototype" fields', JSON.stringify(base()).replace('"thickness":5', '"thickness":5,"constructor":1,"prototype":2'), 'model', /unknown field "constructor"[\s\S]*unknown field "prototype"/],
  ['a parameter named "constructor"', (m) => ((m.parameters = { constructor: 4 }), (m.thickness = '=constructor')), 'model', /unknown field "constructor"/],
  ['lists nested 2000 deep (once a stack overflow)', JSON.stringify(base()).replace('"thickness":5', `"thickness":5,"note":${'['.repeat(2000)}${']'.repeat(2000)}`), 'model', /nested 2001 deep here, more than the 32 levels/],
  ['100,000 unknown fields: the first 20 are listed, the rest counted', manyFields(100_000, false), 'model', /100,000 problems in the model[\s\S]*unknown field "unknown0"[\s\S]*and 99,980 more problems/],
  ['a field given 100,000 times', manyFields(100_000, true), 'model', /100,000 problems[\s\S]*"thickness" is given twice[\s\S]*and 99,980 more problems/],
  ['an expression calling "constructor"', (m) => (m.thickness = '=constructor(1)'), 'model', /"constructor" is not a function raiser knows/],
  ['an expression of 100,000 nested parentheses, quoted short', (m) => ((m.parameters = { d: 10 }), (m.geometry.holes[0].diameter = `=${'('.repeat(100_000)}d${')'.repeat(100_000)}`)), 'model', /^(?![\s\S]{3000})[\s\S]*200,001 characters\)" is longer than the 1000 characters/],
  ['an expression nesting parentheses 40 deep', (m) => ((m.parameters = { d: 10 }), (m.geometry.holes[0].diameter = `=${'('.repeat(40)}d${')'.repeat(40)}`)), 'model', /nests parentheses more than 32 deep/],
  ['a function given 150 arguments', (m) => ((m.parameters = { d: 10 }), (m.geometry.holes[0].diameter = `=max(${Array(150).fill('d').join(',')})`)), 'model', /max is given more than 100 arguments/],
  ['an expression of 300,000 arguments', (m) => ((m.parameters = { d: 10 }), (m.geometry.holes[0].diameter = `=max(${Array(300_000).fill('d').join(',')})`)), 'model', /longer than the 1000 characters/],
  ['a run of 50 minus signs', (m) => (m.thickness = `=${'-'.repeat(50)}5`), 'model', /more than 32 signs in a row/],
  ['a bad expression of 400,000 characters is not echoed whole', (m) => (m.thickness = `=${'x'.repeat(400_000)}`), 'model', /^(?![\s\S]{3000})[\s\S]*400,000 characters/],
  ['division by zero, with a fix', (m) => ((m.parameters = { gap: 0 }), (m.thickness = '=10/gap')), 'model', /division by zero in "10\/gap"\n[\s\S]*fix: check the divisor/],
  ['the square root of a negative number, with a fix', (m) => (m.thickness = '=sqrt(-1)'), 'model', /square root of a negative number[\s\S]*fix: check the sign/],
  ['a power that overflows, with a fix', (m) => (m.thickness = '=10^400'), 'model', /10\^400[\s\S]*does not give a finite number[\s\S]*fix: the power is too large/],
  // Geometry that once hung the mesher or grew it without bound.
  ['an arc of radius a hair over half its chord, "large", leaving its corner along the edge (once a mesh that never finished)', (m) => (path(m)[1] = { at: [100, 0], edge: 'pull', arc: { radius: 20 + 1e-10, turn: 'cw', large: true } }), 'model', /at geometry\.outline\.path\[1\]\.arc: .*meet at \(100, 0\) running back along each other.*less than the 1 degree/],
  ['the same arc at exactly half its chord (once an internal fault)', (m) => (path(m)[3] = { at: [0, 40], edge: 'held', arc: { radius: 20, turn: 'cw', large: true } }), 'model', /running back along each other/],
  ['a wedge of material of half a degree', (m) => ((path(m)[2].at = [100, 100 * Math.tan(Math.PI / 360)]), path(m).pop(), (m.geometry.holes = []), (m.supports = [{ type: 'fixed', on: 'pull' }]), (m.loads = [{ type: 'traction', on: 'top', normal: 1 }])), 'model', /0\.5 degrees from a full reversal/],
  ['6,000 holes', (m) => (m.geometry.holes = Array.from({ length: 6000 }, (_, k) => ({ shape: 'circle', center: [1 + (k % 100), 1 + Math.floor(k / 100) * 0.5], diameter: 0.1 }))), 'model', /the part has 6000 holes, more than the 4999/],
  ['an outline of 60,000 edges not in line', (m) => (m.geometry.outline.path = Array.from({ length: 60_000 }, (_, k) => ({ at: [50 + 45 * Math.cos((2 * Math.PI * k) / 60_000), 20 + 18 * Math.sin((2 * Math.PI * k) / 60_000)], edge: k === 0 ? 'pull' : k === 30_000 ? 'held' : undefined }))), 'model', /more than 50,000 edges/],
  // Numbers out of the range raiser computes with, and parts too far from the origin for their size.
  ['a traction of 1e200 (once a crash in the section code)', (m) => (m.loads[0].normal = 1e200), 'model', /at loads\[0\]\.normal: the number 1e\+200 is outside the range raiser computes with/],
  ['a modulus of 5e-324 (once "part of the model can move")', (m) => (m.material.E = 5e-324), 'model', /at material\.E: the number 5e-324 is outside the range/],
  ['a part scaled by 1e-120 (once Kt 1.62 for 2.44, exit 0)', (m) => { for (const v of path(m)) v.at = v.at.map((x: number) => x * 1e-120); m.geometry.holes[0].center = [50e-120, 20e-120]; m.geometry.holes[0].diameter = 10e-120; }, 'model', /is outside the range raiser computes with[\s\S]*fix: write the model in units/],
  ['a part 1e12 of its sizes from the origin', (m) => { for (const v of path(m)) v.at[0] += 1e14; m.geometry.holes[0].center[0] += 1e14; }, 'model', /the part lies 100000000000000 from the origin but is only 107\.7 across: its coordinates keep fewer than 4 digits/],
  // Wrong but plausible: caught at the input.
  ['a roller holding the loaded edge in the load\'s direction (once Kt 3104 with exit 0)', (m) => m.supports.push({ type: 'roller', fix: 'x', on: 'pull' }), 'model', /at loads\[0\]: the load acts only in directions in which supports\[1\] \(roller, holding x\) holds its edges/],
  ['a nominal section drawn along an edge (once Kt 686)', (m) => (m.results = { section: { from: [0, 0], to: [100, 0] } }), 'model', /at results\.section: the nominal section runs along edge "bottom", a free edge of the part/],
  ['a 1 nm hole in a 1 m plate (once "touches itself")', (m) => ((m.units = { length: 'm' }), (m.geometry.holes[0].diameter = 1e-9)), 'model', /hole 1 "bore" is 1\.4142e-9 across, less than a millionth of the part/],
  ['an unknown field with a name of 100,000 characters is quoted short', (m) => (m['x'.repeat(100_000)] = 1), 'model', /^(?![\s\S]{3000})[\s\S]*unknown field "xxx[\s\S]*100,000 characters/],
  ['a NUL character in the text, placed', JSON.stringify(base()).replace('"thickness":5', '"thickness":5\u0000'), 'model', /1:\d+: not valid JSON: a NUL character/],
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

  it('a refusal raised while building the geometry or the mesh names the file and the line (once neither)', () => {
    const m = base();
    m.geometry.outline.path[1] = { at: [100, 0], edge: 'pull', arc: { radius: 20, turn: 'cw', large: true } };
    const f = join(dir, 'cusp.json');
    writeFileSync(f, JSON.stringify(m, null, 1));
    for (const command of ['solve', 'mesh']) {
      const r = raiser([command, f, ...(command === 'solve' ? ['--single-mesh'] : [])]);
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toMatch(/cusp\.json:\d+:\d+: at geometry\.outline\.path\[1\]\.arc: .*running back along each other/);
    }
    const big = base();
    big.mesh = { size: 0.02, raiserSize: 0.02 };
    writeFileSync(f, JSON.stringify(big, null, 1));
    const refused = raiser(['solve', f, '--single-mesh', '--max-memory', '1']);
    expect(refused.code, refused.stderr).toBe(3);
    expect(refused.stderr).toMatch(/cusp\.json:\d+:\d+: at mesh(\.size)?: .*GB/);
  });

  it('a valid model too big for --max-memory: exit 3 (cannot analyse, once exit 2 "bad input"), on one mesh and on a series, naming the limit', () => {
    const f = join(dir, 'too-big.json');
    writeFileSync(f, JSON.stringify(base(), null, 1));
    for (const args of [['--single-mesh'], []]) {
      const r = raiser(['solve', f, ...args, '--max-memory', '1MB']);
      expect(r.code, r.stderr).toBe(3);
      // The model leaves "mesh" out (defaults): the file is named but no line, since no line holds it
      // (pointing at the opening brace would show an unrelated excerpt).
      expect(r.stderr).toMatch(/^raiser: cannot analyse: \S*too-big\.json: at mesh: .*about \d+ triangles .*more than the limit of 1\.0 MB[\s\S]*fix: .*--max-memory/);
    }
    // The same model within a sensible limit solves: the refusal is the limit's, not the model's.
    expect(raiser(['solve', f, '--single-mesh', '--max-memory', '4']).code).toBe(0);
  });

  it('--vary "d=5,,6": exit 2 naming the empty value (once a case of d = 0 was solved)', () => {
    const m = base();
    m.parameters = { d: 10 };
    m.geometry.holes[0].diameter = '=d';
    const f = join(dir, 'vary.json');
    writeFileSync(f, JSON.stringify(m));
    const r = raiser(['sweep', f, '--vary', 'd=5,,6', '-o', join(dir, 'vary-out')]);
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/--vary d=5,,6 has an empty value/);
    expect(raiser(['sweep', f, '--vary', 'd=5,0x10', '-o', join(dir, 'vary-out')]).stderr).toMatch(/"0x10" in --vary d=5,0x10 is not a decimal number/);
  });

  it('under a virtual memory limit of 3 GB (ulimit -v) a model solves (once every solve was an internal fault), and a model too large is refused with the limit said', () => {
    if (!existsSync('/proc/self/limits')) return;
    const f = join(dir, 'limited.json');
    writeFileSync(f, JSON.stringify(base()));
    const run = (args: string) => spawnSync('bash', ['-c', `ulimit -v 3000000 && exec "${process.execPath}" "${BIN}" ${args}`], { encoding: 'utf8', timeout: 120_000 });
    const ok = run(`solve "${f}" --single-mesh`);
    expect(ok.status, ok.stderr).toBe(0);
    expect(ok.stdout).toMatch(/Kt net\s+2\.4/);
    const big = base();
    big.mesh = { size: 0.1, raiserSize: 0.05 };
    writeFileSync(f, JSON.stringify(big));
    const refused = run(`solve "${f}" --single-mesh`);
    expect(refused.status, refused.stderr).toBe(3);
    expect(refused.stderr).toMatch(/more than the limit of 1\.\d GB/);
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

/**
 * Hostile and careless files, each run through the command line in a child process with a heap
 * of 512 MB. Every one once hung raiser, exhausted its memory or crashed it; now each must exit
 * with 2 and a message naming the file, the place and the limit, within a bounded peak memory
 * (the child's own high-water mark). No time is asserted: a file that still hung would be stopped
 * by the child's time-out and fail on its missing exit code.
 */
describe('hostile files at the command line, each in a child with a bounded heap', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-hostile-'));
  /** Peak resident memory allowed for a refusal (node itself takes about 60 MB). */
  const PEAK_BYTES = 400 * 2 ** 20;
  type FileCase = [name: string, files: Record<string, string>, message: RegExp];
  const drawing = (name: string, content: string): Record<string, string> => ({ [name]: content, [`${name}.json`]: drawingModel(name) });
  const FILES: FileCase[] = [
    ['a DXF ARC whose end angle is 1e300 (once an endless loop)', drawing('arc.dxf', dxf(`${DXF_RECT}0\nARC\n8\n0\n10\n50\n20\n20\n40\n5\n50\n0\n51\n1e300\n`)), /ARC on layer "0".*start and end angles in degrees \(0, 1e\+300\) are not usable/],
    ['an SVG of <use> elements fanning out 10 ways 10 deep (once 3.7 GB)', drawing('fan.svg', svgUseFanOut(10, 10)), /expands into more than 200,000 elements \(counting every copy that a <use> makes\)/],
    ['a DXF of block INSERTs nested 10 ways 12 deep (once 4 GB)', drawing('nest.dxf', dxf(`${DXF_RECT}0\nINSERT\n2\nB12\n10\n0\n20\n0\n`, nestedBlocks(12, 10))), /expands into more than 200,000 entities \(counting every copy that a block INSERT makes\)/],
    ['a DXF INSERT arrayed 30,000 x 30,000', drawing('array.dxf', dxf(`${DXF_RECT}0\nINSERT\n2\nB0\n10\n0\n20\n0\n70\n30000\n71\n30000\n44\n1\n45\n1\n`, nestedBlocks(0, 1))), /an array of 30000 columns x 30000 rows, more than the 10,000 copies/],
    ['an SVG document type of 120,000 entity declarations (once minutes)', drawing('decl.svg', svgEntityDeclarations(120_000)), /document type declares more than 256 entities/],
    ['an SVG document type of unterminated entity declarations (once quadratic)', drawing('broken-decl.svg', svgEntityDeclarations(30_000, true)), /declares more than 256 entities|not well-formed/],
    ['an SVG entity of 4,000 characters used 1,000 times', drawing('bomb.svg', svgEntityExpansion(4000, 1000)), /expand to more than 1,048,576 characters/],
    ['an SVG nested 100,000 groups deep', drawing('deep.svg', svgDeepGroups(100_000)), /nested more than 256 deep/],
    ['a DXF SPLINE of degree 60 (once degree x knots x points)', drawing('degree.dxf', dxf(dxfLine(0, 0, 100, 0) + dxfLine(100, 0, 100, 40) + dxfLine(0, 40, 0, 0) + dxfSpline(60, 200))), /SPLINE on layer "0".*its degree 60 is above the highest raiser reads, 25/],
    ['a DXF SPLINE of 60,000 control points', drawing('points.dxf', dxf(dxfLine(0, 0, 100, 0) + dxfLine(100, 0, 100, 40) + dxfLine(0, 40, 0, 0) + dxfSpline(3, 60_000))), /60000 control points of degree 3 are more than raiser reads in one spline/],
    ['DXF coordinates "nan"', drawing('nan.dxf', dxf(DXF_RECT.replace('10\n100\n20\n0\n11', '10\nnan\n20\n0\n11'))), /LINE on layer "0", handle \w+: a coordinate or size is not a finite number/],
    ['DXF coordinates "inf"', drawing('inf.dxf', dxf(DXF_RECT.replace('10\n100\n20\n0\n11', '10\ninf\n20\n0\n11'))), /not a finite number/],
    ['a model file in UTF-32 (once called UTF-16)', { 'utf32.json': '' }, /saved as UTF-32 text/],
    ['a DXF of 10,000 circles (once "Set maximum size exceeded")', drawing('circles.dxf', dxf(DXF_RECT.replace(/100/g, '1000').replace(/\n40\n/g, '\n1000\n') + manyCircles(100))), /the drawing has 10001 closed loops, more than the 5000/],
    ['a DXF of 250,000 LINEs (10 MB; once 2.3 GB for 60 MB), refused before parsing', drawing('lines.dxf', dxf(DXF_RECT + dxfLine(1, 1, 2, 2).repeat(250_000))), /holds 250,00\d records \(entities and table entries\), more than the 200,000/],
    ['an SVG of 250,000 elements, refused while parsing', drawing('rects.svg', svgDeepGroups(1).replace('</svg>', '<rect x="1" y="1" width="1" height="1"/>'.repeat(250_000) + '</svg>')), /the SVG file holds more than 200,000 elements/],
    ['a DXF polyline of 250,000 vertices (once "Set maximum size exceeded" at a million)', drawing('poly.dxf', dxf(lwPolylineCircle(250_000))), /more than 200,000 lines, arcs and curves/],
  ];
  // Written as bytes: UTF-32 little-endian with its byte-order mark.
  const utf32 = (text: string) => {
    const b = Buffer.alloc(4 * (text.length + 1));
    b.writeUInt32LE(0xfeff, 0);
    for (let i = 0; i < text.length; i++) b.writeUInt32LE(text.charCodeAt(i), 4 * (i + 1));
    return b;
  };
  for (const [name, files, message] of FILES) {
    it(`${name}: exit 2, saying ${message}`, () => {
      let model = '';
      for (const [f, text] of Object.entries(files)) {
        writeFileSync(join(dir, f), f === 'utf32.json' ? utf32(JSON.stringify(base())) : text);
        if (f.endsWith('.json')) model = f;
      }
      const r = runBounded(['solve', model, '--single-mesh'], { cwd: dir });
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr).toContain(model);
      expect(r.peakBytes).toBeLessThan(PEAK_BYTES);
    });
  }

  it('a drawing that is a link to /dev/zero, a FIFO, an absolute path or a path out of the folder: refused before reading', () => {
    const sub = join(dir, 'models');
    mkdirSync(sub, { recursive: true });
    const cases: [string, RegExp][] = [
      ['zero.svg', /"zero\.svg" is a link to \/dev\/zero, outside the folder of the model file[\s\S]*--allow-drawing-outside/],
      ['pipe.dxf', /"pipe\.dxf" is a named pipe \(FIFO\), not a drawing file/],
      ['/etc/hostname.svg', /is an absolute path; raiser reads only drawings inside the model file's folder/],
      ['../outside.svg', /"\.\.\/outside\.svg" leaves the folder of the model file/],
    ];
    symlinkSync('/dev/zero', join(sub, 'zero.svg'));
    spawnSync('mkfifo', [join(sub, 'pipe.dxf')]);
    writeFileSync(join(dir, 'outside.svg'), svgDeepGroups(1));
    for (const [from, message] of cases) {
      if (from === 'pipe.dxf' && !existsSync(join(sub, from))) continue; // no mkfifo here
      writeFileSync(join(sub, 'm.json'), drawingModel(from));
      const r = runBounded(['solve', 'm.json', '--single-mesh'], { cwd: sub, killAfterMs: 60_000 });
      expect(r.code, `${from}: ${r.stderr}`).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.peakBytes).toBeLessThan(PEAK_BYTES);
    }
    // Allowed by the option, the link is still not a regular file.
    writeFileSync(join(sub, 'm.json'), drawingModel('zero.svg'));
    const r = runBounded(['solve', 'm.json', '--single-mesh', '--allow-drawing-outside'], { cwd: sub, killAfterMs: 60_000 });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/"zero\.svg" is a character device, not a drawing file/);
  });

  it('a drawing or model file beyond the size limit is refused without reading it', () => {
    const big = join(dir, 'big.svg');
    writeFileSync(big, '');
    truncateSync(big, 65 * 2 ** 20); // sparse: no disk, no time
    writeFileSync(join(dir, 'big.json'), drawingModel('big.svg'));
    const r = runBounded(['solve', 'big.json', '--single-mesh'], { cwd: dir });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/the drawing "big\.svg" is 65 MiB, more than the 64 MiB raiser reads/);
    expect(r.peakBytes).toBeLessThan(PEAK_BYTES);
    const model = join(dir, 'huge-model.json');
    writeFileSync(model, '');
    truncateSync(model, 17 * 2 ** 20);
    const m = runBounded(['solve', model, '--single-mesh'], { cwd: dir });
    expect(m.code, m.stderr).toBe(2);
    expect(m.stderr).toMatch(/is 17 MiB, more than the 16 MiB a model file may be/);
    expect(m.peakBytes).toBeLessThan(PEAK_BYTES);
  });
});

/** Output folders: checked before any solving, and locked against a second run. */
describe('the output folder', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-out-'));
  const model = join(dir, 'plate.json');
  writeFileSync(model, JSON.stringify(base()));
  writeFileSync(join(dir, 'a-file'), 'not a folder');
  const refusals: [string, string[], RegExp][] = [
    ['-o "" (once exit 0 with nothing written)', ['-o', ''], /at -o: the folder's name is empty/],
    ['-o naming a file (once an internal fault after the whole solve)', ['-o', join(dir, 'a-file')], /at -o: .*a-file is a file, not a folder/],
    ['-o /dev/null', ['-o', '/dev/null'], /at -o: \/dev\/null is a device, not a folder/],
    ['--export-matrix naming a file', ['--export-matrix', join(dir, 'a-file')], /at --export-matrix: .*a-file is a file, not a folder/],
    ['-o /proc/nonexistent/x (once a hang in the recursive mkdir)', ['-o', '/proc/nonexistent/x'], /cannot be made|not writable/],
  ];
  for (const [name, args, message] of refusals) {
    it(`${name}: exit 2 before solving`, () => {
      if (args[1].startsWith('/proc') && !existsSync('/proc/self')) return;
      const r = runBounded(['solve', model, '--single-mesh', ...args], { killAfterMs: 60_000 });
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stdout).toBe(''); // nothing was solved or summarised
    });
  }

  it('two solves into one folder at once: one refuses naming the lock owner, the other writes only its own model', async () => {
    const out = join(dir, 'shared');
    const a = base();
    a.title = 'run A (invented)';
    const b = base();
    b.title = 'run B (invented)';
    b.geometry.holes[0].diameter = 16;
    writeFileSync(join(dir, 'a.json'), JSON.stringify(a));
    writeFileSync(join(dir, 'b.json'), JSON.stringify(b));
    const run = (f: string) =>
      new Promise<{ code: number | null; stderr: string }>((resolve) => {
        const c = spawn(process.execPath, [BIN, 'solve', join(dir, f), '--single-mesh', '--no-pictures', '-o', out, '--force']);
        let stderr = '';
        c.stderr.on('data', (d) => (stderr += d));
        c.on('exit', (code) => resolve({ code, stderr }));
      });
    const [ra, rb] = await Promise.all([run('a.json'), run('b.json')]);
    const winners = [ra, rb].filter((r) => r.code === 0);
    const losers = [ra, rb].filter((r) => r.code !== 0);
    // Both may finish when the first ends before the second starts; never both write at once.
    for (const l of losers) {
      expect(l.code, l.stderr).toBe(2);
      expect(l.stderr).toMatch(/the output folder .*shared is in use by another raiser run: pid \d+ on .*, started /);
    }
    expect(winners.length).toBeGreaterThanOrEqual(1);
    const result = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    const title = result.model.title as string;
    expect(['run A (invented)', 'run B (invented)']).toContain(title);
    const saved = readSaved(out);
    expect(saved.result.model.title).toBe(title);
    const nodes = readFileSync(join(out, 'nodes.csv'), 'utf8').trim().split('\n').length - 1;
    expect(nodes).toBe(saved.mesh.nNodes);
    expect(readFileSync(join(out, 'result.vtu'), 'utf8')).toContain(`NumberOfPoints="${saved.mesh.nNodes}"`);
    expect(existsSync(join(out, '.raiser-lock'))).toBe(false);
  });

  it('a lock left by a run that was killed is taken over', () => {
    const out = join(dir, 'stale');
    mkdirSync(out, { recursive: true });
    const gone = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
    writeFileSync(join(out, '.raiser-lock'), JSON.stringify({ pid: Number(gone.stdout), host: hostname(), started: '2026-01-01T00:00:00Z', command: 'raiser solve' }));
    writeFileSync(join(out, `nodes.csv.raiser-tmp-${gone.stdout}-0000`), 'half a file');
    const r = runBounded(['solve', model, '--single-mesh', '--no-pictures', '-o', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(readdirSync(out).filter((f) => f.startsWith('.raiser-lock') || f.includes('.raiser-tmp-'))).toEqual([]);
  });
});

/** Files raiser wrote, read back: validated like model files, an edited or damaged one never trusted. */
describe('saved solutions and sweep cases read back', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-saved-'));
  const model = join(dir, 'plate.json');
  const m = base();
  m.parameters = { d: 10 };
  m.geometry.holes[0].diameter = '=d';
  writeFileSync(model, JSON.stringify(m));
  const out = join(dir, 'out');
  const solved = raiser(['solve', model, '--single-mesh', '--no-pictures', '-o', out]);
  const good = readFileSync(join(out, 'solution.raiser'));
  /** The saved file with its header text changed in place (same length) and, if asked, its checksum made anew. */
  const tampered = (from: string, to: string, reseal: boolean): string => {
    const b = Buffer.from(good);
    const hl = b.readUInt32LE(12);
    const header = b.toString('utf8', 48, 48 + hl);
    expect(header).toContain(from);
    expect(to.length).toBe(from.length);
    b.write(header.replace(from, to), 48, 'utf8');
    if (reseal) createHash('sha256').update(b.subarray(48)).digest().copy(b, 16);
    const f = join(dir, `tampered-${from.length}-${reseal}.raiser`);
    writeFileSync(f, b);
    return f;
  };
  const saved: [string, () => string, RegExp][] = [
    ['a saved solution edited after it was written', () => tampered('"createdAt":"2', '"createdAt":"1', false), /checksum does not match its content/],
    ['a saved solution whose header lacks the mesh (once a crash of plot)', () => tampered('"mesh":{"order"', '"mesx":{"order"', true), /header is incomplete: mesh/],
    ['a saved solution whose counts do not fit its arrays', () => tampered(`"nNodes":${JSON.parse(good.toString('utf8', 48, 48 + good.readUInt32LE(12))).mesh.nNodes}`, `"nNodes":${'9'.repeat(String(JSON.parse(good.toString('utf8', 48, 48 + good.readUInt32LE(12))).mesh.nNodes).length)}`, true), /need more data|entries where the mesh counts ask for/],
    ['a saved solution that is a link to /dev/zero', () => {
      const f = join(dir, 'zero.raiser');
      if (!existsSync(f)) symlinkSync('/dev/zero', f);
      return f;
    }, /a character device, not a saved solution/],
  ];
  for (const [name, make, message] of saved) {
    it(`${name}: raiser plot exits 2, saying ${message}`, () => {
      expect(solved.code, solved.stderr).toBe(0);
      const r = runBounded(['plot', make(), '-o', join(dir, 'pictures'), '--force'], { killAfterMs: 60_000 });
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.peakBytes).toBeLessThan(400 * 2 ** 20);
    });
  }

  it('a sweep case file edited, or without a field, is solved again on resume, not trusted', () => {
    const sweepOut = join(dir, 'sweep');
    const first = raiser(['sweep', model, '--vary', 'd=8,12', '--single-mesh', '--jobs', '1', '-o', sweepOut]);
    expect(first.code, first.stderr).toBe(0);
    const casesDir = join(sweepOut, 'cases');
    const [a, b] = readdirSync(casesDir).filter((f) => f.endsWith('.json')).sort();
    const fileA = JSON.parse(readFileSync(join(casesDir, a), 'utf8'));
    const ktA = fileA.row.ktNet;
    fileA.row.ktNet = 1.01; // an edit that a checksum over the content finds
    writeFileSync(join(casesDir, a), JSON.stringify(fileA));
    const fileB = JSON.parse(readFileSync(join(casesDir, b), 'utf8'));
    delete fileB.row.peak;
    writeFileSync(join(casesDir, b), JSON.stringify(fileB));
    const again = raiser(['sweep', model, '--vary', 'd=8,12', '--single-mesh', '--jobs', '1', '-o', sweepOut, '--force']); // --force: the chart of the first run is replaced; its cases are still checked and reused
    expect(again.code, again.stderr).toBe(0);
    expect(again.stdout).toMatch(/2 cases \(0 kept from an earlier run\)/);
    expect(again.stdout).toMatch(/solved again: the case file .* \(its checksum does not match its content/);
    expect(again.stdout).toMatch(/solved again: the case file .* \(row\.peak: /);
    const redone = JSON.parse(readFileSync(join(casesDir, a), 'utf8'));
    expect(redone.row.ktNet).toBeCloseTo(ktA, 12);
  });
});
