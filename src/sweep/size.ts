/**
 * Sizing: the smallest (or largest) value of one dimension in a range that meets a Kt or stress
 * limit, by bracketing and bisection on certified solutions. A case meets the limit when its
 * value plus its error band does: Kt (1 + band) <= limit. Bisection assumes one change from
 * failing to meeting in the range (a monotone effect, as of a fillet radius on Kt), and stops
 * when the bracket is below `tolerance` of the range or the meeting value is within 2% of the
 * limit.
 */
import { ModelError } from '../model/errors.js';
import { readSweepSource, type Vary } from './cases.js';
import { solveCase, type CaseOptions, type CaseRow } from './solve-case.js';

export interface SizeOptions extends CaseOptions {
  name: string;
  lo: number;
  hi: number;
  ktMax?: number;
  stressMax?: number;
  kt?: 'net' | 'gross';
  largest?: boolean;
  /** stop when the bracket is below this fraction of the range (default 0.002) */
  tolerance?: number;
  maxSteps?: number;
  onStep?: (row: CaseRow, meets: boolean) => void;
}

export interface SizeResult {
  met: boolean;
  value: number | null;
  row: CaseRow | null;
  /** (limit - value with band) / limit at the answer */
  margin: number | null;
  limit: number;
  quantity: string;
  steps: { value: number; quantity: number; band: number; meets: boolean }[];
  message: string;
}

export function runSize(file: string, opts: SizeOptions): SizeResult {
  if ((opts.ktMax === undefined) === (opts.stressMax === undefined)) {
    throw new ModelError('--kt-max', 'give one limit: --kt-max or --stress-max', 'for example --kt-max 1.8');
  }
  if (!(opts.hi > opts.lo)) throw new ModelError('--vary', `the range ${opts.lo}:${opts.hi} must run upward`, 'write --vary name=low:high');
  const vary: Vary[] = [{ name: opts.name, values: [opts.lo, opts.hi] }];
  const src = readSweepSource(file, vary, { allowDrawingOutside: opts.allowDrawingOutside });
  const which = opts.kt ?? 'net';
  const limit = (opts.ktMax ?? opts.stressMax)!;
  const quantity = opts.ktMax !== undefined ? `Kt ${which}` : 'peak stress';
  const caseOpts: CaseOptions = { target: opts.target ?? 0.005, singleMesh: opts.singleMesh, element: opts.element, measure: opts.measure };
  const steps: SizeResult['steps'] = [];
  const cache = new Map<number, { row: CaseRow; q: number; meets: boolean }>();
  const evaluate = (v: number) => {
    const hit = cache.get(v);
    if (hit) return hit;
    const row = solveCase(src, `${opts.name}=${v}`, { [opts.name]: v }, caseOpts);
    const raw = opts.ktMax !== undefined ? (which === 'net' ? row.ktNet : row.ktGross) : Math.abs(row.peak);
    if (raw === null) throw new ModelError('--vary', `at ${opts.name} = ${v} the peak does not converge (a sharp corner): no Kt to size on`, 'model the real corner radius');
    const band = row.error ?? 0;
    const q = raw;
    const meets = q * (1 + band) <= limit;
    const r = { row, q, meets };
    cache.set(v, r);
    steps.push({ value: v, quantity: q, band, meets });
    opts.onStep?.(row, meets);
    return r;
  };
  // For the smallest value, the "good" end is where the limit is met.
  let good = opts.largest ? opts.lo : opts.hi;
  let bad = opts.largest ? opts.hi : opts.lo;
  const eBad = evaluate(bad);
  if (eBad.meets) {
    const margin = (limit - eBad.q * (1 + (eBad.row.error ?? 0))) / limit;
    return { met: true, value: bad, row: eBad.row, margin, limit, quantity, steps, message: `the ${opts.largest ? 'largest' : 'smallest'} value of the range, ${bad}, already meets the limit` };
  }
  const eGood = evaluate(good);
  if (!eGood.meets) {
    return { met: false, value: null, row: null, margin: null, limit, quantity, steps, message: `no value of ${opts.name} in ${opts.lo} ... ${opts.hi} meets ${quantity} <= ${limit}: at ${good} it is ${eGood.q.toPrecision(4)} (band ${(100 * (eGood.row.error ?? 0)).toPrecision(2)}%)` };
  }
  const tol = (opts.tolerance ?? 0.002) * (opts.hi - opts.lo);
  let best = eGood;
  for (let k = 0; k < (opts.maxSteps ?? 24); k++) {
    if (Math.abs(good - bad) <= tol) break;
    if (best.q * (1 + (best.row.error ?? 0)) >= 0.98 * limit) break;
    const mid = 0.5 * (good + bad);
    const e = evaluate(mid);
    if (e.meets) {
      good = mid;
      best = e;
    } else bad = mid;
  }
  const margin = (limit - best.q * (1 + (best.row.error ?? 0))) / limit;
  return {
    met: true,
    value: good,
    row: best.row,
    margin,
    limit,
    quantity,
    steps,
    message: `${opts.name} = ${Number(good.toPrecision(6))} is the ${opts.largest ? 'largest' : 'smallest'} value found that meets ${quantity} <= ${limit}, bracketed within ${Number(Math.abs(good - bad).toPrecision(3))}`,
  };
}
