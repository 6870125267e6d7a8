/**
 * What the model file says about its stress raisers, turned into raiser indices: the headline
 * raiser (results.raiser), the ones to report (results.raisers), and the nominal sections and
 * stresses given for them (results.nominal, results.section), each checked against the part.
 */
import { evaluateCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import { ModelError } from '../model/errors.js';
import type { Model } from '../model/schema.js';
import type { RaiserNominalInput } from './kt.js';
import { matchRaisers, type Raiser } from './raisers.js';
import { cutBetween } from './section.js';

export interface RaiserSettings {
  /** the raiser the model names as the headline (results.raiser), or -1 */
  named: number;
  /** the raisers to report (results.raisers, with the headline one), or null for all */
  reported: Set<number> | null;
  /** per raiser index, a nominal section or stress the model gives for it */
  given: Map<number, RaiserNominalInput>;
}

/** One raiser by the name a model file uses for it, or a ModelError that lists the names there are. */
function raiserByName(raisers: readonly Raiser[], name: string, path: string): number {
  const found = matchRaisers(raisers, name);
  const names = raisers.map((r) => r.name);
  if (found.length === 0) {
    throw new ModelError(
      path,
      raisers.length === 0 ? `"${name}" names a stress raiser, but the part has none (no hole, notch, fillet or other concave curved edge)` : `no stress raiser is called "${name}"`,
      raisers.length === 0 ? 'remove it' : `the raisers are: ${names.map((n) => `'${n}'`).join(', ')} (a hole may also be named by its name or "hole N", an edge by its tag)`,
    );
  }
  if (found.length > 1) throw new ModelError(path, `"${name}" names ${found.length} stress raisers: ${found.map((r) => `'${r.name}'`).join(', ')}`, 'use a name that picks one of them (the printed name, a hole\'s name, or "hole N")');
  return found[0].index;
}

/** results.raiser, results.raisers, results.nominal and results.section turned into raiser indices. */
export function resolveRaiserSettings(model: Model, domain: Domain, raisers: readonly Raiser[]): RaiserSettings {
  const res = model.results ?? {};
  const named = res.raiser !== undefined ? raiserByName(raisers, res.raiser, 'results.raiser') : -1;
  const reported = res.raisers ? new Set(res.raisers.map((n, i) => raiserByName(raisers, n, `results.raisers[${i}]`))) : null;
  if (reported && named >= 0) reported.add(named);
  const given = new Map<number, RaiserNominalInput>();
  for (const [name, spec] of Object.entries(res.nominal ?? {})) {
    const i = raiserByName(raisers, name, `results.nominal.${name}`);
    if (spec.section === undefined && spec.stress === undefined) throw new ModelError(`results.nominal.${name}`, 'gives neither a section nor a stress', 'give "section": { "from": [x, y], "to": [x, y] } or "stress": value');
    if (spec.section) checkSectionCrossesMaterial(domain, spec.section, `results.nominal.${name}.section`, model.thickness);
    given.set(i, { section: spec.section, stress: spec.stress });
  }
  if (res.section && res.section !== 'auto') {
    checkSectionCrossesMaterial(domain, res.section, 'results.section', model.thickness);
    // The raiser the given cut passes nearest.
    if (raisers.length === 0) throw new ModelError('results.section', 'a section is given, but the part has no stress raiser to take it for', 'remove results.section');
    const [ax, ay] = res.section.from;
    const [bx, by] = res.section.to;
    let best = named;
    if (best < 0) {
      let bd = Infinity;
      for (const r of raisers) {
        for (const id of r.edges) {
          const b = nearestOnSegment(domain, id, ax, ay, bx, by);
          if (b < bd) {
            bd = b;
            best = r.index;
          }
        }
      }
    }
    given.set(best, { ...given.get(best), section: res.section });
  }
  return { named, reported, given };
}

/** A given section must cross material. */
function checkSectionCrossesMaterial(domain: Domain, sec: { from: readonly [number, number]; to: readonly [number, number] }, path: string, thickness: number): void {
  if (!cutBetween(domain, sec.from[0], sec.from[1], sec.to[0], sec.to[1], thickness)) {
    throw new ModelError(path, `the section from (${sec.from.join(', ')}) to (${sec.to.join(', ')}) crosses no material`, 'give a cut from one edge of the part to the other, across the raiser');
  }
}

/** Distance from samples of a domain edge to the segment a-b. */
function nearestOnSegment(domain: Domain, edge: number, ax: number, ay: number, bx: number, by: number): number {
  const p = [0, 0];
  let best = Infinity;
  const lx = bx - ax;
  const ly = by - ay;
  const l2 = lx * lx + ly * ly || 1;
  for (let k = 0; k <= 32; k++) {
    evaluateCurve(domain.edges[edge].curve, k / 32, p);
    const t = Math.max(0, Math.min(1, ((p[0] - ax) * lx + (p[1] - ay) * ly) / l2));
    best = Math.min(best, Math.hypot(p[0] - ax - t * lx, p[1] - ay - t * ly));
  }
  return best;
}
