/**
 * What a series of meshes says about each raiser: whether its peak sits at a singular point,
 * the error band and extrapolation of each of its Kt values (computed on the Kt series itself,
 * since the peak and the nominal stress both move with the mesh), which Kt is its headline, and
 * which raiser governs. Also which singular candidates really are singular: those whose stress
 * keeps growing under refinement.
 *
 * A peak that grows under refinement: over the last three meshes it rises, by more than
 * GROWTH_FLOOR on the last step, and either that rise exceeds SINGULAR_RISE, the change does not
 * shrink, or the observed order is below half the element's (src/post/convergence.ts).
 * A stress that converges shrinks its changes by about 2^p per halving of the mesh size. At a
 * sharp re-entrant corner the stress is singular in theory (Williams 1952) and no series is
 * needed. With fewer than three meshes a peak at a candidate is unsettled: no Kt is given.
 */
import { gridConvergence, type GciResult } from './convergence.js';
import type { MeshEvaluation } from './evaluate.js';
import type { KtKind, KtValue } from './kt.js';
import type { SingularCandidate } from './singular.js';

export type RaiserStatus = 'ok' | 'singular' | 'unsettled';

export interface SettledKt extends KtValue {
  /** relative error band of the value (GCI), null without a series */
  error: number | null;
  band: [number, number] | null;
  extrapolated: number | null;
  gci: GciResult | null;
}

export interface SettledRaiser {
  index: number;
  status: RaiserStatus;
  /** why the raiser has no Kt (singular or unsettled), else null */
  reason: string | null;
  /** the singular candidate its peak sits at, or -1 */
  candidate: number;
  /** the Kt values of the finest mesh, with their bands */
  kt: SettledKt[];
  /** the band of the raiser's peak stress */
  peakGci: GciResult | null;
  /** the headline Kt: the first available of given, remote, net, gross; null when all are withheld */
  primary: KtKind | null;
}

export interface SettledSingular {
  candidate: number;
  /** the stress there on each mesh */
  stresses: number[];
  /** grows under refinement (true), converges (false) or cannot tell (null: fewer than three meshes) */
  grows: boolean | null;
}

export interface Settlement {
  raisers: SettledRaiser[];
  /** index of the governing raiser (highest peak among those with a Kt, or the one the model names), or -1 */
  governing: number;
  /** the singular points worth reporting */
  singular: SettledSingular[];
}

const PRIMARY_ORDER: readonly KtKind[] = ['given', 'remote', 'net', 'bearing', 'gross'];
/** The least rise of the last refinement step that counts as growth (our choice, 0.5%: see growsUnderRefinement). */
const GROWTH_FLOOR = 0.005;
/** A rise of the last refinement step above which a peak grows whatever the order seen (our choice, 3%). */
const SINGULAR_RISE = 0.03;
/** A raiser peak under this fraction of the largest stress at the raisers and singular points does not govern (our choice). */
const NEGLIGIBLE = 0.05;

/** Whether a series of stresses grows under refinement (null with fewer than three values). */
function growsUnderRefinement(sizes: readonly number[], values: readonly number[], order: number): boolean | null {
  if (values.length < 3) return null;
  const mags = values.map(Math.abs);
  const n = mags.length;
  if (!(mags[n - 1] > mags[n - 2] && mags[n - 2] > mags[n - 3])) return false;
  // Growth at the level of remeshing noise is not a singularity: even a weak one (stress ~
  // r^-0.05) rises by over 1.7% per refinement step of sqrt 2.
  const rise = (mags[n - 1] - mags[n - 2]) / mags[n - 1];
  if (rise < GROWTH_FLOOR) return false;
  // A rise of several percent on the finest meshes is no convergence at all: a regular peak on
  // meshes meant for about 0.5% changes by a fraction of a percent there.
  if (rise > SINGULAR_RISE) return true;
  const g = gridConvergence(sizes, mags, order);
  return g.behaviour === 'diverging' || (g.behaviour === 'monotone' && !(g.observedOrder >= 0.5 * order));
}

/** The largest of many values (a loop: spreading a long list into Math.max overflows the call stack). */
function largest(values: readonly number[]): number {
  let m = 0;
  for (const v of values) if (v > m) m = v;
  return m;
}

function fmt(v: number): string {
  return Number(v.toPrecision(4)).toString();
}

/**
 * Settles a series of mesh evaluations (coarse to fine; `sizes` the relative mesh size of each),
 * for elements of convergence order `order`. `named` is the raiser the model names as the one
 * to headline, or -1.
 */
export function settleSeries(series: readonly MeshEvaluation[], sizes: readonly number[], order: number, candidates: readonly SingularCandidate[], named = -1, stressUnit = ''): Settlement {
  const last = series[series.length - 1];
  const raisers: SettledRaiser[] = last.raisers.map((ev, i) => {
    const peaks = series.map((m) => m.raisers[i].peak.stress);
    let status: RaiserStatus = 'ok';
    let reason: string | null = null;
    const k = ev.atCandidate;
    if (k >= 0) {
      const c = candidates[k];
      const grows = c.kind === 'sharp-corner' ? true : growsUnderRefinement(sizes, peaks, order);
      if (grows === true) {
        status = 'singular';
        const seen = series.length >= 2 ? `: the peak grows as the mesh is refined (${peaks.slice(-3).map(fmt).join(', ')} ${stressUnit})` : '';
        reason = `its peak sits at ${c.what}, where the elastic stress is singular${seen}, so no Kt exists; ${c.fix}`;
      } else if (grows === null) {
        status = 'unsettled';
        reason = `its peak sits at ${c.what}, where the elastic stress may be singular, and ${series.length === 1 ? 'one mesh' : 'two meshes'} cannot tell; run the convergence study (without --single-mesh)`;
      }
    }
    const kt: SettledKt[] = ev.kt.map((v) => {
      if (status !== 'ok') return { ...v, value: null, withheld: reason, error: null, band: null, extrapolated: null, gci: null };
      if (v.value === null) return { ...v, error: null, band: null, extrapolated: null, gci: null };
      const vals: number[] = [];
      const hs: number[] = [];
      series.forEach((m, j) => {
        const x = m.raisers[i].kt.find((q) => q.kind === v.kind)?.value;
        if (x !== null && x !== undefined) {
          vals.push(x);
          hs.push(sizes[j]);
        }
      });
      // Only the unbroken run of values up to the finest mesh makes a series.
      if (vals.length < 2 || hs[hs.length - 1] !== sizes[sizes.length - 1]) return { ...v, error: null, band: null, extrapolated: null, gci: null };
      const g = gridConvergence(hs, vals, order);
      const err = Number.isFinite(g.gci) ? g.gci : null;
      return {
        ...v,
        error: err,
        band: err === null ? null : [v.value * (1 - err), v.value * (1 + err)],
        extrapolated: Number.isFinite(g.extrapolated) ? g.extrapolated : null,
        gci: g,
      };
    });
    const peakGci = series.length >= 2 ? gridConvergence(sizes, peaks.map(Math.abs), order) : null;
    const primary = PRIMARY_ORDER.find((kind) => kt.some((q) => q.kind === kind && q.value !== null)) ?? null;
    return { index: i, status, reason, candidate: k, kt, peakGci, primary };
  });
  // The governing raiser: the one the model names; else the highest peak among those with a Kt;
  // else the highest peak among the rest that is not negligible beside the others (a raiser in
  // compression under the max-principal measure has a peak of about zero).
  const mag = (i: number) => Math.abs(last.raisers[i].peak.stress);
  let governing = -1;
  if (named >= 0 && named < raisers.length) governing = named;
  else {
    const ok = raisers.filter((r) => r.status === 'ok');
    for (const r of ok) if (r.primary !== null && (governing < 0 || mag(r.index) > mag(governing))) governing = r.index;
    if (governing < 0) {
      const top = largest([...raisers.map((r) => mag(r.index)), ...last.candidateStress.map(Math.abs)]);
      for (const r of ok) if (mag(r.index) >= NEGLIGIBLE * top && (governing < 0 || mag(r.index) > mag(governing))) governing = r.index;
    }
  }
  const reference = governing >= 0 ? Math.abs(last.raisers[governing].peak.stress) : largest(last.candidateStress.map(Math.abs));
  const singular: SettledSingular[] = [];
  candidates.forEach((c, k) => {
    const stresses = series.map((m) => m.candidateStress[k]);
    const grows = c.kind === 'sharp-corner' ? true : growsUnderRefinement(sizes, stresses, order);
    const s = Math.abs(stresses[stresses.length - 1]);
    const atRaiser = raisers.some((r) => r.candidate === k && r.status !== 'ok');
    if (atRaiser || (grows === true && s >= 0.25 * reference) || (grows === null && s >= reference && s > 0)) singular.push({ candidate: k, stresses, grows });
  });
  return { raisers, governing, singular };
}
