/**
 * The bearing load of a pin on a circular hole, as the idealised cosine pressure
 *
 *     p(phi) = p0 cos(phi)   for |phi| <= 90 deg,   0 on the other half,
 *
 * phi measured at the hole's centre from the direction of the force F the pin puts on the part,
 * so the pressure acts on the half of the hole facing the force and pushes the material away
 * from the centre. On a circle of diameter d in a plate of thickness t its resultant is
 * p0 (d/2) t integral cos^2 = p0 pi d t / 4 along F, hence p0 = 4 F / (pi d t) [D].
 *
 * The nodal loads are the consistent ones of that pressure (traction -p n, n the outward normal
 * of the material) on the isoparametric hole edges (traction.ts, addEdgeTraction).
 * The meshed hole is not exactly the circle, so their sum differs from F by the discretisation
 * error (of the order of the chord error); the nodal forces are then multiplied by one factor
 * and turned by one small angle (a similarity: nothing about the distribution changes) so that
 * their resultant is exactly F. Both corrections are reported.
 */
import type { Mesh } from '../mesh/types.js';
import { addEdgeTraction, type TractionField } from './traction.js';
import type { PinHole } from './pins.js';

export interface BearingLoad {
  /** the pressure field as applied (after the scale correction) */
  traction: TractionField;
  /** peak pressure p0 = 4 F / (pi d t), stress units */
  p0: number;
  /** the factor and angle (radians) that made the meshed resultant exactly F */
  scale: number;
  turn: number;
}

/** The idealised cosine pressure of a pin pushed with `force` on the hole, before any correction. */
function bearingPressure(pin: PinHole, thickness: number, factor = 1): { q: TractionField; p0: number } {
  const [fx, fy] = pin.force;
  const F = Math.hypot(fx, fy);
  const ux = F > 0 ? fx / F : 1;
  const uy = F > 0 ? fy / F : 0;
  const p0 = (4 * F) / (Math.PI * 2 * pin.radius * thickness);
  const { cx, cy } = pin;
  const q: TractionField = (x, y, nx, ny, out) => {
    const dx = x - cx;
    const dy = y - cy;
    const c = (dx * ux + dy * uy) / Math.hypot(dx, dy);
    const p = c > 0 ? factor * p0 * c : 0;
    out[0] = -p * nx;
    out[1] = -p * ny;
  };
  return { q, p0 };
}

/** Adds the bearing load of `pin` to f (2 entries per node); returns the field and the corrections. */
export function addBearingLoad(mesh: Mesh, pin: PinHole, nEdges: number, thickness: number, f: Float64Array): BearingLoad {
  const mask = new Uint8Array(nEdges);
  for (const e of pin.edges) mask[e] = 1;
  const raw = new Float64Array(f.length);
  const { q, p0 } = bearingPressure(pin, thickness);
  addEdgeTraction(mesh, mask, q, thickness, raw);
  let rx = 0;
  let ry = 0;
  for (let i = 0; i < raw.length; i += 2) {
    rx += raw[i];
    ry += raw[i + 1];
  }
  const [fx, fy] = pin.force;
  const scale = Math.hypot(fx, fy) / Math.hypot(rx, ry);
  const turn = Math.atan2(fy, fx) - Math.atan2(ry, rx);
  const c = scale * Math.cos(turn);
  const s = scale * Math.sin(turn);
  for (let i = 0; i < raw.length; i += 2) {
    if (raw[i] === 0 && raw[i + 1] === 0) continue;
    f[i] += c * raw[i] - s * raw[i + 1];
    f[i + 1] += s * raw[i] + c * raw[i + 1];
  }
  return { traction: bearingPressure(pin, thickness, scale).q, p0, scale, turn: Math.atan2(Math.sin(turn), Math.cos(turn)) };
}
