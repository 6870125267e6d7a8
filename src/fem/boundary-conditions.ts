/**
 * Loads and supports of a model, turned into a nodal force vector and prescribed degrees of
 * freedom on a mesh. Edge loads are consistent nodal loads: f_i = t * integral N_i(s) q(x(s)) |x'(s)| ds
 * along each boundary edge, on the isoparametric edge (3 nodes for quadratic elements), by
 * 4-point Gauss-Legendre quadrature (exact for polynomial integrands to degree 7).
 *
 * Sign conventions: the outward normal n points out of the material (to the right of the
 * boundary's direction of travel, material on the left); a positive normal traction pulls
 * outward (tension); pressure pushes inward; a remote stress state s acts as traction s . n.
 */
import { curveTangent, type Curve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import { describeSelector, selectTarget } from '../geometry/select.js';
import type { Mesh } from '../mesh/types.js';
import { ModelError } from '../model/errors.js';
import type { Load, Model, Support, Target } from '../model/schema.js';
import { loadsOf } from '../model/load-cases.js';
import type { Constraints } from './assemble.js';
import { addBearingLoad } from './bearing.js';
import { addEdgeTraction, type TractionField } from './traction.js';
import { checkPinNeighbours, compilePins, type PinHole } from './pins.js';

export interface CompiledLoads {
  f: Float64Array;
  /** per domain edge: 1 when some load acts on it */
  loaded: Uint8Array;
  /** per load of the model: its force resultant and what it acts on */
  items: { index: number; type: Load['type']; fx: number; fy: number; edges: number[] }[];
  /** the remote stress state, when one is applied */
  remote?: { sxx: number; syy: number; sxy: number };
  /** moment loads only: the bending moment applied */
  moment?: number;
  /** per domain edge: the applied traction field there (the sum of the loads on it), or null when none */
  edgeTraction: (TractionField | null)[];
}

export interface CompiledSupports {
  constraints: Constraints;
  /** per domain edge: 1 when a support acts on it */
  supported: Uint8Array;
  /**
   * per domain edge: 1 when the edge carries no shear and its normal traction is not known in
   * advance: a symmetry plane, or the hole of a frictionless rigid pin (load or support)
   */
  symmetry: Uint8Array;
  /** per domain edge: the index of a fixed support holding it, or -1 */
  fixedBy: Int32Array;
  /**
   * per domain edge, how it is held (HOLD_FREE, HOLD_MIRROR: a symmetry plane or a roller
   * holding the straight edge's normal motion; HOLD_SLIDE: a roller holding motion along the
   * edge; HOLD_FIXED)
   */
  hold: Uint8Array;
  /** point supports (pins): where they are and which support of the model they are */
  points: { x: number; y: number; support: number; node: number }[];
  /** the pins in holes (bearing loads, rigid-pin loads and supports), checked (src/fem/pins.ts) */
  pins: PinHole[];
  /** per support of the model: the domain edges it holds (none for a point support) */
  edges: number[][];
}

export const HOLD_FREE = 0;
export const HOLD_MIRROR = 1;
export const HOLD_SLIDE = 2;
export const HOLD_FIXED = 3;

function edgeMask(domain: Domain, edges: number[]): Uint8Array {
  const m = new Uint8Array(domain.edges.length);
  for (const e of edges) m[e] = 1;
  return m;
}

function resolve(domain: Domain, target: Target, path: string, warnings: string[]): number[] {
  const { edges, empty } = selectTarget(domain, target);
  for (const s of empty) warnings.push(`${path}: ${describeSelector(s)} matched no edge of the boundary`);
  return edges;
}

/** Total length of the chosen domain edges, measured on the mesh boundary (isoparametric). */
function meshedLength(mesh: Mesh, mask: Uint8Array): number {
  const f = new Float64Array(2 * mesh.nNodes);
  addEdgeTraction(mesh, mask, (_x, _y, _nx, _ny, out) => ((out[0] = 1), (out[1] = 0)), 1, f);
  let s = 0;
  for (let i = 0; i < f.length; i += 2) s += f[i];
  return s;
}

/** The outline's straight edges on the sides of its bounding box: where a remote stress acts by default. */
function outerEdges(domain: Domain): number[] {
  const [x0, y0, x1, y1] = domain.bbox;
  const tol = 1e-7 * domain.scale;
  return domain.loops[0].edges.filter((id) => {
    const c = domain.edges[id].curve;
    if (c.kind !== 'line') return false;
    const on = (a: number, b: number, v: number) => Math.abs(a - v) <= tol && Math.abs(b - v) <= tol;
    return on(c.x0, c.x1, x0) || on(c.x0, c.x1, x1) || on(c.y0, c.y1, y0) || on(c.y0, c.y1, y1);
  });
}

/** A traction field on domain edges given in code rather than in the model (verification cases). */
export interface ExtraTraction {
  edges: number[];
  q: TractionField;
}

/** Whether the plane stress state (sxx, syy, sxy) puts a traction sigma . n on the curve anywhere (sampled at 17 points; exactly zero on a straight edge it leaves free). */
function remoteLoads(c: Curve, sxx: number, syy: number, sxy: number): boolean {
  const scale = Math.max(Math.abs(sxx), Math.abs(syy), Math.abs(sxy));
  const tan = [0, 0];
  for (let k = 0; k <= 16; k++) {
    curveTangent(c, k / 16, tan);
    const [nx, ny] = [tan[1], -tan[0]];
    if (Math.hypot(sxx * nx + sxy * ny, sxy * nx + syy * ny) > 1e-12 * scale) return true;
  }
  return false;
}

export function compileLoads(model: Model, domain: Domain, mesh: Mesh, supports: CompiledSupports, warnings: string[], extra: readonly ExtraTraction[] = []): CompiledLoads {

  const t = model.thickness;
  const f = new Float64Array(2 * mesh.nNodes);
  const loaded = new Uint8Array(domain.edges.length);
  const items: CompiledLoads['items'] = [];
  let remote: CompiledLoads['remote'];
  let moment: number | undefined;
  const fields: TractionField[][] = domain.edges.map(() => []);
  const apply = (mask: Uint8Array, q: TractionField) => {
    addEdgeTraction(mesh, mask, q, t, f);
    for (let e = 0; e < mask.length; e++) if (mask[e]) fields[e].push(q);
  };
  loadsOf(model).forEach((load, index) => {
    const path = `loads[${index}]`;
    let edges: number[];
    if (load.type === 'remote') {
      edges = load.on ? resolve(domain, load.on, `${path}.on`, warnings) : outerEdges(domain).filter((e) => !supports.supported[e]);
    } else {
      edges = resolve(domain, load.on, `${path}.on`, warnings);
    }
    if (edges.length > 0 && edges.every((e) => supports.fixedBy[e] >= 0)) {
      throw new ModelError(
        `${path}.on`,
        `the load acts only on edges that supports[${supports.fixedBy[edges[0]]}] holds fixed: it would go straight into the support and never load the part`,
        'apply the load to an edge that is free to move, or hold the part elsewhere',
      );
    }
    const mask = edgeMask(domain, edges);
    const before = Float64Array.from(f);
    switch (load.type) {
      case 'traction': {
        const tn = load.normal ?? 0;
        const ts = load.shear ?? 0;
        apply(mask, (_x, _y, nx, ny, out) => {
          // Tangent along the direction of travel (material on the left) is (-ny, nx).
          out[0] = tn * nx - ts * ny;
          out[1] = tn * ny + ts * nx;
        });
        break;
      }
      case 'force': {
        if (edges.length === 0) break;
        const len = meshedLength(mesh, mask);
        const qx = (load.fx ?? 0) / (len * t);
        const qy = (load.fy ?? 0) / (len * t);
        apply(mask, (_x, _y, _nx, _ny, out) => ((out[0] = qx), (out[1] = qy)));
        break;
      }
      case 'pressure': {
        const p = load.p;
        apply(mask, (_x, _y, nx, ny, out) => ((out[0] = -p * nx), (out[1] = -p * ny)));
        break;
      }
      case 'remote': {
        const sxx = load.sxx ?? 0;
        const syy = load.syy ?? 0;
        const sxy = load.sxy ?? 0;
        remote = remote ? { sxx: remote.sxx + sxx, syy: remote.syy + syy, sxy: remote.sxy + sxy } : { sxx, syy, sxy };
        apply(mask, (_x, _y, nx, ny, out) => ((out[0] = sxx * nx + sxy * ny), (out[1] = sxy * nx + syy * ny)));
        break;
      }
      case 'bearing': {
        const pin = supports.pins.find((p) => p.role === 'load' && p.index === index)!;
        const bearing = addBearingLoad(mesh, pin, domain.edges.length, t, f);
        for (let e = 0; e < mask.length; e++) if (mask[e]) fields[e].push(bearing.traction);
        break;
      }
      case 'rigid-pin':
        // The pin's force reaches the part through the contact, which the solve finds
        // (src/fem/contact.ts); nothing is applied here.
        break;
      case 'moment': {
        if (edges.length === 0) break;
        const line = collinearLine(domain, edges, path);
        // Normal traction q_n = k M (s - s_mean) / I with I = t * integral (s - s_mean)^2 ds and
        // k = tau x n, which makes the applied moment about the centroid exactly M (counter-clockwise).
        const { tx, ty, ox, oy, sMean, I2, nx, ny } = line;
        const k = tx * ny - ty * nx;
        const I = t * I2;
        const M = load.m;
        apply(mask, (x, y, _nx, _ny, out) => {
          const s = (x - ox) * tx + (y - oy) * ty - sMean;
          const q = (k * M * s) / I;
          out[0] = q * nx;
          out[1] = q * ny;
        });
        moment = (moment ?? 0) + M;
        break;
      }
    }
    let fx = 0;
    let fy = 0;
    for (let i = 0; i < f.length; i += 2) {
      fx += f[i] - before[i];
      fy += f[i + 1] - before[i + 1];
    }
    if (load.type === 'rigid-pin') [fx, fy] = load.force;
    checkLoadPath(model, domain, supports, f, before, edges, index, warnings);
    // A remote stress state loads only the edges it puts a traction on: under syy alone an
    // edge square to x carries none and stays a free edge for the raisers and singular points.
    for (const e of edges) if (load.type !== 'remote' || remoteLoads(domain.edges[e].curve, load.sxx ?? 0, load.syy ?? 0, load.sxy ?? 0)) loaded[e] = 1;
    items.push({ index, type: load.type, fx, fy, edges });
  });
  for (const x of extra) {
    const mask = edgeMask(domain, x.edges);
    apply(mask, x.q);
    for (const e of x.edges) loaded[e] = 1;
    items.push({ index: -1, type: 'traction', fx: NaN, fy: NaN, edges: x.edges });
  }
  checkUserSection(model, domain, (e) => !loaded[e] && !supports.supported[e]);
  let any = supports.pins.some((p) => p.kind === 'rigid-pin' && p.role === 'load');
  for (let i = 0; i < f.length; i++) if (f[i] !== 0) any = true;
  if (!any) throw new ModelError('loads', 'no load acts on the model: every load is zero or matched no edge', 'check the load values and the edges they name');
  const edgeTraction = fields.map((qs): TractionField | null => {
    if (qs.length === 0) return null;
    if (qs.length === 1) return qs[0];
    return (x, y, nx, ny, out) => {
      const tmp = [0, 0];
      out[0] = 0;
      out[1] = 0;
      for (const q of qs) {
        q(x, y, nx, ny, tmp);
        out[0] += tmp[0];
        out[1] += tmp[1];
      }
    };
  });
  return { f, loaded, items, remote, moment, edgeTraction };
}

/**
 * A load whose nodal forces fall on held degrees of freedom goes straight into the support and
 * never strains the part: a roller that holds a loaded edge in the direction of its load gave
 * Kt 3104 with exit 0. All of it held: an error naming the support; more than a hundredth: a
 * warning saying how much.
 */
function checkLoadPath(model: Model, domain: Domain, supports: CompiledSupports, f: Float64Array, before: Float64Array, edges: number[], index: number, warnings: string[]): void {
  let total = 0;
  let held = 0;
  const fixed = supports.constraints.fixed;
  for (let d = 0; d < f.length; d++) {
    const v = Math.abs(f[d] - before[d]);
    total += v;
    if (fixed[d]) held += v;
  }
  if (!(total > 0) || held <= 0.01 * total) return;
  const onEdges = new Set(edges);
  const holders = model.supports
    .map((sup, i) => ({ sup, i }))
    .filter(({ sup }) => sup.type !== 'pin' && selectTarget(domain, sup.on).edges.some((e) => onEdges.has(e)))
    .map(({ sup, i }) => `supports[${i}] (${sup.type}${sup.type === 'roller' ? `, holding ${sup.fix}` : ''})`);
  const by = holders.length ? holders.join(' and ') : 'the supports';
  if (held >= (1 - 1e-9) * total) {
    throw new ModelError(
      `loads[${index}]`,
      `the load acts only in directions in which ${by} hold${holders.length === 1 ? 's' : ''} its edges: it would go straight into the support and never load the part`,
      'load an edge that is free to move in the load\'s direction, or hold the part elsewhere (a roller is free along the direction it does not hold)',
    );
  }
  warnings.push(`loads[${index}]: ${Math.round((100 * held) / total)}% of the load acts in directions in which ${by} hold${holders.length === 1 ? 's' : ''} its edges; that part goes straight into the support and does not load the part`);
}

/**
 * A nominal section given in the model must not run along a free edge of the part: no force
 * crosses a free edge, and the nominal stress near zero on one gave Kt 686. (Along a symmetry
 * plane, a support or a loaded end the force does pass.)
 */
function checkUserSection(model: Model, domain: Domain, free: (edge: number) => boolean): void {
  const sec = model.results?.section;
  if (!sec || sec === 'auto') return;
  const [[ax, ay], [bx, by]] = [sec.from, sec.to];
  const len = Math.hypot(bx - ax, by - ay);
  if (!(len > 0)) return;
  const tx = (bx - ax) / len;
  const ty = (by - ay) / len;
  const tol = 1e-6 * domain.scale;
  for (const e of domain.edges) {
    const c = e.curve;
    if (c.kind !== 'line' || !free(e.id)) continue;
    // Both ends of the edge on the cut's line, and the overlap more than half the cut.
    const off0 = Math.abs((c.x0 - ax) * ty - (c.y0 - ay) * tx);
    const off1 = Math.abs((c.x1 - ax) * ty - (c.y1 - ay) * tx);
    if (off0 > tol || off1 > tol) continue;
    const s0 = (c.x0 - ax) * tx + (c.y0 - ay) * ty;
    const s1 = (c.x1 - ax) * tx + (c.y1 - ay) * ty;
    const overlap = Math.min(len, Math.max(s0, s1)) - Math.max(0, Math.min(s0, s1));
    if (overlap > 0.5 * len) {
      throw new ModelError(
        'results.section',
        `the nominal section runs along ${e.label}, a free edge of the part, not across it: no force passes through it, so a nominal stress on it means nothing`,
        'give a cut across the part, from one edge to the opposite one, through the material that carries the load; or "auto"',
      );
    }
  }
}

/** The line that straight, collinear edges lie on, with the second moment of their length about its centroid. */
function collinearLine(domain: Domain, edges: number[], path: string) {
  const segs: [number, number, number, number][] = [];
  for (const id of edges) {
    const c = domain.edges[id].curve;
    if (c.kind !== 'line') throw new ModelError(`${path}.on`, `a moment load needs straight edges, but ${domain.edges[id].label} is curved`, 'apply the moment to a straight end of the part');
    segs.push([c.x0, c.y0, c.x1, c.y1]);
  }
  const [ax, ay, bx, by] = segs[0];
  const l0 = Math.hypot(bx - ax, by - ay);
  const tx = (bx - ax) / l0;
  const ty = (by - ay) / l0;
  // Outward normal of the first edge: right of its direction of travel.
  const nx = ty;
  const ny = -tx;
  const tol = 1e-7 * domain.scale;
  let len = 0;
  let first = 0;
  for (const [x0, y0, x1, y1] of segs) {
    for (const [x, y] of [
      [x0, y0],
      [x1, y1],
    ]) {
      if (Math.abs((x - ax) * nx + (y - ay) * ny) > tol) {
        throw new ModelError(`${path}.on`, 'a moment load needs its edges to lie on one straight line', 'select only the straight end edge(s) of the part');
      }
    }
    const s0 = (x0 - ax) * tx + (y0 - ay) * ty;
    const s1 = (x1 - ax) * tx + (y1 - ay) * ty;
    len += Math.abs(s1 - s0);
    first += 0.5 * Math.abs(s1 - s0) * (s0 + s1);
  }
  const sMean = first / len;
  let I2 = 0;
  for (const [x0, y0, x1, y1] of segs) {
    const s0 = (x0 - ax) * tx + (y0 - ay) * ty - sMean;
    const s1 = (x1 - ax) * tx + (y1 - ay) * ty - sMean;
    I2 += Math.abs(s1 * s1 * s1 - s0 * s0 * s0) / 3;
  }
  return { tx, ty, ox: ax, oy: ay, sMean, I2, nx, ny, length: len };
}

export function compileSupports(model: Model, domain: Domain, mesh: Mesh, warnings: string[]): CompiledSupports {
  const nDof = 2 * mesh.nNodes;
  const fixed = new Uint8Array(nDof);
  const value = new Float64Array(nDof);
  const supported = new Uint8Array(domain.edges.length);
  const symmetry = new Uint8Array(domain.edges.length);
  const fixedBy = new Int32Array(domain.edges.length).fill(-1);
  const hold = new Uint8Array(domain.edges.length);
  const points: CompiledSupports['points'] = [];
  const nodesOf = (mask: Uint8Array) => {
    const set = new Set<number>();
    for (let s = 0; s < mesh.nBEdges; s++) {
      if (!mask[mesh.bEdgeDomain[s]]) continue;
      for (let k = 0; k < 3; k++) if (mesh.bEdges[3 * s + k] >= 0) set.add(mesh.bEdges[3 * s + k]);
    }
    return set;
  };
  const pins = compilePins(model, domain);
  const supportEdges: number[][] = [];
  const held: number[][] = model.supports.map(() => []);
  model.supports.forEach((sup: Support, i) => {
    const path = `supports[${i}]`;
    if (sup.type !== 'pin') supportEdges[i] = selectTarget(domain, sup.on).edges;
    if (sup.type === 'pin') {
      const node = nearestBoundaryNode(mesh, sup.at[0], sup.at[1]);
      const onPin = pins.find((p) => p.kind === 'rigid-pin' && p.edges.includes(mesh.nodeEdge[node]));
      if (onPin) {
        throw new ModelError(`${path}.at`, `the pin support at (${sup.at.join(', ')}) is on ${onPin.label}, where the rigid pin ${onPin.path} decides how the hole is held`, 'hold the part at a point away from the pin holes');
      }
      const fix = sup.fix ?? 'xy';
      if (fix.includes('x')) fixed[2 * node] = 1;
      if (fix.includes('y')) fixed[2 * node + 1] = 1;
      const d = Math.hypot(mesh.nodes[2 * node] - sup.at[0], mesh.nodes[2 * node + 1] - sup.at[1]);
      if (d > 1e-3 * domain.scale) warnings.push(`${path}: the pin at (${sup.at.join(', ')}) is ${d.toPrecision(3)} from the nearest boundary node, which it holds`);
      points.push({ x: mesh.nodes[2 * node], y: mesh.nodes[2 * node + 1], support: i, node });
      return;
    }
    const edges = resolve(domain, sup.on, `${path}.on`, warnings);
    held[i] = edges;
    const mask = edgeMask(domain, edges);
    for (const e of edges) supported[e] = 1;
    if (sup.type === 'rigid-pin') {
      // Held only where the hole presses on the pin: the contact solve decides (src/fem/contact.ts).
      for (const e of edges) symmetry[e] = 1;
      return;
    }
    if (sup.type === 'fixed') for (const e of edges) fixedBy[e] = i;
    for (const e of edges) hold[e] = Math.max(hold[e], holdKind(domain, e, sup));
    if (sup.type === 'fixed' || sup.type === 'roller') {
      const comps = sup.type === 'fixed' ? [0, 1] : [sup.fix === 'x' ? 0 : 1];
      for (const n of nodesOf(mask)) for (const c of comps) fixed[2 * n + c] = 1;
      return;
    }
    // Symmetry: the displacement normal to the (straight, axis-parallel) edge is held.
    for (const id of edges) {
      const e = domain.edges[id];
      const c = e.curve;
      const tol = 1e-9 * domain.scale;
      if (c.kind !== 'line') {
        throw new ModelError(`${path}.on`, `a symmetry plane must be straight, but ${e.label} is curved`, 'put the symmetry support on the straight cut edges of the model');
      }
      let comp: number;
      if (Math.abs(c.x1 - c.x0) <= tol) comp = 0;
      else if (Math.abs(c.y1 - c.y0) <= tol) comp = 1;
      else {
        throw new ModelError(`${path}.on`, `${e.label} is not parallel to x or y; symmetry planes must be (inclined ones are not supported)`, 'rotate the model so the symmetry plane lies on x = const or y = const');
      }
      symmetry[id] = 1;
      const one = new Uint8Array(domain.edges.length);
      one[id] = 1;
      for (const n of nodesOf(one)) fixed[2 * n + comp] = 1;
    }
  });
  // The hole of a rigid pin pushed by a force is shear-free too (frictionless contact).
  for (const p of pins) if (p.kind === 'rigid-pin' && p.role === 'load') for (const e of p.edges) symmetry[e] = 1;
  checkPinNeighbours(
    pins,
    model,
    supportEdges,
    loadsOf(model).map((l) => (l.on === undefined ? [] : selectTarget(domain, l.on).edges)),
  );
  return { constraints: { fixed, value }, supported, symmetry, fixedBy, hold, points, pins, edges: held };
}

/** How a support holds one edge: a roller holding a straight edge's normal motion acts as a mirror plane. */
function holdKind(domain: Domain, edge: number, sup: Exclude<Support, { type: 'pin' }>): number {
  if (sup.type === 'fixed') return HOLD_FIXED;
  if (sup.type === 'symmetry') return HOLD_MIRROR;
  if (sup.type !== 'roller') return HOLD_FREE;
  const c = domain.edges[edge].curve;
  if (c.kind !== 'line') return HOLD_SLIDE;
  const len = Math.hypot(c.x1 - c.x0, c.y1 - c.y0);
  // The held component is along the edge's normal when the edge runs across it.
  const along = sup.fix === 'x' ? Math.abs(c.x1 - c.x0) / len : Math.abs(c.y1 - c.y0) / len;
  return along <= 1e-9 ? HOLD_MIRROR : HOLD_SLIDE;
}

export function nearestBoundaryNode(mesh: Mesh, x: number, y: number): number {
  let best = -1;
  let bd = Infinity;
  for (let s = 0; s < mesh.nBEdges; s++) {
    for (let k = 0; k < 3; k++) {
      const n = mesh.bEdges[3 * s + k];
      if (n < 0) continue;
      const d = Math.hypot(mesh.nodes[2 * n] - x, mesh.nodes[2 * n + 1] - y);
      if (d < bd) {
        bd = d;
        best = n;
      }
    }
  }
  return best;
}
