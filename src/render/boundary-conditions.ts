/**
 * Loads and supports drawn on a picture of the plate, schematically: the loaded edges with arrows
 * in the direction of the traction they put on the part (the longest arrow of a load has a fixed
 * length, the others are in proportion to the local traction), the held edges with short
 * hatching on the outside, pins as triangles, mirror planes dash-dotted. Built into a scene (src/render/scene.ts) so that PNG and SVG show the same.
 *
 * Directions follow the mesh's one orientation convention: a boundary edge runs with the
 * material on its left, so its outward normal is (dy, -dx) / |d|.
 *   traction: normal * n + shear * t     pressure: -p * n     force: (fx, fy)
 *   remote:   sigma . n                  moment: no arrows (the edge is marked and labelled)
 * Arrows of a pulling load start on the edge and point away from it; arrows of a pushing load
 * (its direction into the material) end on the edge.
 */
import type { Mesh } from '../mesh/types.js';
import type { Load, Support } from '../model/schema.js';
import { toPixel, type View } from './field.js';
import type { Rgb } from './raster.js';
import { textWidth } from './font.js';
import { addText, type Scene } from './scene.js';
import { drawRigidPin, type SolvedPin } from './pins.js';

/** Okabe & Ito's colour-blind-safe bluish green and reddish purple [M]. */
export const LOAD_COLOUR: Rgb = [0, 140, 100];
export const SUPPORT_COLOUR: Rgb = [150, 70, 130];

interface Frame {
  x: number;
  y: number;
  nx: number;
  ny: number;
  /** chord length of the boundary edge */
  len: number;
}

/** Midpoints, unit outward normals and tangents (model units) of the boundary edges on the given domain edges. */
function edgeFrames(mesh: Mesh, domainEdges: Set<number>): Frame[] {
  const out: Frame[] = [];
  const n = mesh.nodes;
  for (let k = 0; k < mesh.nBEdges; k++) {
    if (!domainEdges.has(mesh.bEdgeDomain[k])) continue;
    const a = mesh.bEdges[3 * k];
    const b = mesh.bEdges[3 * k + 1];
    const m = mesh.bEdges[3 * k + 2];
    const dx = n[2 * b] - n[2 * a];
    const dy = n[2 * b + 1] - n[2 * a + 1];
    const l = Math.hypot(dx, dy);
    if (!(l > 0)) continue;
    const x = m >= 0 ? n[2 * m] : 0.5 * (n[2 * a] + n[2 * b]);
    const y = m >= 0 ? n[2 * m + 1] : 0.5 * (n[2 * a + 1] + n[2 * b + 1]);
    out.push({ x, y, nx: dy / l, ny: -dx / l, len: l });
  }
  return out;
}

/** Pixel segments of the boundary edges on the given domain edges. */
function edgeLines(mesh: Mesh, domainEdges: Set<number>, view: View): number[][] {
  const lines: number[][] = [];
  for (let k = 0; k < mesh.nBEdges; k++) {
    if (!domainEdges.has(mesh.bEdgeDomain[k])) continue;
    const a = mesh.bEdges[3 * k];
    const b = mesh.bEdges[3 * k + 1];
    lines.push([...toPixel(view, mesh.nodes[2 * a], mesh.nodes[2 * a + 1]), ...toPixel(view, mesh.nodes[2 * b], mesh.nodes[2 * b + 1])]);
  }
  return lines;
}

/** A label, moved sideways as far as needed to stay inside the picture. */
function label(s: Scene, text: string, x: number, y: number, size: number, colour: Rgb, anchor: 'start' | 'middle' | 'end', what: string): void {
  const w = textWidth(text, size);
  const left = anchor === 'start' ? x : anchor === 'end' ? x - w : x - w / 2;
  const pad = 0.3 * size;
  const shift = Math.max(pad - left, Math.min(0, s.width - pad - (left + w)));
  addText(s, text, x + shift, y, size, colour, { anchor, what });
}

/** Text anchor that keeps a label beside an edge off the plate: it grows away along the outward normal. */
function anchorFor(nx: number): 'start' | 'middle' | 'end' {
  return nx > 0.5 ? 'start' : nx < -0.5 ? 'end' : 'middle';
}

/**
 * About `count` frames spread evenly in space over the loaded length: a frame is kept when it lies
 * at least the mean spacing from every frame kept before it (boundary edges are short where the
 * mesh is fine, so picking every k-th edge would bunch the marks there).
 */
function spread(list: Frame[], count: number): Frame[] {
  let total = 0;
  for (const f of list) total += f.len;
  const d2 = (0.9 * total / count) ** 2;
  const kept: Frame[] = [];
  // from the middle of the list outwards in index order is arbitrary; in coordinate order the
  // kept marks start at one end of each loaded edge
  const order = list.slice().sort((p, q) => p.x - q.x || p.y - q.y);
  for (const f of order) if (kept.every((k) => (k.x - f.x) ** 2 + (k.y - f.y) ** 2 >= d2)) kept.push(f);
  return kept;
}

/** The frame nearest the middle of a group of frames: where its label goes. */
function central(list: Frame[]): Frame {
  let cx = 0;
  let cy = 0;
  for (const f of list) {
    cx += f.x / list.length;
    cy += f.y / list.length;
  }
  let best = list[0];
  for (const f of list) if ((f.x - cx) ** 2 + (f.y - cy) ** 2 < (best.x - cx) ** 2 + (best.y - cy) ** 2) best = f;
  return best;
}

function arrow(s: Scene, x0: number, y0: number, x1: number, y1: number, head: number, colour: Rgb, width: number): void {
  const dx = x1 - x0;
  const dy = y1 - y0;
  const l = Math.hypot(dx, dy);
  if (!(l > 0)) return;
  const ux = dx / l;
  const uy = dy / l;
  s.items.push({ kind: 'stroke', lines: [[x0, y0, x1 - ux * head * 0.6, y1 - uy * head * 0.6]], width, colour });
  s.items.push({ kind: 'fill', paths: [[x1, y1, x1 - ux * head - uy * head * 0.45, y1 - uy * head + ux * head * 0.45, x1 - ux * head + uy * head * 0.45, y1 - uy * head - ux * head * 0.45]], colour });
}

/** The direction (model axes, not normalised) of the traction a load puts on an edge with outward normal n, or null. */
function loadDirection(load: Load, nx: number, ny: number): [number, number] | null {
  const tx = -ny; // tangent along the edge, material on the left
  const ty = nx;
  switch (load.type) {
    case 'traction':
      return [(load.normal ?? 0) * nx + (load.shear ?? 0) * tx, (load.normal ?? 0) * ny + (load.shear ?? 0) * ty];
    case 'pressure':
      return [-load.p * nx, -load.p * ny];
    case 'force':
      return [load.fx ?? 0, load.fy ?? 0];
    case 'remote': {
      const sxx = load.sxx ?? 0;
      const syy = load.syy ?? 0;
      const sxy = load.sxy ?? 0;
      return [sxx * nx + sxy * ny, sxy * nx + syy * ny];
    }
    case 'moment':
      return null;
    case 'bearing': {
      // p0 cos(phi) on the half facing the force: cos(phi) = -n . F / |F| (n points into the hole)
      const [fx, fy] = load.force;
      const c = -(nx * fx + ny * fy) / (Math.hypot(fx, fy) || 1);
      return c > 0 ? [-c * nx, -c * ny] : [0, 0];
    }
    case 'rigid-pin':
      return null;
  }
}

/** Where the finite element stage applied each load and where each support holds (result.json's boundaryConditions). */
export interface AppliedBoundary {
  /** per load of the model, by its index: the domain edges it was applied on */
  loads: readonly { index: number; edges: readonly number[] }[];
  /** per support of the model, by its index: the domain edges it holds (none for a point support) */
  supports: readonly { index: number; edges: readonly number[] }[];
}

/**
 * Draws the model's loads and supports over the plate, on the edges the finite element stage
 * applied them to (`applied`; the edges are never chosen again here). `size` is the picture's text size in
 * pixels; the arrows are 2.6 sizes long. Rigid pins are drawn as discs in their holes
 * (src/render/pins.ts), with the contact arcs of `pins` (result.json's pins.items) when given.
 * Returns how many loads and supports it drew.
 */
export function drawBoundaryConditions(
  s: Scene,
  mesh: Mesh,
  loads: readonly Load[],
  supports: readonly Support[],
  applied: AppliedBoundary,
  view: View,
  size: number,
  pins?: readonly SolvedPin[] | null,
): { loads: number; supports: number } {
  const len = 2.6 * size;
  const head = 0.75 * size;
  let nLoads = 0;
  let nSupports = 0;
  const pinArrow = (x0: number, y0: number, x1: number, y1: number) => arrow(s, x0, y0, x1, y1, head, LOAD_COLOUR, 0.16 * size);
  // the loads first: the point supports' labels are then placed clear of theirs
  loads.forEach((ld, i) => {
    if (ld.type === 'rigid-pin') {
      if (drawRigidPin(s, ld, i, view, size, LOAD_COLOUR, pinArrow, pins)) nLoads++;
      return;
    }
    const edges = new Set(applied.loads.find((x) => x.index === i)?.edges ?? []);
    const all = edgeFrames(mesh, edges);
    if (all.length === 0) return;
    nLoads++;
    if (ld.type === 'moment') s.items.push({ kind: 'stroke', lines: edgeLines(mesh, edges, view), width: 0.3 * size, colour: LOAD_COLOUR });
    // arrows only where the load puts a traction (a remote stress leaves some outline edges free)
    const frames = all.filter((f) => {
      const d = loadDirection(ld, f.nx, f.ny);
      return d === null || Math.hypot(d[0], d[1]) > 0;
    });
    if (frames.length === 0) return;
    // arrow length in proportion to the local traction, the largest on this load at full length
    let big = 0;
    for (const f of frames) {
      const d = loadDirection(ld, f.nx, f.ny);
      if (d !== null) big = Math.max(big, Math.hypot(d[0], d[1]));
    }
    for (const f of spread(frames, 14)) {
      const d = loadDirection(ld, f.nx, f.ny);
      if (d === null) continue;
      const [x, y] = toPixel(view, f.x, f.y);
      const l = Math.hypot(d[0], d[1]);
      if (l < 0.15 * big) continue;
      const ux = d[0] / l;
      const uy = -d[1] / l; // pixel y runs down
      const al = (len * l) / big;
      // pulling (away from the material) starts on the edge; pushing ends on it
      const pulling = d[0] * f.nx + d[1] * f.ny >= 0;
      if (pulling) arrow(s, x, y, x + al * ux, y + al * uy, head, LOAD_COLOUR, 0.16 * size);
      else arrow(s, x - al * ux, y - al * uy, x, y, head, LOAD_COLOUR, 0.16 * size);
    }
    const f0 = central(spread(frames, 14));
    const [lx, ly] = toPixel(view, f0.x, f0.y);
    const off = ld.type === 'moment' ? 1.4 * size : len + 0.9 * size;
    label(s, `L${i + 1}${ld.type === 'moment' ? ' (moment)' : ''}`, lx + off * f0.nx, ly - off * f0.ny + 0.35 * size, 0.8 * size, LOAD_COLOUR, anchorFor(f0.nx), `load ${i + 1}`);
  });
  supports.forEach((sp, i) => {
    if (sp.type === 'rigid-pin') {
      if (drawRigidPin(s, sp, i, view, size, SUPPORT_COLOUR, pinArrow, pins)) nSupports++;
      return;
    }
    if (sp.type === 'pin') {
      const [px, py] = toPixel(view, sp.at[0], sp.at[1]);
      const h = 0.9 * size;
      s.items.push({ kind: 'fill', paths: [[px, py, px - 0.6 * h, py + h, px + 0.6 * h, py + h]], colour: SUPPORT_COLOUR });
      // beside the mark, on the first side where the label covers no label drawn before it
      const text = `S${i + 1}`;
      const ls = 0.8 * size;
      const w = textWidth(text, ls);
      const places: [number, number, 'start' | 'end'][] = [
        [px + 0.9 * h, py + h, 'start'],
        [px - 0.9 * h, py + h, 'end'],
        [px + 0.9 * h, py + 2.4 * h, 'start'],
        [px - 0.9 * h, py + 2.4 * h, 'end'],
        [px, py + 2.6 * h, 'start'],
      ];
      const boxOf = ([x, y, an]: [number, number, 'start' | 'end']): [number, number, number, number] => [an === 'start' ? x : x - w, y - ls, an === 'start' ? x + w : x, y + 0.25 * ls];
      const free = places.find((p) => !s.info.boxes.some((t) => { const q = boxOf(p); return t.box[0] < q[2] && q[0] < t.box[2] && t.box[1] < q[3] && q[1] < t.box[3]; })) ?? places[0];
      addText(s, text, free[0], free[1], ls, SUPPORT_COLOUR, { anchor: free[2], what: `support ${i + 1}` });
      nSupports++;
      return;
    }
    const edges = new Set(applied.supports.find((x) => x.index === i)?.edges ?? []);
    const frames = edgeFrames(mesh, edges);
    if (frames.length === 0) return;
    nSupports++;
    s.items.push({ kind: 'stroke', lines: edgeLines(mesh, edges, view), width: 0.3 * size, colour: SUPPORT_COLOUR, dash: sp.type === 'symmetry' ? [12, 4, 2, 4] : undefined });
    if (sp.type !== 'symmetry') {
      // hatching: short strokes outward at 45 degrees to the normal
      const ticks = spread(frames, 24).map((f) => {
        const [x, y] = toPixel(view, f.x, f.y);
        const ox = f.nx;
        const oy = -f.ny; // pixel y runs down
        const c = Math.SQRT1_2;
        const hx = c * (ox - oy);
        const hy = c * (oy + ox);
        return [x, y, x + 0.8 * size * hx, y + 0.8 * size * hy];
      });
      s.items.push({ kind: 'stroke', lines: ticks, width: 0.14 * size, colour: SUPPORT_COLOUR });
    }
    const f0 = central(spread(frames, 14));
    const [lx, ly] = toPixel(view, f0.x, f0.y);
    const word = sp.type === 'roller' ? ` (${sp.fix} held)` : sp.type === 'symmetry' ? ' (mirror)' : '';
    label(s, `S${i + 1}${word}`, lx + 1.6 * size * f0.nx, ly - 1.6 * size * f0.ny + 0.35 * size, 0.8 * size, SUPPORT_COLOUR, anchorFor(f0.nx), `support ${i + 1}`);
  });
  return { loads: nLoads, supports: nSupports };
}
