/**
 * report.pdf: `raiser solve -o DIR --pdf` and `raiser report DIR --pdf` print the HTML report
 * through the machine's Chromium (playwright-core drives it; nothing is downloaded). Checks the
 * PDF's pages and size, the sign-off fields from the model's report object and from the
 * options (in the report as Chromium lays it out), the page numbers and running header of the
 * print style, and the message when no Chromium is found. The browser tests are skipped, with
 * the reason printed, where no Chromium is installed; the missing-browser test always runs.
 */
import { describe, expect, it, beforeAll, afterAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ROOT } from './support/cli.js';
import { countPdfPages } from '../src/report/pdf.js';
import { chromiumUnavailable, openChromium } from './support/chromium.js';

const BIN = join(ROOT, 'dist/cli/raiser.js');

function raiser(args: string[], env: NodeJS.ProcessEnv = {}) {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: ROOT, encoding: 'utf8', timeout: 240_000, env: { ...process.env, ...env } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const missing = chromiumUnavailable('report-pdf.test.ts');

/** The strap example with a report object: the model's own sign-off fields. */
function strapWithReport(dir: string): string {
  const model = JSON.parse(readFileSync(join(ROOT, 'examples/strap-bolt-hole.json'), 'utf8'));
  delete model.$schema;
  model.report = { project: 'Hoist rig 7 (invented)', part: 'HR7-0042', revision: 'A', preparedBy: 'Model Preparer' };
  const file = join(dir, 'strap.json');
  writeFileSync(file, JSON.stringify(model));
  return file;
}

describe('countPdfPages', () => {
  it('counts /Type /Page objects and not the /Pages tree', () => {
    const pdf = Buffer.from('%PDF-1.4\n1 0 obj <</Type /Pages /Count 2>> endobj\n2 0 obj <</Type /Page>> endobj\n3 0 obj <</Type/Page /Parent 1 0 R>> endobj\n', 'latin1');
    expect(countPdfPages(pdf)).toBe(2);
  });
});

describe('report.pdf without a browser', () => {
  it('report DIR --pdf with RAISER_CHROMIUM pointing nowhere says how to get one, keeps report.html and exits 4', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-nopdf-'));
    const out = join(dir, 'out');
    const solved = raiser(['solve', strapWithReport(dir), '--single-mesh', '-o', out]);
    expect(solved.code).toBe(0);
    const r = raiser(['report', out, '--pdf', '--checked-by', 'Cli Checker'], { RAISER_CHROMIUM: join(dir, 'no-such-browser') });
    expect(r.code).toBe(4);
    expect(r.stderr).toContain('report.pdf not written');
    expect(r.stderr).toContain('apt install chromium');
    expect(r.stderr).toContain('RAISER_CHROMIUM');
    expect(r.stdout).toContain('report.html');
    expect(existsSync(join(out, 'report.pdf'))).toBe(false);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain('Cli Checker');
    expect(html).toContain('Model Preparer');
  });

  it('solve --pdf without -o is refused before solving (exit 2)', () => {
    const r = raiser(['solve', 'examples/strap-bolt-hole.json', '--single-mesh', '--pdf']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('-o DIR');
  });
});

describe.skipIf(missing !== null)('report.pdf through headless Chromium', () => {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-pdf-'));
  const out = join(dir, 'out');
  let solved: ReturnType<typeof raiser>;
  let ctx: import('playwright-core').BrowserContext;

  beforeAll(async () => {
    // The options give the checker and a new revision over the model's "A".
    solved = raiser(['solve', strapWithReport(dir), '--single-mesh', '-o', out, '--pdf', '--checked-by', 'Cli Checker', '--revision', 'C']);
    ctx = await openChromium();
  }, 240_000);

  afterAll(async () => {
    await ctx?.close();
  });

  it('solve -o DIR --pdf prints report.pdf: a PDF of 3 to 15 A4 pages, 50 kB to 20 MB', () => {
    expect(solved.code).toBe(0);
    expect(solved.stdout).toMatch(/wrote .*report\.pdf \(\d+ pages, A4/);
    const pdf = readFileSync(join(out, 'report.pdf'));
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const pages = countPdfPages(pdf);
    expect(pages).toBeGreaterThanOrEqual(3);
    expect(pages).toBeLessThanOrEqual(15);
    expect(solved.stdout).toContain(`(${pages} pages, A4`);
    expect(pdf.length).toBeGreaterThan(50_000);
    expect(pdf.length).toBeLessThan(20_000_000);
    // A4 is 595 x 842 points.
    expect(pdf.toString('latin1')).toMatch(/\/MediaBox\s*\[\s*0 0 595\.?\d* 841\.?\d*|\/MediaBox\s*\[\s*0 0 595\.?\d* 842/);
  });

  it('the sign-off holds the model\'s fields and the options over them, with lines to sign', async () => {
    const page = await ctx.newPage();
    await page.goto('file://' + join(out, 'report.html'));
    const signoff = (await page.textContent('#signoff'))!;
    expect(signoff).toContain('Hoist rig 7 (invented)');
    expect(signoff).toContain('HR7-0042');
    expect(await page.textContent('#prepared-by')).toBe('Model Preparer');
    expect(await page.textContent('#checked-by')).toBe('Cli Checker');
    // no approver given: the line is there, empty, to be signed by hand
    expect(await page.textContent('#approved-by')).toBe('');
    expect(signoff).toMatch(/revision\s*C/);
    expect(signoff).not.toMatch(/revision\s*A/);
    expect(await page.$$eval('#signoff td.sign', (x) => x.length)).toBe(3);
    await page.close();
  });

  it('prints a running header (title, part, revision) and "page N of M" on every page', () => {
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    const style = /<style>([\s\S]*?)<\/style>/.exec(html)![1];
    expect(style).toMatch(/@bottom-right\s*\{\s*content:\s*"page " counter\(page\) " of " counter\(pages\)/);
    expect(style).toMatch(/@top-left\s*\{\s*content:\s*"Lifting strap with an off-centre bolt hole {2}\| {2}part HR7-0042 {2}\| {2}rev\. C"/);
  });

  it('raiser report DIR --pdf writes both again with other sign-off fields', () => {
    const before = statSync(join(out, 'report.pdf')).mtimeMs;
    const r = raiser(['report', out, '--pdf', '--approved-by', 'Approving Lead', '--paper', 'letter']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/report\.pdf \(\d+ pages, Letter/);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain('Approving Lead');
    // the saved solution carries the sign-off of the solve: the checker stays
    expect(html).toContain('Cli Checker');
    const pdf = readFileSync(join(out, 'report.pdf'));
    expect(statSync(join(out, 'report.pdf')).mtimeMs).toBeGreaterThan(before);
    // Letter is 612 x 792 points.
    expect(pdf.toString('latin1')).toMatch(/\/MediaBox\s*\[\s*0 0 612 792/);
    expect(countPdfPages(pdf)).toBeGreaterThanOrEqual(3);
  });
});
