/**
 * Pins in holes in the result, the console summary and the report: the text of each pin's
 * load or support, and (with a contact solve) the contact arc, the peak contact pressure, the
 * pin's displacement, the bearing stress and the pressure along the hole.
 */
import { describeSelector } from '../geometry/select.js';
import type { Load, Support } from '../model/schema.js';
import { formatValue } from '../render/ticks.js';

const num = (v: number) => formatValue(v, 4);

function fit(item: { clearance?: number; diameter?: number }, length: string): string {
  if (item.diameter !== undefined) return `pin diameter ${num(item.diameter)} ${length}`;
  return item.clearance ? `diametral clearance ${num(item.clearance)} ${length}` : 'close fit (no clearance)';
}

/** Words for a pin load (bearing or rigid-pin), for the report's list of inputs; '' for other loads. */
export function describePinLoad(l: Load, force: string, length: string): string {
  if (l.type === 'bearing') return `bearing on ${describeSelector(l.on)}: force (${num(l.force[0])}, ${num(l.force[1])}) ${force} as a cosine pressure on the half of the hole facing it`;
  if (l.type === 'rigid-pin') return `rigid pin in ${describeSelector(l.on)} pushed with (${num(l.force[0])}, ${num(l.force[1])}) ${force}, frictionless contact, ${fit(l, length)}`;
  return '';
}

/** Words for a pin support, for the report's list of inputs; '' for other supports. */
export function describePinSupport(s: Support, length: string): string {
  if (s.type === 'rigid-pin') return `fixed rigid pin in ${describeSelector(s.on)}, frictionless contact, ${fit(s, length)}`;
  return '';
}
