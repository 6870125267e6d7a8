/**
 * The command line's options as a user meets them: output folders refused before anything is
 * solved, `raiser new <template> --help`, templates and charts under one name, the picture size
 * option of solve and plot, and the options of sweep and size. Single meshes and small models,
 * so each case solves in about a second.
 */
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { CHARTS } from '../src/charts/library.js';
import { ktSteppedBarTension } from '../src/charts/formulas.js';
import { TEMPLATES } from '../src/model/templates.js';
import { raiser } from './support/cli.js';

const tmp = mkdtempSync(join(tmpdir(), 'raiser-cli-options-'));

/** A stepped bar made by the template (D 60, d 40, r 4 mm): the small model of these tests. */
function steppedBar(name: string): string {
  const f = join(tmp, name);
  writeFileSync(f, raiser(['new', 'stepped-bar', '--D', '60', '--d', '40', '--r', '4']).stdout);
  return f;
}

/** A folder already holding `file` from an earlier run. */
function folderHolding(name: string, file: string): string {
  const dir = join(tmp, name);
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, file), 'from an earlier run\n');
  return dir;
}

/**
 * A refusal of bad input before any work: exit 2, nothing on stdout, and stderr holding only
 * the one message and its fix (no progress line of a solve: no Kt, no "[1/", no "the limit").
 */
function expectRefusedBeforeSolving(r: { code: number | null; stdout: string; stderr: string }, says: string): void {
  expect(r.code, r.stderr).toBe(2);
  expect(r.stdout).toBe('');
  expect(r.stderr).toContain(says);
  expect(r.stderr).not.toMatch(/Kt|\[\d+\/\d+\]|the limit|nodes|peak/);
  expect(r.stderr.trim().split('\n').every((l) => l.startsWith('raiser: bad input') || l.startsWith('  fix:'))).toBe(true);
}

describe('output folders are checked before anything is solved', () => {
  const model = steppedBar('out-check.json');
  // A path under a regular file can never be a folder: refused whoever runs the test (root writes anywhere).
  const file = join(tmp, 'a-file');
  writeFileSync(file, 'not a folder\n');

  it('solve -o: files of an earlier run without --force, and a folder that cannot be made', () => {
    expectRefusedBeforeSolving(raiser(['solve', model, '-o', folderHolding('solve-old', 'result.json')]), '--force');
    // the convergence picture is written by a certified solve, so it is checked too
    expectRefusedBeforeSolving(raiser(['solve', model, '-o', folderHolding('solve-old-conv', 'convergence.png')]), 'convergence.png');
    expectRefusedBeforeSolving(raiser(['solve', model, '-o', join(file, 'out')]), '-o');
  });

  it('sweep -o: the chart of an earlier sweep without --force, and a folder that cannot be made', () => {
    expectRefusedBeforeSolving(raiser(['sweep', model, '--vary', 'r=3:5:2', '--single-mesh', '-o', folderHolding('sweep-old', 'sweep.csv')]), '--force');
    expectRefusedBeforeSolving(raiser(['sweep', model, '--vary', 'r=3:5:2', '--single-mesh', '-o', join(file, 'out')]), '-o');
  });

  it('size -o: files of an earlier run without --force, and a folder that cannot be made', () => {
    expectRefusedBeforeSolving(raiser(['size', model, '--vary', 'r=2:12', '--kt-max', '1.8', '--single-mesh', '-o', folderHolding('size-old', 'model.json')]), '--force');
    expectRefusedBeforeSolving(raiser(['size', model, '--vary', 'r=2:12', '--kt-max', '1.8', '--single-mesh', '-o', folderHolding('size-old-result', 'result.json')]), 'result.json');
    expectRefusedBeforeSolving(raiser(['size', model, '--vary', 'r=2:12', '--kt-max', '1.8', '--single-mesh', '-o', join(file, 'out')]), '-o');
  });

  it('mesh -o: a preview already there without --force, and a folder that cannot be made', () => {
    expectRefusedBeforeSolving(raiser(['mesh', model, '-o', folderHolding('mesh-old', 'mesh-preview.png')]), '--force');
    expectRefusedBeforeSolving(raiser(['mesh', model, '-o', join(file, 'out')]), '-o');
  });

  it('a picture size that cannot be drawn is refused before the solve too', () => {
    expectRefusedBeforeSolving(raiser(['solve', model, '--single-mesh', '-o', join(tmp, 'never-drawn'), '--picture-size', '10x10']), '--picture-size');
    expect(existsSync(join(tmp, 'never-drawn', 'result.json'))).toBe(false);
  });
});

describe('raiser new <template> --help', () => {
  it('lists that template\'s parameters with meaning, unit, default and the range of its charts, not the program\'s help', () => {
    const r = raiser(['new', 'plate-with-hole', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).not.toContain('Commands:');
    expect(r.stdout).toContain('plate-with-hole: central circular hole');
    expect(r.stdout).toMatch(/--W\s+plate width \(also --width\); default 100 mm/);
    expect(r.stdout).toMatch(/--d\s+hole diameter \(also --diameter\); default 20 mm/);
    expect(r.stdout).toMatch(/--stress\s+.*default 100 MPa/);
    expect(r.stdout).toContain('(mm | cm | m | in | ft)');
    // the range of the published chart of the family (REFERENCES.md: Howland's data, d/W up to 0.5)
    expect(r.stdout).toContain('hole-in-strip: 0 <= d/W <= 0.5');
  });

  it('-h works as --help, anywhere after the template name; an unknown template gets a suggestion', () => {
    const r = raiser(['new', 'stepped-bar', '--D', '50', '-h']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/--loading\s+.*\(tension \| bending\); default tension/);
    expect(r.stdout).toContain('fillet-tension:');
    const bad = raiser(['new', 'steped-bar', '--help']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('did you mean "stepped-bar"');
  });

  it('raiser new --help is the command\'s own help, and raiser new still lists the templates', () => {
    const h = raiser(['new', '--help']);
    expect(h.code).toBe(0);
    expect(h.stdout).toContain('Usage: raiser new');
    expect(h.stdout).toContain('raiser new <template> --help');
    expect(raiser(['new']).stdout).toContain('stepped-bar:');
  });
});

describe('templates and charts share one vocabulary', () => {
  it('every chart names real templates, and every template with a chart family is named by some chart', () => {
    const names = TEMPLATES.map((t) => t.name);
    for (const c of CHARTS) for (const t of c.templates) expect(names, c.id).toContain(t);
    for (const t of ['plate-with-hole', 'plate-with-elliptical-hole', 'stepped-bar', 'u-notched-bar', 'edge-notched-bar', 'lug']) {
      expect(CHARTS.some((c) => c.templates.includes(t)), t).toBe(true);
    }
  });

  it('raiser charts plate-with-hole evaluates the charts of the family; the chart id still works alone', () => {
    const fam = raiser(['charts', 'plate-with-hole', '--W', '100', '--d', '20', '--json']);
    expect(fam.code, fam.stderr).toBe(0);
    const j = JSON.parse(fam.stdout);
    expect(j.template).toBe('plate-with-hole');
    const strip = j.charts.find((c: { id: string }) => c.id === 'hole-in-strip');
    // Pilkey & Pilkey (2008) chart 4.1 fit at d/W = 0.2: Ktn = 2.519 (REFERENCES.md section 3), 2% tolerance.
    expect(Math.abs(strip.kt / 2.519 - 1)).toBeLessThan(0.02);
    const alone = JSON.parse(raiser(['charts', 'hole-in-strip', '--W', '100', '--d', '20', '--json']).stdout);
    expect(alone.kt).toBe(strip.kt);
    // The infinite-plate limit has no dimensions: named, not evaluated as if it were this plate's value.
    expect(j.charts.map((c: { id: string }) => c.id)).not.toContain('kirsch');
  });

  it('raiser charts stepped-bar lists fillet-tension and fillet-bending, and evaluates them with the template\'s dimensions', () => {
    const list = raiser(['charts', 'stepped-bar']);
    expect(list.code).toBe(0);
    expect(list.stdout).toContain('fillet-tension:');
    expect(list.stdout).toContain('fillet-bending:');
    const r = raiser(['charts', 'stepped-bar', '--D', '60', '--d', '40', '--r', '6', '--stress', '100']);
    expect(r.code, r.stderr).toBe(0);
    // the same fit as the chart id alone (Pilkey & Pilkey 2008 chart 3.1 fit, [M])
    expect(r.stdout).toContain(`Kt net = ${Number(ktSteppedBarTension(60, 40, 6).toPrecision(4))}`);
    expect(r.stdout).toContain('not used by any chart: --stress');
  });

  it('an unknown name gets a suggestion among charts and templates; a template without a chart says so', () => {
    const r = raiser(['charts', 'steped-bar']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('did you mean "stepped-bar"');
    const c = raiser(['charts', 'hole-in-strp']);
    expect(c.stderr).toContain('did you mean "hole-in-strip"');
    const link = raiser(['charts', 'link']);
    expect(link.code).toBe(2);
    expect(link.stderr).toContain('no published chart for the family of the template "link"');
  });
});

describe('--picture-size of solve and plot (--size is the old name)', () => {
  const model = steppedBar('pictures.json');
  const out = join(tmp, 'pictures');

  it('solve --picture-size draws at that size; --help shows it and hides --size', () => {
    const r = raiser(['solve', model, '--single-mesh', '-o', out, '--picture-size', '800x500']);
    expect(r.code, r.stderr).toBe(0);
    const png = PNG.sync.read(readFileSync(join(out, 'contour.png')));
    expect([png.width, png.height]).toEqual([800, 500]);
    const help = raiser(['solve', '--help']).stdout;
    expect(help).toContain('--picture-size <WxH>');
    expect(help).not.toMatch(/--size\b/);
    expect(raiser(['plot', '--help']).stdout).toContain('--picture-size <WxH>');
  });

  it('--size still works, with a one-line notice on stderr', () => {
    const r = raiser(['plot', out, '-o', join(tmp, 'old-size'), '--only', 'contour', '--format', 'png', '--size', '700x450']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('write --picture-size');
    const png = PNG.sync.read(readFileSync(join(tmp, 'old-size', 'contour.png')));
    expect([png.width, png.height]).toEqual([700, 450]);
  });
});

describe('sweep --measure and --force', () => {
  const model = steppedBar('sweep.json');

  it('--measure is the measure of every case, and --force replaces an earlier chart', () => {
    const out = join(tmp, 'sweep-measure');
    const a = raiser(['sweep', model, '--vary', 'r=4:5:2', '--single-mesh', '-o', out, '--json']);
    expect(a.code, a.stderr).toBe(0);
    // an earlier chart is not replaced without --force ...
    expect(raiser(['sweep', model, '--vary', 'r=4:5:2', '--single-mesh', '-o', out]).code).toBe(2);
    // ... and with it, another measure solves every case again (the kept cases were of another measure)
    const b = raiser(['sweep', model, '--vary', 'r=4:5:2', '--single-mesh', '-o', out, '--force', '--measure', 'sxy', '--json']);
    expect(b.code, b.stderr).toBe(0);
    const rowsA = JSON.parse(a.stdout).rows as { peak: number }[];
    const rowsB = JSON.parse(b.stdout).rows as { peak: number }[];
    // At the fillet, a free edge, the shear stress along the bar axes is far below the largest principal stress.
    for (let i = 0; i < 2; i++) expect(Math.abs(rowsB[i].peak)).toBeLessThan(0.5 * rowsA[i].peak);
    expect(raiser(['sweep', model, '--vary', 'r=4:5:2', '--measure', 'nope']).code).toBe(2);
  });
});

describe('size -o, --jobs, --tolerance and units', () => {
  const model = steppedBar('size.json');

  it('brackets the fillet radius within --tolerance on two threads and writes the chosen design as solve -o does', () => {
    const out = join(tmp, 'size-out');
    const r = raiser(['size', model, '--vary', 'r=4:12', '--kt-max', '1.8', '--single-mesh', '--jobs', '2', '--tolerance', '3', '-o', out, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.met).toBe(true);
    expect(j.bracket).toBeLessThanOrEqual(3);
    expect(j.tolerance).toBe(3);
    expect(j.units).toEqual({ length: 'mm', stress: 'MPa' });
    // two ends, then one round of two values inside the bracket (8/3 mm apart): four solutions
    expect(j.steps).toHaveLength(4);
    expect(j.row.ktNet).toBeLessThanOrEqual(1.8);
    // The chosen design's model file carries the chosen radius, and its solution is the one sized.
    const written = JSON.parse(readFileSync(join(out, 'model.json'), 'utf8'));
    expect(written.chart.dims.r).toBe(j.value);
    const result = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    expect(result.kt.net).toBeCloseTo(j.row.ktNet, 10);
    for (const f of ['solution.raiser', 'contour.png', 'report.html', 'size.json']) expect(existsSync(join(out, f)), f).toBe(true);
    // Against the chart 3.1 fit (Pilkey & Pilkey 2008, [M]) at the chosen radius: within its 5% spread.
    expect(Math.abs(j.row.ktNet / ktSteppedBarTension(60, 40, j.value) - 1)).toBeLessThan(0.05);
  });

  it('prints a unit with every number', () => {
    const r = raiser(['size', model, '--vary', 'r=10:12', '--stress-max', '400', '--single-mesh']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('r = 10 mm, already meets peak stress <= 400 MPa');
    expect(r.stdout).toMatch(/peak stress there: [\d.]+ MPa; limit 400 MPa/);
    expect(r.stdout).toMatch(/peak [\d.]+ MPa at \([\d.]+, [\d.]+\) mm/);
    expect(r.stderr).toMatch(/r = 10 mm: Kt net [\d.]+, peak [\d.]+ MPa: meets the limit/);
  });

  it('a tolerance that is not a positive length is bad input', () => {
    const r = raiser(['size', model, '--vary', 'r=4:12', '--kt-max', '1.8', '--tolerance', '-1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--tolerance');
  });
});
