/**
 * Rigid pins drawn on a picture of the plate: the pin as a disc in its hole (with clearance, set
 * against the side it presses on, so that the gap shows on the other side), the force a pushed
 * pin puts on the part as an arrow from its centre, and, from a solution, the contact arc as a
 * thick line along the hole. Bearing loads are drawn by the load arrows of boundary-conditions.ts
 * (a pressure: arrows pushing onto the loaded half of the hole, longest where p0 cos(phi) is).
 *
 *          ____
 *        /  __  \     hole (radius R), pin disc (radius R - c/2) touching it along the
 *       |  (  )==|->  contact arc (thick) on the side the force points to
 *        \______/
 */
import type { Load, Support } from '../model/schema.js';
import { toPixel, type View } from './field.js';
import type { Rgb } from './raster.js';
import { addText, type Scene } from './scene.js';

/** The contact colour, Okabe & Ito's vermilion [M]. */
export const CONTACT_COLOUR: Rgb = [213, 94, 0];

/** What the drawing needs of a solved pin (the `pins.items` of result.json). */
export interface SolvedPin {
  item: string;
  /** the hole as the finite element stage found it: centre and diameter, length units */
  hole: { center: [number, number]; diameter: number };
  force: [number, number];
  contact: { arcs: { from: number; to: number }[] } | null;
}

function circle(view: View, cx: number, cy: number, r: number, from = 0, to = 360, steps = 96): number[] {
  const out: number[] = [];
  const n = Math.max(2, Math.ceil((steps * Math.abs(to - from)) / 360));
  for (let k = 0; k <= n; k++) {
    const a = ((from + ((to - from) * k) / n) * Math.PI) / 180;
    out.push(...toPixel(view, cx + r * Math.cos(a), cy + r * Math.sin(a)));
  }
  return out;
}

/**
 * Draws the rigid pin of a load or support item (index i in its list) in the hole the finite
 * element stage found for it (its entry in `solved`), with the contact arc when the solve found
 * one. Returns false when the item is not a rigid pin or the solution has no entry for it.
 */
export function drawRigidPin(
  s: Scene,
  item: Load | Support,
  i: number,
  view: View,
  size: number,
  colour: Rgb,
  arrow: (x0: number, y0: number, x1: number, y1: number) => void,
  solved: readonly SolvedPin[] | null | undefined,
): boolean {
  if (item.type !== 'rigid-pin') return false;
  const role = 'force' in item ? 'load' : 'support';
  const path = `${role === 'load' ? 'loads' : 'supports'}[${i}]`;
  const result = solved?.find((p) => p.item === path) ?? null;
  if (!result) return false;
  const circ = { cx: result.hole.center[0], cy: result.hole.center[1], radius: result.hole.diameter / 2 };
  const clearance = item.diameter !== undefined ? Math.max(0, 2 * circ.radius - item.diameter) : (item.clearance ?? 0);
  const rp = circ.radius - clearance / 2;
  const F = role === 'load' ? (item as Extract<Load, { type: 'rigid-pin' }>).force : (result?.force ?? [0, 0]);
  const fl = Math.hypot(F[0], F[1]);
  const ux = fl > 0 ? F[0] / fl : 0;
  const uy = fl > 0 ? F[1] / fl : 0;
  // the pin sits against the side it presses on: the side its force on the part points to
  const px = circ.cx + (ux * clearance) / 2;
  const py = circ.cy + (uy * clearance) / 2;
  s.items.push({ kind: 'fill', paths: [circle(view, px, py, rp)], colour, alpha: 0.28 });
  s.items.push({ kind: 'stroke', lines: [circle(view, px, py, rp)], width: 0.12 * size, colour });
  for (const a of result?.contact?.arcs ?? []) {
    s.items.push({ kind: 'stroke', lines: [circle(view, circ.cx, circ.cy, circ.radius, a.from, a.to)], width: 0.4 * size, colour: CONTACT_COLOUR });
  }
  const [cx, cy] = toPixel(view, px, py);
  const label = role === 'load' ? `L${i + 1} (pin)` : `S${i + 1} (pin)`;
  if (role === 'load' && fl > 0) {
    const len = Math.max(2.6 * size, view.s * rp * 1.4);
    const ex = cx + len * ux;
    const ey = cy - len * uy;
    arrow(cx, cy, ex, ey);
    addText(s, label, ex + 0.5 * size * ux, ey - 0.5 * size * uy + 0.35 * size, 0.8 * size, colour, { anchor: ux > 0.5 ? 'start' : ux < -0.5 ? 'end' : 'middle', what: `load ${i + 1}` });
  } else {
    // in the middle of the disc, away from the hole's edge where peaks and arcs are marked
    addText(s, label, cx, cy + 0.3 * size, 0.8 * size, colour, { anchor: 'middle', what: `${role} ${i + 1}` });
  }
  return true;
}
