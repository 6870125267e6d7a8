/**
 * Bad drawings give clear errors, placed at geometry.from in the model file: where the problem
 * is in the drawing, how big, and what to do. Each drawing is an invented test file in meshes/.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildDomain } from '../src/geometry/domain.js';
import { ModelError } from '../src/model/errors.js';
import { loadModelAndDrawing, type LoadedModelAndDrawing } from '../src/pipeline/load.js';

const MESHES = join(import.meta.dirname, '..', 'meshes');

function load(geometry: Record<string, unknown>, dir = MESHES, loads: unknown[] = [{ type: 'pressure', on: { outline: true }, p: 1 }]) {
  const m = { material: { E: 210000, nu: 0.3 }, thickness: 5, geometry, supports: [{ type: 'fixed', on: { outline: true } }], loads };
  return loadModelAndDrawing(JSON.stringify(m, null, 2), join(dir, 'test-model.json'));
}

/** The domain of a loaded model, built from the drawing loaded beside it. */
const domainOf = (loaded: LoadedModelAndDrawing) => buildDomain(loaded.model.geometry, loaded.drawing);

function errorOf(geometry: Record<string, unknown>, dir?: string): ModelError {
  try {
    load(geometry, dir);
  } catch (e) {
    if (e instanceof ModelError) return e;
    throw e;
  }
  throw new Error('no error');
}

describe('bad drawings', () => {
  it('an open contour names the gap, where it is and how wide, and offers "join"', () => {
    const e = errorOf({ from: 'import-bad-gap.dxf' });
    expect(e.path).toBe('geometry.from');
    expect(e.line).toBeGreaterThan(0);
    expect(e.message).toMatch(/open contour/);
    expect(e.message).toMatch(/a gap of 0\.5 between \(0, 0\), the end of LINE on layer "0", handle \w+, and \(0, 0\.5\)/);
    expect(e.hint).toMatch(/"join": 0\.505/);
  });
  it('the offered "join" closes the gap', () => {
    const loaded = load({ from: 'import-bad-gap.dxf', join: 0.505 });
    const d = domainOf(loaded);
    expect(d.loops.length).toBe(1);
    // The two line ends meet half way: the rectangle loses a sliver of 0.5 x 100 / 2 / 2 at most.
    expect(Math.abs(Math.abs(d.area) - 4000)).toBeLessThan(0.5 * 100);
  });
  it('an SVG path that stops short of its start is an open contour between its own ends', () => {
    const e = errorOf({ from: 'import-bad-open.svg' });
    expect(e.message).toMatch(/a gap of 2 between the ends of <path id="profile"> \(line 5\), at \(0, 40\) and \(0, 38\)/);
  });
  it('overlapping outlines name both shapes and where they cross', () => {
    const e = errorOf({ from: 'import-bad-overlap.svg' });
    expect(e.message).toMatch(/<rect id="left-part"> \(line 5\) and the loop of <rect id="right-part"> \(line 6\) cross near \(60, 30\): overlapping outlines/);
  });
  it('a drawing with no closed loop says so, and what was skipped', () => {
    const e = errorOf({ from: 'import-bad-noloop.dxf' });
    expect(e.message).toMatch(/no closed loop/);
    expect(e.message).toMatch(/TEXT \(annotation\) skipped: 1/);
  });
  it('unknown units: an SVG width in furlongs, a DXF in astronomical units', () => {
    expect(errorOf({ from: 'import-bad-units.svg' }).message).toMatch(/width "100furlong" has a unit raiser does not know/);
    const d = errorOf({ from: 'import-bad-units.dxf' });
    expect(d.message).toMatch(/\$INSUNITS 18, astronomical units/);
    expect(d.hint).toMatch(/"unit"/);
    // Saying the unit in the model reads it.
    expect(domainOf(load({ from: 'import-bad-units.dxf', unit: 'mm' })).loops.length).toBe(1);
  });
  it('unsupported entities are named with their layer and handle, and "ignore" leaves their layer out', () => {
    const e = errorOf({ from: 'import-bad-entities.dxf' });
    expect(e.message).toMatch(/cannot import: 1 XLINE \(on layer "CONSTRUCTION", handle \w+\), 1 RAY \(on layer "CONSTRUCTION", handle \w+\)/);
    const loaded = load({ from: 'import-bad-entities.dxf', ignore: ['CONSTRUCTION'] });
    expect(Math.abs(domainOf(loaded).area)).toBeCloseTo(1000, 9);
  });
  it('an outline name the drawing does not have lists the names it has', () => {
    const e = errorOf({ from: 'import-plate-hole.dxf', outline: 'PLATE' });
    expect(e.message).toMatch(/no closed loop of the drawing has the layer "PLATE"/);
    expect(e.hint).toMatch(/"EDGE"/);
  });
  it('a tag for a load that the drawing does not have suggests the drawing\'s own', () => {
    const m = { material: { E: 210000, nu: 0.3 }, thickness: 5, geometry: { from: 'import-plate-hole.dxf' }, supports: [{ type: 'fixed', on: 'EDGE' }], loads: [{ type: 'traction', on: 'pull', normal: 1 }] };
    expect(() => loadModelAndDrawing(JSON.stringify(m), join(MESHES, 'm.json'))).toThrow(/no edge or loop has the tag "pull": did you mean "PULL"\?/);
  });
  it('a missing drawing, a file that is not a drawing, and a mix of "from" with written loops', () => {
    expect(errorOf({ from: 'no-such-part.svg' }).message).toMatch(/no such drawing: "no-such-part.svg"/);
    expect(errorOf({ from: 'part.step' }).message).toMatch(/neither an SVG nor a DXF drawing/);
    expect(errorOf({ from: 'import-plate-hole.svg', outline: { shape: 'circle', center: [0, 0], radius: 1 } }).message).toMatch(/names a drawing \("from"\) and also writes out "outline"/);
  });
  it('broken files: XML that is not well-formed, path data that cannot be read, an unsupported SVG element', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
    const svg = (body: string) => `<?xml version="1.0"?>\n<!-- invented test drawing -->\n<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm" viewBox="0 0 10 10">\n${body}\n</svg>\n`;
    writeFileSync(join(dir, 'a.svg'), svg('<rect x="0" y="0" width="5" height="5">'));
    writeFileSync(join(dir, 'b.svg'), svg('<path id="p" d="M 0 0 L 5 x Z"/>'));
    writeFileSync(join(dir, 'c.svg'), svg('<rect x="0" y="0" width="5" height="5"/><textPath id="t"/>'));
    writeFileSync(join(dir, 'd.svg'), svg('<rect x="0" y="0" width="5" height="5"/>').replace('width="10mm" height="10mm"', 'width="100%" height="100%"'));
    expect(errorOf({ from: 'a.svg' }, dir).message).toMatch(/not well-formed XML/);
    expect(errorOf({ from: 'b.svg' }, dir).message).toMatch(/<path id="p"> \(line 4\): its path data cannot be read/);
    expect(errorOf({ from: 'c.svg' }, dir).message).toMatch(/<textPath id="t"> \(line 4\): <textPath> elements are not supported/);
    expect(errorOf({ from: 'd.svg' }, dir).message).toMatch(/relative \(%\), so the drawing has no physical size/);
  });
  it('a drawing that declares no physical size is read by the SVG rules (1 px = 1/96 in), with a warning', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
    writeFileSync(join(dir, 'px.svg'), '<svg xmlns="http://www.w3.org/2000/svg"><!-- invented test drawing --><rect width="96" height="48"/></svg>');
    const loaded = load({ from: 'px.svg' }, dir);
    expect(loaded.warnings.map((w) => w.message).join('\n')).toMatch(/no physical size.*1\/96 in/);
    expect(Math.abs(domainOf(loaded).area)).toBeCloseTo(25.4 * 12.7, 9);
  });
});

describe('drawings with the usual flaws of real ones', () => {
  const dxfOf = (entities: string[]) =>
    ['999', 'invented test drawing', '0', 'SECTION', '2', 'HEADER', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES', ...entities, '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
  const line = (layer: string, x0: number, y0: number, x1: number, y1: number) => ['0', 'LINE', '8', layer, '10', `${x0}`, '20', `${y0}`, '30', '0', '11', `${x1}`, '21', `${y1}`, '31', '0'];
  const rect = [...line('A', 0, 0, 50, 0), ...line('A', 50, 0, 50, 20), ...line('A', 50, 20, 0, 20), ...line('A', 0, 20, 0, 0)];
  it('a line drawn twice is left out once, and said so', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
    writeFileSync(join(dir, 'dup.dxf'), dxfOf([...rect, ...line('A', 50, 20, 50, 0)]));
    const loaded = load({ from: 'dup.dxf' }, dir);
    const d = domainOf(loaded);
    expect(Math.abs(d.area)).toBeCloseTo(1000, 9);
    expect(d.edges.length).toBe(4);
    expect(loaded.drawing!.notes.join('\n')).toMatch(/1 duplicate entity \(the same curve drawn twice\) left out: LINE on layer "A"/);
  });
  it('three ends at one point are a branch, named with the entities that meet there', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
    writeFileSync(join(dir, 't.dxf'), dxfOf([...rect, ...line('CENTRE', 25, 0, 25, -10)]));
    const e = errorOf({ from: 't.dxf' }, dir);
    expect(e.message).toMatch(/open contour/);
    expect(e.message).toMatch(/LINE on layer "CENTRE", handle \w+, from \(25, 0\) to \(25, -10\), meets no other piece at either end/);
    expect(e.hint).toMatch(/"ignore"/);
    writeFileSync(join(dir, 'branch.dxf'), dxfOf([...rect, ...line('X', 50, 20, 70, 20), ...line('X', 70, 20, 50, 0)]));
    const b = errorOf({ from: 'branch.dxf' }, dir);
    expect(b.message).toMatch(/3 pieces meet at \(50, 20\), where only two may/);
  });
  it('a curve whose control point sits on its end still makes a corner there, and an S curve is split at its inflection', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
    writeFileSync(
      join(dir, 's.svg'),
      '<svg xmlns="http://www.w3.org/2000/svg" width="40mm" height="20mm" viewBox="0 0 40 20"><!-- invented test drawing -->' +
        '<path d="M0 20 V10 C 10 0 30 20 40 10 C 40 10 45 15 40 20 Z"/></svg>',
    );
    const d = domainOf(load({ from: 's.svg' }, dir));
    const curves = d.edges.filter((e) => e.curve.kind === 'bezier');
    // The S cubic is split at t = 1/2, where it turns the other way; each piece bends one way.
    expect(curves.length).toBe(3);
    const mid = curves.find((e) => {
      const c = e.curve as { p: number[] };
      return Math.abs(c.p[0] - 20) < 1e-9 || Math.abs(c.p[c.p.length - 2] - 20) < 1e-9;
    });
    expect(mid).toBeDefined();
    // The corner at (40, 10) between the S curve and the next one is found, though dp/dt of the next is zero there.
    expect(d.corners.some((c) => Math.hypot(c.x - 40, c.y - 10) < 1e-12)).toBe(true);
  });
  it('an SVG whose namespace is declared as an entity of its internal DTD subset is read', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-import-'));
    writeFileSync(
      join(dir, 'dtd.svg'),
      '<?xml version="1.0"?>\n<!-- invented test drawing -->\n<!DOCTYPE svg PUBLIC "-//W3C//DTD SVG 1.1//EN" "svg11.dtd" [\n<!ENTITY ns_svg "http://www.w3.org/2000/svg">\n]>\n' +
        '<svg xmlns="&ns_svg;" width="100mm" height="40mm" viewBox="0 0 100 40"><rect width="100" height="40"/><circle cx="50" cy="20" r="5"/></svg>',
    );
    const d = domainOf(load({ from: 'dtd.svg' }, dir));
    expect(d.loops.length).toBe(2);
    expect(Math.abs(d.area)).toBeCloseTo(4000 - 25 * Math.PI, 9);
  });
});
