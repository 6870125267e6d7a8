/**
 * `raiser size` and `raiser sweep` solve on worker threads (one pool, src/sweep/pool.ts); an error crosses the thread boundary as its name,
 * message and hint. It must come back as the kind it was thrown as, so the command's exit status
 * is the one a solve in the main thread would give (2 bad input, 3 analysis refused, 1 fault):
 * a too-big model is a refusal, not a fault.
 */
import { describe, expect, it } from 'vitest';
import { AnalysisError, InternalError, ModelError, ModelTooLargeError } from '../src/model/errors.js';
import { CasePool, errorOfWorker } from '../src/sweep/pool.js';

function across(err: Error) {
  return errorOfWorker({ ok: false, message: err.message, name: err.name, hint: (err as { hint?: string }).hint });
}

describe('errors posted back by a size worker', () => {
  it('a model error stays a model error, with its hint', () => {
    const e = across(new ModelError('mesh.size', 'the size must be positive', 'give a length'));
    expect(e).toBeInstanceOf(ModelError);
    expect((e as ModelError).describe()).toContain('give a length');
  });

  it('a refusal to analyse, and a model too big for the memory limit, come back as refusals', () => {
    expect(across(new AnalysisError('the part can move freely', 'add a support'))).toBeInstanceOf(AnalysisError);
    const big = across(new ModelTooLargeError('mesh', 'needs about 9 GB, more than the limit of 1 MB', 'a coarser mesh'));
    expect(big).toBeInstanceOf(AnalysisError);
    expect(big).not.toBeInstanceOf(ModelError);
    expect((big as AnalysisError).hint).toBe('a coarser mesh');
  });

  it('a fault stays a fault, and anything else is a plain error', () => {
    expect(across(new InternalError('a check failed'))).toBeInstanceOf(InternalError);
    const other = across(new RangeError('bad'));
    expect(other).not.toBeInstanceOf(ModelError);
    expect(other).not.toBeInstanceOf(AnalysisError);
  });
});

/**
 * Regression (issue 17, the pool started before the model is read): a worker that fails as it
 * starts must make its cases fail with its error, never leave them waiting forever nor throw an
 * 'error' event nobody listens to. Run from the sources, the pool's worker file does not exist
 * (only dist/ has worker.js), which is such a failure at start.
 */
describe('a sweep worker that fails at start', () => {
  it('fails its case with its error, whether the case is sent before or after the failure', async () => {
    const pool = new CasePool('no-model.json', [{ name: 'd', values: [1, 2] }], {}, 2);
    const early = pool.solveEach([{ key: 'd=1', values: { d: 1 } }]);
    await expect(early).rejects.toThrow();
    await new Promise((r) => setTimeout(r, 200));
    await expect(pool.solveEach([{ key: 'd=1', values: { d: 1 } }, { key: 'd=2', values: { d: 2 } }])).rejects.toThrow();
    await pool.close();
  });
});
