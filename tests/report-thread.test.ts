/**
 * report.html drawn in a worker thread (src/report/report-thread.ts) is the same text as drawn in
 * the calling thread: the worker runs the same functions on a structured clone of the plot source
 * (HTML Living Standard, "structured clone": typed arrays are copied element for element), so
 * every byte must agree, pictures included. The worker is the built one (dist/report/
 * report-worker.js, as `raiser solve -o` runs it); the sources alone have no worker file, and
 * there the report is drawn in the calling thread, which the second check holds.
 * Model: the bundled invented strap (examples/strap-bolt-hole.json), one mesh.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { loadModelFile } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { plotSource } from '../src/report/saved.js';
import { startReportHtml } from '../src/report/report-thread.js';

const DIST = fileURLToPath(new URL('../dist/', import.meta.url));
const MODEL = fileURLToPath(new URL('../examples/strap-bolt-hole.json', import.meta.url));

describe('the report drawn in a worker thread', () => {
  it('is the same text, byte for byte, as the report drawn in the calling thread (built code)', () => {
    const script = `
      const D = ${JSON.stringify(DIST)};
      const { loadModelFile } = await import(D + 'model/load.js');
      const { analyseModel } = await import(D + 'pipeline/analyse.js');
      const { buildResult } = await import(D + 'report/result.js');
      const { plotSource } = await import(D + 'report/saved.js');
      const { startReportHtml } = await import(D + 'report/report-thread.js');
      const a = analyseModel(loadModelFile(${JSON.stringify(MODEL)}).model);
      const src = plotSource(a, buildResult(a, 'strap.json', null), '2026-01-01T00:00:00.000Z');
      const w = startReportHtml(src);
      const inWorker = w.inWorker;
      const there = w.finish();
      const here = startReportHtml(src, { worker: false }).finish();
      process.stdout.write(JSON.stringify({ inWorker, same: there === here, length: there.length, images: (there.match(/data:image\\/png;base64,/g) ?? []).length }));
    `;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout) as { inWorker: boolean; same: boolean; length: number; images: number };
    // a machine with one processor draws in the calling thread (no worker to test there)
    expect(out.inWorker).toBe(availableParallelism() >= 2);
    expect(out.same).toBe(true);
    // six pictures: one mesh has no convergence chart (it needs a series of two meshes or more)
    expect(out.images).toBe(6);
    expect(out.length).toBeGreaterThan(1e5);
  }, 120_000);

  it('without the built worker file (the sources run directly) draws in the calling thread', () => {
    const a = analyseModel(loadModelFile(MODEL).model);
    const src = plotSource(a, buildResult(a, 'strap.json', null), '2026-01-01T00:00:00.000Z');
    const p = startReportHtml(src);
    expect(p.inWorker).toBe(false);
    expect(p.finish()).toContain('data:image/png;base64,');
  }, 120_000);
});
