/** The bearing stress of each pin in a hole, as a nominal stress of the hole's raiser. */
import type { ContactSolution, PinsOfAnalysis } from '../fem/contact.js';
import type { RaiserNominalInput } from './kt.js';
import type { Raiser } from './raisers.js';

/**
 * The nominal stresses the model gives per raiser, with the bearing stress F / (d t) of every
 * pin in a hole added to its raiser (a fixed pin's force is the resultant of its contact).
 */
export function addBearingStresses(given: Map<number, RaiserNominalInput>, raisers: readonly Raiser[], pins: PinsOfAnalysis | null, contact: ContactSolution | null, thickness: number): Map<number, RaiserNominalInput> {
  if (!pins) return given;
  const out = new Map(given);
  for (const pin of pins.holes) {
    const r = raisers.find((x) => x.kind === 'hole' && x.loop === pin.loop);
    if (!r) continue;
    const c = contact?.pins.find((x) => x.pin.path === pin.path);
    const f = c && pin.role === 'support' ? c.resultant : pin.force;
    const F = Math.hypot(f[0], f[1]);
    if (F > 0) out.set(r.index, { ...out.get(r.index), bearing: F / (2 * pin.radius * thickness) });
  }
  return out;
}
