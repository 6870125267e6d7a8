/**
 * Headless Chromium for the browser tests (the report laid out and printed as a reader sees it).
 * The browser is the machine's own (Debian's chromium, or RAISER_CHROMIUM), found as `raiser`
 * finds it for a PDF; `.ci/run` installs it where it is missing. Where none can be had the tests
 * that need one are skipped and say why on stderr, never a silent pass.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BrowserContext } from 'playwright-core';
import { findChromium } from '../../src/report/pdf.js';

/** Why no Chromium can be used here, or null when one can; prints the reason, naming the test file. */
export function chromiumUnavailable(testFile: string): string | null {
  try {
    findChromium();
    return null;
  } catch (e) {
    const reason = (e as Error).message;
    process.stderr.write(`${testFile}: the browser checks are skipped, headless Chromium is not available: ${reason}\n`);
    return reason;
  }
}

/** A fresh headless Chromium with its own profile, laid out at `viewport` CSS pixels. */
export async function openChromium(viewport?: { width: number; height: number }): Promise<BrowserContext> {
  const { chromium } = await import('playwright-core');
  return chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'raiser-chromium-')), {
    executablePath: findChromium(),
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    ...(viewport ? { viewport } : {}),
  });
}
