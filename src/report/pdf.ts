/**
 * report.pdf: the HTML report printed by a headless Chromium, driven through playwright-core
 * (no browser is downloaded; raiser uses the Chromium already on the machine). playwright-core
 * is imported only when a PDF is asked for, so no other command pays for loading it.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { writeAtomic } from './atomic.js';

/** Where a Chromium or Chrome is commonly installed, tried in this order after $RAISER_CHROMIUM. */
const CHROMIUM_PATHS = [
  '/usr/bin/chromium',
  '/usr/bin/chromium-browser',
  '/usr/bin/google-chrome',
  '/usr/bin/google-chrome-stable',
  '/snap/bin/chromium',
  '/Applications/Chromium.app/Contents/MacOS/Chromium',
  '/Applications/Google Chrome.app/Contents/MacOS/Google Chrome',
  'C:\\Program Files\\Google\\Chrome\\Application\\chrome.exe',
];

/** How to get a browser, for the message when none is found. */
const CHROMIUM_HOWTO =
  'install Chromium (on Debian or Ubuntu: apt install chromium) or Google Chrome, or set RAISER_CHROMIUM to the path of a Chromium or Chrome executable; report.html can also be printed to PDF from any browser (File, Print)';

/** A PDF that could not be made: no browser, or the browser failed. The HTML report stands. */
export class PdfError extends Error {
  constructor(
    message: string,
    readonly fix: string,
  ) {
    super(message);
  }
}

/** The Chromium to print with: $RAISER_CHROMIUM when set (and only it), else the first common path that exists. */
export function findChromium(env: NodeJS.ProcessEnv = process.env): string {
  const given = env.RAISER_CHROMIUM;
  if (given !== undefined && given !== '') {
    if (!existsSync(given)) throw new PdfError(`RAISER_CHROMIUM is ${given}, which does not exist`, CHROMIUM_HOWTO);
    return given;
  }
  const found = CHROMIUM_PATHS.find((p) => existsSync(p));
  if (!found) throw new PdfError(`no Chromium or Chrome found (looked at ${CHROMIUM_PATHS.slice(0, 5).join(', ')} and the usual places on macOS and Windows)`, CHROMIUM_HOWTO);
  return found;
}

export type Paper = 'A4' | 'Letter';

/**
 * Prints the HTML file to a PDF beside it (written atomically) and returns its page count.
 * Headless, no sandbox (it may run as root in a container), no GPU, no network services, and a
 * fresh profile in a temporary folder removed afterwards.
 */
export async function printReportPdf(htmlPath: string, pdfPath: string, paper: Paper = 'A4'): Promise<{ pages: number; bytes: number; chromium: string }> {
  const executablePath = findChromium();
  let chromium: typeof import('playwright-core').chromium;
  try {
    ({ chromium } = await import('playwright-core'));
  } catch (e) {
    throw new PdfError(`the playwright-core package cannot be loaded (${(e as Error).message})`, 'reinstall raiser with its dependencies (npm ci)');
  }
  const profile = mkdtempSync(join(tmpdir(), 'raiser-chromium-'));
  try {
    let ctx;
    try {
      ctx = await chromium.launchPersistentContext(profile, {
        executablePath,
        headless: true,
        args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
        timeout: 60_000,
      });
    } catch (e) {
      throw new PdfError(`${executablePath} did not start as a headless browser: ${(e as Error).message.split('\n')[0]}`, CHROMIUM_HOWTO);
    }
    try {
      const page = await ctx.newPage();
      await page.goto(pathToFileURL(resolve(htmlPath)).href, { waitUntil: 'load' });
      // The page size is the paper's; the margins are the report's own (@page), where the running header and page numbers sit.
      const pdf = await page.pdf({ format: paper, printBackground: true, margin: undefined });
      writeAtomic(pdfPath, pdf);
      return { pages: countPdfPages(pdf), bytes: pdf.length, chromium: executablePath };
    } finally {
      await ctx.close();
    }
  } finally {
    rmSync(profile, { recursive: true, force: true });
  }
}

/** The number of page objects (/Type /Page, not /Pages) in a PDF. */
export function countPdfPages(pdf: Uint8Array): number {
  return (Buffer.from(pdf).toString('latin1').match(/\/Type\s*\/Page(?![a-zA-Z])/g) ?? []).length;
}
