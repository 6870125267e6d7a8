/**
 * Pins in holes: the loads and supports that act through a round pin in a circular hole (a
 * `bearing` load, a `rigid-pin` load, a `rigid-pin` support), resolved against the domain and
 * checked. What they do is elsewhere: the bearing pressure in bearing.ts, the contact of a rigid
 * pin in contact.ts.
 *
 * The hole of a pin must be a whole circle: every edge of the hole's loop a circular arc about
 * one centre with one radius, the arcs together going once round. The tolerance is relative to
 * the part's size (1e-9 of the bounding-box diagonal).
 *
 * Clearance is diametral: the hole diameter minus the pin diameter (default 0, a close fit). A
 * pin larger than its hole (an interference fit) is refused: it would need the pre-stress of the
 * fit, which is not modelled.
 */
import type { Domain } from '../geometry/domain.js';
import type { Mesh } from '../mesh/types.js';
import { ModelError } from '../model/errors.js';
import type { Load, Model, Support } from '../model/schema.js';
import { loadsOf } from '../model/load-cases.js';

export type PinLoad = Extract<Load, { type: 'bearing' | 'rigid-pin' }>;
export type PinSupport = Extract<Support, { type: 'rigid-pin' }>;

/** One pin of the model, resolved to its hole. */
export interface PinHole {
  /** 'load': pushed with a given force; 'support': fixed in place */
  role: 'load' | 'support';
  kind: 'bearing' | 'rigid-pin';
  /** index of the item in model.loads or model.supports */
  index: number;
  /** JSON path of the item, "loads[2]" */
  path: string;
  /** the hole: its domain loop, its number (from 1), its label for people */
  loop: number;
  hole: number;
  label: string;
  /** the domain edges of the hole */
  edges: number[];
  /** the circle of the hole, length units */
  cx: number;
  cy: number;
  radius: number;
  /** diametral clearance, hole diameter minus pin diameter (0 for a bearing load) */
  clearance: number;
  /** the force the pin puts on the part (loads); [0, 0] for a support */
  force: [number, number];
}

function isPinLoad(l: Load): l is PinLoad {
  return l.type === 'bearing' || l.type === 'rigid-pin';
}

function isPinSupport(s: Support): s is PinSupport {
  return s.type === 'rigid-pin';
}

/** The circle a loop of arcs about one centre makes, or null when the loop is not a whole circle. */
function loopCircle(domain: Domain, loop: number): { cx: number; cy: number; radius: number } | null {
  const edges = domain.loops[loop].edges.map((id) => domain.edges[id].curve);
  const first = edges[0];
  if (first.kind !== 'arc') return null;
  const tol = 1e-9 * domain.scale;
  let sweep = 0;
  for (const c of edges) {
    if (c.kind !== 'arc') return null;
    if (Math.hypot(c.cx - first.cx, c.cy - first.cy) > tol || Math.abs(c.r - first.r) > tol) return null;
    sweep += c.sweep;
  }
  if (Math.abs(Math.abs(sweep) - 2 * Math.PI) > 1e-9) return null;
  return { cx: first.cx, cy: first.cy, radius: first.r };
}

/** The domain loop of a hole named as in a "hole" selector (number from 1, or name), or -1. */
function holeLoop(domain: Domain, h: number | string): number {
  const loop = domain.loops.find((l) => l.hole > 0 && (typeof h === 'number' ? l.hole === h : l.name === h));
  return loop ? loop.index : -1;
}

/** The diametral clearance a pin item gives, checked against its hole's diameter. */
function pinClearance(item: { clearance?: number; diameter?: number }, path: string, holeDiameter: number, label: string): number {
  const { clearance, diameter } = item;
  const tol = 1e-9 * holeDiameter;
  if (diameter !== undefined) {
    if (diameter > holeDiameter + tol) {
      throw new ModelError(
        `${path}.diameter`,
        `the pin (diameter ${diameter}) is larger than its hole, ${label} (diameter ${fmt(holeDiameter)}); an interference fit is not modelled`,
        `give a pin diameter of at most ${fmt(holeDiameter)}, or "clearance": 0 for a close fit`,
      );
    }
    const fromDiameter = Math.max(0, holeDiameter - diameter);
    if (clearance !== undefined && Math.abs(clearance - fromDiameter) > tol) {
      throw new ModelError(`${path}.clearance`, `clearance ${clearance} disagrees with the pin diameter ${diameter} in a hole of diameter ${fmt(holeDiameter)} (clearance ${fmt(fromDiameter)})`, 'give only one of them');
    }
    return fromDiameter;
  }
  const c = clearance ?? 0;
  if (c >= holeDiameter) {
    throw new ModelError(`${path}.clearance`, `a diametral clearance of ${c} leaves no pin in ${label} (diameter ${fmt(holeDiameter)})`, 'the clearance is the hole diameter minus the pin diameter; it is usually a small fraction of the diameter');
  }
  return c;
}

/**
 * Every pin of the model, resolved and checked: the hole exists and is circular, the pin fits
 * it, one pin a hole, and no other support on the hole of a pin (a rigid pin's hole carries no
 * other load either). Errors are ModelErrors naming the field.
 */
export function compilePins(model: Model, domain: Domain): PinHole[] {
  const pins: PinHole[] = [];
  const add = (item: PinLoad | PinSupport, role: 'load' | 'support', index: number) => {
    const path = `${role === 'load' ? 'loads' : 'supports'}[${index}]`;
    const h = item.on.hole;
    const loop = holeLoop(domain, h);
    if (loop < 0) {
      throw new ModelError(`${path}.on.hole`, `there is no hole ${typeof h === 'number' ? h : `named "${h}"`}`, 'holes are numbered from 1 in the order of geometry.holes, or named by their "name"');
    }
    const label = domain.loops[loop].label;
    const circle = loopCircle(domain, loop);
    if (!circle) {
      throw new ModelError(
        `${path}.on.hole`,
        `${label} is not circular: a ${item.type} ${role} needs a round hole (one circle)`,
        'for a hole of another shape spread the force with a "force" or "pressure" load on its edges',
      );
    }
    const clearance = item.type === 'bearing' ? 0 : pinClearance(item, path, 2 * circle.radius, label);
    const force: [number, number] = item.type === 'bearing' || (item.type === 'rigid-pin' && role === 'load') ? [...(item as PinLoad).force] : [0, 0];
    if (role === 'load' && item.type === 'rigid-pin' && force[0] === 0 && force[1] === 0) {
      throw new ModelError(
        `${path}.force`,
        'the pin is pushed with no force: no contact forms, and the pin has no position',
        'give the force the pin puts on the part, or remove the load (a pin that only holds the part is a "rigid-pin" support)',
      );
    }
    const other = pins.find((p) => p.loop === loop);
    if (other) {
      throw new ModelError(`${path}.on.hole`, `${label} already has a pin (${other.path}): one pin a hole`, 'put one pin in each hole; for a pin that is both loaded and held, use a rigid-pin load and hold the part elsewhere');
    }
    pins.push({ role, kind: item.type, index, path, loop, hole: domain.loops[loop].hole, label, edges: domain.loops[loop].edges.slice(), ...circle, clearance, force });
  };
  model.supports.forEach((s, i) => isPinSupport(s) && add(s, 'support', i));
  loadsOf(model).forEach((l, i) => isPinLoad(l) && add(l, 'load', i));
  return pins;
}

/**
 * Refuses a support of another kind on the hole of a pin, and any other load on the hole of a
 * rigid pin (its contact pressure is the unknown there). `heldEdges` are the edges each support
 * acts on, `loadEdges` those of each load (index as in the model).
 */
export function checkPinNeighbours(pins: readonly PinHole[], model: Model, supportEdges: readonly (readonly number[])[], loadEdges: readonly (readonly number[])[]): void {
  for (const p of pins) {
    const mine = new Set(p.edges);
    model.supports.forEach((s, i) => {
      if (isPinSupport(s) || !supportEdges[i]?.some((e) => mine.has(e))) return;
      throw new ModelError(`supports[${i}].on`, `supports[${i}] holds edges of ${p.label}, which has a pin (${p.path})`, 'hold the part elsewhere: the pin and a support on the same hole would fight');
    });
    if (p.kind !== 'rigid-pin') continue;
    loadsOf(model).forEach((l, i) => {
      if ((p.role === 'load' && i === p.index) || !loadEdges[i]?.some((e) => mine.has(e))) return;
      throw new ModelError(`loads[${i}].on`, `loads[${i}] acts on ${p.label}, whose rigid pin (${p.path}) decides the pressure there`, 'load the part through the pin (its "force"), or on other edges');
    });
  }
}

/**
 * The mesh nodes on a pin's hole, sorted by angle about its centre, with for each the unit
 * radial direction (from the centre into the material), its distance from the centre, and its
 * boundary weight w_i = integral of N_i ds over the hole (isoparametric edges, 4-point
 * Gauss-Legendre): the share of the hole's length the node stands for, which turns a nodal
 * force into a pressure (p_i = f_i / (w_i t), exact for a uniform pressure).
 */
export interface HoleNodes {
  nodes: Int32Array;
  /** per node: unit radial direction nx, ny (interleaved) */
  normal: Float64Array;
  /** per node: distance from the centre */
  rho: Float64Array;
  /** per node: angle about the centre, radians in (-pi, pi] */
  angle: Float64Array;
  weight: Float64Array;
}

const GL4_S = [0.5 - 0.5 * 0.8611363115940526, 0.5 - 0.5 * 0.3399810435848563, 0.5 + 0.5 * 0.3399810435848563, 0.5 + 0.5 * 0.8611363115940526];
const GL4_W = [0.5 * 0.3478548451374538, 0.5 * 0.6521451548625461, 0.5 * 0.6521451548625461, 0.5 * 0.3478548451374538];

export function holeNodes(mesh: Mesh, pin: PinHole): HoleNodes {
  const mine = new Set(pin.edges);
  const weightOf = new Map<number, number>();
  const nd = mesh.nodes;
  const addW = (n: number, w: number) => weightOf.set(n, (weightOf.get(n) ?? 0) + w);
  for (let s = 0; s < mesh.nBEdges; s++) {
    if (!mine.has(mesh.bEdgeDomain[s])) continue;
    const a = mesh.bEdges[3 * s];
    const b = mesh.bEdges[3 * s + 1];
    const m = mesh.bEdges[3 * s + 2];
    for (let g = 0; g < 4; g++) {
      const u = GL4_S[g];
      if (m >= 0) {
        const dx = (4 * u - 3) * nd[2 * a] + (4 - 8 * u) * nd[2 * m] + (4 * u - 1) * nd[2 * b];
        const dy = (4 * u - 3) * nd[2 * a + 1] + (4 - 8 * u) * nd[2 * m + 1] + (4 * u - 1) * nd[2 * b + 1];
        const w = GL4_W[g] * Math.hypot(dx, dy);
        addW(a, w * (1 - u) * (1 - 2 * u));
        addW(m, w * 4 * u * (1 - u));
        addW(b, w * u * (2 * u - 1));
      } else {
        const w = GL4_W[g] * Math.hypot(nd[2 * b] - nd[2 * a], nd[2 * b + 1] - nd[2 * a + 1]);
        addW(a, w * (1 - u));
        addW(b, w * u);
      }
    }
  }
  const list = [...weightOf.keys()].map((n) => ({ n, angle: Math.atan2(nd[2 * n + 1] - pin.cy, nd[2 * n] - pin.cx) }));
  list.sort((p, q) => p.angle - q.angle);
  const k = list.length;
  const out: HoleNodes = { nodes: new Int32Array(k), normal: new Float64Array(2 * k), rho: new Float64Array(k), angle: new Float64Array(k), weight: new Float64Array(k) };
  list.forEach(({ n, angle }, i) => {
    const dx = nd[2 * n] - pin.cx;
    const dy = nd[2 * n + 1] - pin.cy;
    const r = Math.hypot(dx, dy);
    out.nodes[i] = n;
    out.normal[2 * i] = dx / r;
    out.normal[2 * i + 1] = dy / r;
    out.rho[i] = r;
    out.angle[i] = angle;
    out.weight[i] = weightOf.get(n)!;
  });
  return out;
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}
