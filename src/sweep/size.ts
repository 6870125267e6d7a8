/**
 * Sizing: the smallest (or largest) value of one dimension in a range that meets a Kt or stress
 * limit, by bracketing and section search on certified solutions. A case meets the limit when
 * its value plus its error band does: Kt (1 + band) <= limit. The search assumes one change
 * from failing to meeting in the range (a monotone effect, as of a fillet radius on Kt). Each
 * round solves `jobs` values spaced evenly inside the bracket, in parallel on worker threads
 * (one value per round, plain bisection, when jobs is 1), and keeps the two neighbours where
 * failing turns to meeting. It stops when the bracket is at most `tolerance` (a length in the
 * model's units), or, when no tolerance is given, at 0.2% of the range or as soon as the
 * meeting value is within 2% of the limit.
 */
import { ModelError } from '../model/errors.js';
import { resolveUnits } from '../model/units.js';
import { readSweepSource, type Vary } from './cases.js';
import { solveCaseFull, type CaseOptions, type CaseRow, type SolvedCase } from './solve-case.js';
import { CasePool } from './pool.js';

export interface SizeOptions extends CaseOptions {
  name: string;
  lo: number;
  hi: number;
  ktMax?: number;
  stressMax?: number;
  kt?: 'net' | 'gross';
  largest?: boolean;
  /** stop when the bracket is at most this long, in the model's length unit (default: 0.2% of the range, or 2% of the limit reached) */
  tolerance?: number;
  /** solutions at most (default 24) */
  maxSteps?: number;
  /** solutions at a time, on worker threads (default 1) */
  jobs?: number;
  /** each solution as it comes, with the model's stress unit and the unit of the varied value (null for a model parameter) */
  onStep?: (row: CaseRow, meets: boolean, units: { stress: string; value: string | null }) => void;
}

export interface SizeResult {
  met: boolean;
  value: number | null;
  row: CaseRow | null;
  /** (limit - value with band) / limit at the answer */
  margin: number | null;
  limit: number;
  quantity: string;
  /** the bracket left around the answer, in the model's length unit */
  bracket: number | null;
  /** the bracket the search aimed at (null: the default rule) */
  tolerance: number | null;
  steps: { value: number; quantity: number; band: number; meets: boolean }[];
  message: string;
  /** the model's length and stress units */
  units: { length: string; stress: string };
  /** the unit of the varied value: the length unit for a template's dimension, null for a model parameter (its unit is the model's to say) */
  valueUnit: string | null;
  /** the chosen design solved here, when it was (jobs 1 or solved again for its files); not in JSON */
  solved?: SolvedCase;
}

interface Evaluated {
  row: CaseRow;
  q: number;
  meets: boolean;
  full?: SolvedCase;
}

export async function runSize(file: string, opts: SizeOptions): Promise<SizeResult> {
  if ((opts.ktMax === undefined) === (opts.stressMax === undefined)) {
    throw new ModelError('--kt-max', 'give one limit: --kt-max or --stress-max', 'for example --kt-max 1.8');
  }
  if (!(opts.hi > opts.lo)) throw new ModelError('--vary', `the range ${opts.lo}:${opts.hi} must run upward`, 'write --vary name=low:high');
  if (opts.tolerance !== undefined && !(opts.tolerance > 0)) throw new ModelError('--tolerance', `the tolerance ${opts.tolerance} must be a positive length`, 'for example --tolerance 0.05');
  const vary: Vary[] = [{ name: opts.name, values: [opts.lo, opts.hi] }];
  const caseOpts: CaseOptions = { target: opts.target ?? 0.005, singleMesh: opts.singleMesh, element: opts.element, measure: opts.measure };
  const jobs = Math.max(1, opts.jobs ?? 1);
  // the workers start first: they load their modules while this thread reads the model
  const pool = jobs > 1 && CasePool.available() ? new CasePool(file, vary, { ...caseOpts, allowDrawingOutside: opts.allowDrawingOutside }, jobs) : null;
  let src;
  try {
    src = readSweepSource(file, vary, { allowDrawingOutside: opts.allowDrawingOutside });
  } catch (err) {
    await pool?.close();
    throw err;
  }
  const u = resolveUnits(src.model.units);
  const which = opts.kt ?? 'net';
  const limit = (opts.ktMax ?? opts.stressMax)!;
  const quantity = opts.ktMax !== undefined ? `Kt ${which}` : 'peak stress';
  const steps: SizeResult['steps'] = [];
  const cache = new Map<number, Evaluated>();
  const judge = (v: number, row: CaseRow, full?: SolvedCase): Evaluated => {
    const raw = opts.ktMax !== undefined ? (which === 'net' ? row.ktNet : row.ktGross) : Math.abs(row.peak);
    if (raw === null) throw new ModelError('--vary', `at ${opts.name} = ${v} the peak does not converge (a sharp corner): no Kt to size on`, 'model the real corner radius');
    const band = row.error ?? 0;
    const meets = raw * (1 + band) <= limit;
    const r = { row, q: raw, meets, full };
    cache.set(v, r);
    steps.push({ value: v, quantity: raw, band, meets });
    opts.onStep?.(row, meets, { stress: u.stress, value: src.kind === 'template' ? u.length : null });
    return r;
  };
  const key = (v: number) => `${opts.name}=${v}`;
  /** Solves the values not solved yet: in parallel on the pool, else here, one by one, keeping the analyses. */
  const evaluate = async (values: number[]): Promise<Evaluated[]> => {
    const todo = values.filter((v, i) => !cache.has(v) && values.indexOf(v) === i);
    if (pool && todo.length > 1) {
      const rows = await pool.solveEach(todo.map((v) => ({ key: key(v), values: { [opts.name]: v } })));
      rows.forEach((row, i) => judge(todo[i], row));
    } else {
      for (const v of todo) {
        const full = solveCaseFull(src, key(v), { [opts.name]: v }, caseOpts);
        judge(v, full.row, full);
      }
    }
    return values.map((v) => cache.get(v)!);
  };
  // An analysis is kept only for the current answer: the others are let go as the search moves.
  const release = (keep: Evaluated) => {
    for (const e of cache.values()) if (e !== keep) e.full = undefined;
  };
  const marginOf = (e: Evaluated) => (limit - e.q * (1 + (e.row.error ?? 0))) / limit;
  const valueUnit = src.kind === 'template' ? u.length : null;
  const withUnit = (v: number) => `${v}${valueUnit ? ` ${valueUnit}` : ''}`;
  const qUnit = opts.stressMax !== undefined ? ` ${u.stress}` : '';
  const limitText = `${limit}${qUnit}`;
  const base = { limit, quantity, steps, tolerance: opts.tolerance ?? null, units: { length: u.length, stress: u.stress }, valueUnit };
  try {
    // For the smallest value, the "good" end is where the limit is met.
    let good = opts.largest ? opts.lo : opts.hi;
    let bad = opts.largest ? opts.hi : opts.lo;
    const [eBad, eGood] = pool ? await evaluate([bad, good]) : [(await evaluate([bad]))[0], undefined];
    if (eBad.meets) {
      release(eBad);
      return { ...base, met: true, value: bad, row: eBad.row, margin: marginOf(eBad), bracket: 0, solved: eBad.full, message: `the ${opts.largest ? 'largest' : 'smallest'} value of the range, ${opts.name} = ${withUnit(bad)}, already meets ${quantity} <= ${limitText}` };
    }
    const eG = eGood ?? (await evaluate([good]))[0];
    if (!eG.meets) {
      return { ...base, met: false, value: null, row: null, margin: null, bracket: null, message: `no value of ${opts.name} in ${withUnit(opts.lo)} ... ${withUnit(opts.hi)} meets ${quantity} <= ${limitText}: at ${withUnit(good)} it is ${eG.q.toPrecision(4)}${qUnit} (band ${(100 * (eG.row.error ?? 0)).toPrecision(2)}%)` };
    }
    const tol = opts.tolerance ?? 0.002 * (opts.hi - opts.lo);
    const maxSteps = opts.maxSteps ?? 24;
    let best = eG;
    release(best);
    while (steps.length < maxSteps) {
      if (Math.abs(good - bad) <= tol) break;
      if (opts.tolerance === undefined && best.q * (1 + (best.row.error ?? 0)) >= 0.98 * limit) break;
      const k = Math.min(jobs, maxSteps - steps.length);
      // k values evenly inside the bracket, from the failing end to the meeting end.
      const inner = Array.from({ length: k }, (_, i) => bad + ((good - bad) * (i + 1)) / (k + 1));
      const es = await evaluate(inner);
      // The meeting values next to the meeting end: the first failing one from that end is the new failing end.
      let j = k - 1;
      while (j >= 0 && es[j].meets) j--;
      if (j < k - 1) {
        good = inner[j + 1];
        best = es[j + 1];
        release(best);
      }
      if (j >= 0) bad = inner[j];
    }
    return {
      ...base,
      met: true,
      value: good,
      row: best.row,
      margin: marginOf(best),
      bracket: Math.abs(good - bad),
      solved: best.full,
      message: `${opts.name} = ${withUnit(Number(good.toPrecision(6)))} is the ${opts.largest ? 'largest' : 'smallest'} value found that meets ${quantity} <= ${limitText}, bracketed within ${withUnit(Number(Math.abs(good - bad).toPrecision(3)))}`,
    };
  } finally {
    await pool?.close();
  }
}

/** The chosen design of a sizing solved (again, when it was solved on a worker thread) with its analysis, for its files. */
export function solveChosen(file: string, opts: SizeOptions, res: SizeResult): SolvedCase {
  if (res.solved) return res.solved;
  if (res.value === null) throw new ModelError('--vary', 'no value met the limit: there is no design to write');
  const src = readSweepSource(file, [{ name: opts.name, values: [opts.lo, opts.hi] }], { allowDrawingOutside: opts.allowDrawingOutside });
  return solveCaseFull(src, `${opts.name}=${res.value}`, { [opts.name]: res.value }, { target: opts.target ?? 0.005, singleMesh: opts.singleMesh, element: opts.element, measure: opts.measure });
}
