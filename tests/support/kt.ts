/** Reading a result the way the tests need it: the governing raiser's Kt values and its evaluation. */
import { governingKt, settleAnalyses } from '../../src/pipeline/certify.js';
import type { Analysis } from '../../src/pipeline/analyse.js';
import type { RaiserEvaluation } from '../../src/post/evaluate.js';

/** The governing raiser's Kt values (net, gross, remote: null where withheld). */
export function ktOf(a: Analysis) {
  return governingKt(a);
}

/** The governing raiser's evaluation on the analysis's mesh; throws when no raiser governs. */
export function governing(a: Analysis): RaiserEvaluation {
  const s = settleAnalyses([a], [1], a.named);
  if (s.governing < 0) throw new Error('no raiser governs this analysis');
  return a.evaluation.raisers[s.governing];
}
