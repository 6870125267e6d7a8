/**
 * `raiser size` and `raiser sweep` solve on worker threads (one pool, src/sweep/pool.ts); an error crosses the thread boundary as its name,
 * message and hint. It must come back as the kind it was thrown as, so the command's exit status
 * is the one a solve in the main thread would give (2 bad input, 3 analysis refused, 1 fault):
 * a too-big model is a refusal, not a fault.
 */
import { describe, expect, it } from 'vitest';
import { AnalysisError, InternalError, ModelError, ModelTooLargeError } from '../src/model/errors.js';
import { errorOfWorker } from '../src/sweep/pool.js';

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
