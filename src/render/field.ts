/**
 * Drawing a nodal field on a triangle mesh, per pixel.
 *
 * Each element is subdivided in its local coordinates (xi, eta) into n^2 sub-triangles whose
 * corners are mapped through the element's own isoparametric map, so a curved 6-node element
 * keeps its curved sides (n grows with the element's size on screen; a straight-sided element
 * needs no subdivision). Inside a sub-triangle the local coordinates of each pixel centre come
 * from its barycentric coordinates, and the field's components are interpolated there with the
 * element's shape functions (exact quadratic interpolation on straight-sided elements), then
 * combined into the plotted value (a stress measure of the interpolated components, for
 * instance) and coloured. Iso-lines come from the same subdivision by linear interpolation
 * along the sub-triangle edges (marching triangles).
 */
import { shapeValuesP1, shapeValuesP2 } from '../element/triangle.js';
import type { ColourMap } from './colormap.js';
import { colourLut } from './colormap.js';
import type { Raster } from './raster.js';

/** The geometry to draw: node positions (2 per node) and 3- or 6-node elements, counter-clockwise. */
export interface DrawMesh {
  order: 1 | 2;
  nNodes: number;
  nodes: Float64Array;
  nElements: number;
  elements: Int32Array;
}

/** Model (y up) to pixel (y down): px = ox + s x, py = oy - s y. */
export interface View {
  s: number;
  ox: number;
  oy: number;
}

/** The view that fits the model box [x0, y0, x1, y1] into the pixel box, centred, aspect kept. */
export function fitView(model: readonly number[], px: readonly number[]): View {
  const [x0, y0, x1, y1] = model;
  const w = Math.max(x1 - x0, 1e-300);
  const h = Math.max(y1 - y0, 1e-300);
  const s = Math.min((px[2] - px[0]) / w, (px[3] - px[1]) / h);
  const ox = 0.5 * (px[0] + px[2]) - s * 0.5 * (x0 + x1);
  const oy = 0.5 * (px[1] + px[3]) + s * 0.5 * (y0 + y1);
  return { s, ox, oy };
}

export function toPixel(v: View, x: number, y: number): [number, number] {
  return [v.ox + v.s * x, v.oy - v.s * y];
}

export function toModel(v: View, px: number, py: number): [number, number] {
  return [(px - v.ox) / v.s, (v.oy - py) / v.s];
}

/** The values of a field: `stride` components per node, combined by `value` into the plotted number. */
export interface FieldSpec {
  data: Float64Array;
  stride: number;
  /** the plotted value from the components (c[0 .. stride-1]) */
  value: (c: Float64Array) => number;
}

export interface ColourScale {
  lo: number;
  hi: number;
  map: ColourMap;
}

function shape(order: 1 | 2, xi: number, eta: number, N: Float64Array): void {
  if (order === 2) shapeValuesP2(xi, eta, N);
  else shapeValuesP1(xi, eta, N);
}

/**
 * Whether a 6-node element's midside nodes sit at the midpoints of its sides (to 1e-9 of its
 * size), for drawing only. Not yet the element's own test (isStraightP2 in element/triangle.ts,
 * 1e-12 in another measure): on the examples the two disagree on thousands of elements whose
 * midside nodes sit 1e-12 to 1e-9 of their size off the chord (and on deformed shapes), so
 * sharing one test would redraw the contour, close-up and deformed pictures (not bit for bit).
 */
function isDrawnStraight(nodes: Float64Array, el: Int32Array, e: number): boolean {
  const v = (k: number) => el[6 * e + k];
  let size = 0;
  let off = 0;
  const pairs = [
    [0, 1, 3],
    [1, 2, 4],
    [2, 0, 5],
  ];
  for (const [a, b, m] of pairs) {
    const ax = nodes[2 * v(a)];
    const ay = nodes[2 * v(a) + 1];
    const bx = nodes[2 * v(b)];
    const by = nodes[2 * v(b) + 1];
    size = Math.max(size, Math.hypot(bx - ax, by - ay));
    off = Math.max(off, Math.hypot(nodes[2 * v(m)] - 0.5 * (ax + bx), nodes[2 * v(m) + 1] - 0.5 * (ay + by)));
  }
  return off <= 1e-9 * size;
}

/**
 * Whether element e, drawn at k times the view's scale, lies wholly outside the pixel box: its
 * nodes' box, grown by half its size on every side (room for a curved side's bulge), misses the
 * box. The same test as paintField's, for the lines drawn over a window of the part.
 */
function outsideBox(mesh: DrawMesh, e: number, view: View, k: number, box: readonly number[]): boolean {
  const per = mesh.order === 2 ? 6 : 3;
  const s = view.s * k;
  let x0 = Infinity;
  let x1 = -Infinity;
  let y0 = Infinity;
  let y1 = -Infinity;
  for (let a = 0; a < per; a++) {
    const v = mesh.elements[per * e + a];
    const px = view.ox * k + s * mesh.nodes[2 * v];
    const py = view.oy * k - s * mesh.nodes[2 * v + 1];
    if (px < x0) x0 = px;
    if (px > x1) x1 = px;
    if (py < y0) y0 = py;
    if (py > y1) y1 = py;
  }
  const pad = 0.5 * Math.max(x1 - x0, y1 - y0);
  return x1 + pad < box[0] || x0 - pad > box[2] || y1 + pad < box[1] || y0 - pad > box[3];
}

/** The chord error, in pixels, allowed where a curved side is drawn as a polyline. */
const CHORD_ERROR_PX = 0.1;
/** How far outside a sub-triangle, in pixels, a pixel centre may lie and still be painted by it. */
const OVERLAP_PX = 0.3;

/**
 * Subdivisions per side for element e drawn at the view scale (pixels): 1 for straight sides,
 * otherwise enough that a sub-triangle side is at most about 6 pixels (2 to 16) and that the
 * chords of a curved side stay within CHORD_ERROR_PX of it (up to 32).
 *
 * Why the chord bound: two neighbours share a curved side but may subdivide it differently, so
 * their polylines along it differ by up to the sum of their chord errors, and a pixel centre in
 * the sliver between them would be painted by neither (a white pixel inside the fill; seen on
 * the deformed shape, where every side is curved). A quadratic side whose midside node lies d
 * pixels off its chord's midpoint is a parabola of sagitta d; cut into n chords, each has
 * sagitta d / n^2. With both errors under CHORD_ERROR_PX the sliver is under 2 CHORD_ERROR_PX,
 * which paintField's overlap of OVERLAP_PX covers.
 */
function subdivisions(mesh: DrawMesh, e: number, view: View, k = 1, forIso = false): number {
  if (mesh.order === 1) return 1;
  const el = mesh.elements;
  const straight = isDrawnStraight(mesh.nodes, el, e);
  if (straight && !forIso) return 1;
  const nodes = mesh.nodes;
  let size = 0;
  let bow = 0;
  for (let i = 0; i < 3; i++) {
    const a = el[6 * e + i];
    const b = el[6 * e + ((i + 1) % 3)];
    const m = el[6 * e + 3 + i];
    size = Math.max(size, Math.hypot(nodes[2 * a] - nodes[2 * b], nodes[2 * a + 1] - nodes[2 * b + 1]));
    bow = Math.max(bow, Math.hypot(nodes[2 * m] - 0.5 * (nodes[2 * a] + nodes[2 * b]), nodes[2 * m + 1] - 0.5 * (nodes[2 * a + 1] + nodes[2 * b + 1])));
  }
  const px = size * view.s * k;
  const bySize = Math.max(forIso ? 3 : 2, Math.min(16, Math.ceil(px / 6)));
  const byBow = Math.min(32, Math.ceil(Math.sqrt((bow * view.s * k) / CHORD_ERROR_PX)));
  return Math.max(bySize, byBow);
}

/**
 * Paints the field onto the raster at k times the view's scale (the raster being k times the
 * picture). Pixels whose centre lies in no element are left as they are.
 */
export function paintField(r: Raster, mesh: DrawMesh, view: View, field: FieldSpec, scale: ColourScale, k = 1): void {
  const per = mesh.order === 2 ? 6 : 3;
  const lut = colourLut(scale.map, 1024);
  const span = scale.hi - scale.lo;
  const inv1023 = span > 0 ? 1023 / span : 0;
  const N = new Float64Array(6);
  const comp = new Float64Array(field.stride);
  const local = new Float64Array(per * field.stride);
  const el = mesh.elements;
  const nodes = mesh.nodes;
  const s = view.s * k;
  const ox = view.ox * k;
  const oy = view.oy * k;
  const clip = r.clip;
  const data = r.data;
  const W = r.width;
  // Sub-triangle corner storage: local coordinates and pixel positions on an (n+1)^2 grid.
  let gridXi = new Float64Array(0);
  let gridEta = new Float64Array(0);
  let gridPx = new Float64Array(0);
  let gridPy = new Float64Array(0);
  for (let e = 0; e < mesh.nElements; e++) {
    for (let a = 0; a < per; a++) {
      const v = el[per * e + a];
      for (let c = 0; c < field.stride; c++) local[a * field.stride + c] = field.data[field.stride * v + c];
    }
    // Cull elements wholly outside the clip box.
    let ex0 = Infinity;
    let ex1 = -Infinity;
    let ey0 = Infinity;
    let ey1 = -Infinity;
    for (let a = 0; a < per; a++) {
      const v = el[per * e + a];
      const px = ox + s * nodes[2 * v];
      const py = oy - s * nodes[2 * v + 1];
      if (px < ex0) ex0 = px;
      if (px > ex1) ex1 = px;
      if (py < ey0) ey0 = py;
      if (py > ey1) ey1 = py;
    }
    const pad = 0.5 * Math.max(ex1 - ex0, ey1 - ey0);
    if (ex1 + pad < clip[0] || ex0 - pad > clip[2] || ey1 + pad < clip[1] || ey0 - pad > clip[3]) continue;
    const n = subdivisions(mesh, e, view, k);
    const g = (n + 1) * (n + 1);
    if (gridXi.length < g) {
      gridXi = new Float64Array(g);
      gridEta = new Float64Array(g);
      gridPx = new Float64Array(g);
      gridPy = new Float64Array(g);
    }
    for (let i = 0; i <= n; i++) {
      for (let j = 0; j <= n - i; j++) {
        const id = i * (n + 1) + j;
        const xi = j / n;
        const eta = i / n;
        gridXi[id] = xi;
        gridEta[id] = eta;
        shape(mesh.order, xi, eta, N);
        let x = 0;
        let y = 0;
        for (let a = 0; a < per; a++) {
          const v = el[per * e + a];
          x += N[a] * nodes[2 * v];
          y += N[a] * nodes[2 * v + 1];
        }
        gridPx[id] = ox + s * x;
        gridPy[id] = oy - s * y;
      }
    }
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n - i; j++) {
        const a = i * (n + 1) + j;
        const b = a + 1;
        const c = a + n + 1;
        sub(a, b, c);
        if (j < n - i - 1) sub(b, c + 1, c);
      }
    }
  }

  function sub(a: number, b: number, c: number): void {
    const x0 = gridPx[a];
    const y0 = gridPy[a];
    const x1 = gridPx[b];
    const y1 = gridPy[b];
    const x2 = gridPx[c];
    const y2 = gridPy[c];
    const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    if (det === 0 || !Number.isFinite(det)) return;
    const minX = Math.max(clip[0], Math.floor(Math.min(x0, x1, x2)));
    const maxX = Math.min(clip[2] - 1, Math.ceil(Math.max(x0, x1, x2)));
    const minY = Math.max(clip[1], Math.floor(Math.min(y0, y1, y2)));
    const maxY = Math.min(clip[3] - 1, Math.ceil(Math.max(y0, y1, y2)));
    const xa = gridXi[a];
    const xb = gridXi[b];
    const xc = gridXi[c];
    const ea = gridEta[a];
    const eb = gridEta[b];
    const ec = gridEta[c];
    const stride = field.stride;
    const inv = 1 / det;
    // b1 and b2 are affine in the pixel centre: b = k0 + kx cx + ky cy.
    const b1x = (y2 - y0) * inv;
    const b1y = -(x2 - x0) * inv;
    const b1c = -(x0 * (y2 - y0) - (x2 - x0) * y0) * inv;
    const b2x = -(y1 - y0) * inv;
    const b2y = (x1 - x0) * inv;
    const b2c = -((x1 - x0) * y0 - x0 * (y1 - y0)) * inv;
    // A pixel centre up to OVERLAP_PX outside the sub-triangle is painted too: b_i >= -OVERLAP_PX
    // |grad b_i| (|grad b_i| is one over the sub-triangle's height from corner i, in pixels).
    const b0x = -b1x - b2x;
    const b0y = -b1y - b2y;
    const eps0 = -OVERLAP_PX * Math.hypot(b0x, b0y);
    const eps1 = -OVERLAP_PX * Math.hypot(b1x, b1y);
    const eps2 = -OVERLAP_PX * Math.hypot(b2x, b2y);
    const reach = Math.ceil(OVERLAP_PX);
    const loX = Math.max(clip[0], minX - reach);
    const hiX = Math.min(clip[2] - 1, maxX + reach);
    for (let py = Math.max(clip[1], minY - reach); py <= Math.min(clip[3] - 1, maxY + reach); py++) {
      const cy = py + 0.5;
      // The span of pixel centres on this row with b_i >= eps_i (each affine in cx).
      let lo = loX + 0.5;
      let hi = hiX + 0.5;
      const a1 = b1c + b1y * cy;
      const a2 = b2c + b2y * cy;
      const a0 = 1 - a1 - a2;
      // (written out for the three corners: no array per row)
      if (b0x > 0) lo = Math.max(lo, (eps0 - a0) / b0x);
      else if (b0x < 0) hi = Math.min(hi, (eps0 - a0) / b0x);
      else if (a0 < eps0) hi = -Infinity;
      if (b1x > 0) lo = Math.max(lo, (eps1 - a1) / b1x);
      else if (b1x < 0) hi = Math.min(hi, (eps1 - a1) / b1x);
      else if (a1 < eps1) hi = -Infinity;
      if (b2x > 0) lo = Math.max(lo, (eps2 - a2) / b2x);
      else if (b2x < 0) hi = Math.min(hi, (eps2 - a2) / b2x);
      else if (a2 < eps2) hi = -Infinity;
      const pxStart = Math.max(loX, Math.ceil(lo - 0.5));
      const pxEnd = Math.min(hiX, Math.floor(hi - 0.5));
      for (let px = pxStart; px <= pxEnd; px++) {
        const cx = px + 0.5;
        // The value at the nearest point of the sub-triangle (barycentrics clamped into it).
        let b1 = a1 + b1x * cx;
        let b2 = a2 + b2x * cx;
        if (b1 < 0) b1 = 0;
        if (b2 < 0) b2 = 0;
        if (b1 + b2 > 1) {
          const t = 1 / (b1 + b2);
          b1 *= t;
          b2 *= t;
        }
        const b0 = 1 - b1 - b2;
        const xi = b0 * xa + b1 * xb + b2 * xc;
        const eta = b0 * ea + b1 * eb + b2 * ec;
        if (per === 6) {
          // shapeValuesP2 and the sum over the nodes written out, in the same order (the same bits)
          const l0 = 1 - xi - eta;
          const n0 = l0 * (2 * l0 - 1);
          const n1 = xi * (2 * xi - 1);
          const n2 = eta * (2 * eta - 1);
          const n3 = 4 * l0 * xi;
          const n4 = 4 * xi * eta;
          const n5 = 4 * eta * l0;
          for (let q = 0; q < stride; q++) {
            comp[q] =
              0 +
              n0 * local[q] +
              n1 * local[stride + q] +
              n2 * local[2 * stride + q] +
              n3 * local[3 * stride + q] +
              n4 * local[4 * stride + q] +
              n5 * local[5 * stride + q];
          }
        } else {
          shape(mesh.order, xi, eta, N);
          for (let q = 0; q < stride; q++) {
            let v = 0;
            for (let m = 0; m < per; m++) v += N[m] * local[m * stride + q];
            comp[q] = v;
          }
        }
        const val = field.value(comp);
        let t = Math.round((val - scale.lo) * inv1023);
        if (!(t >= 0)) t = 0;
        else if (t > 1023) t = 1023;
        const o = 4 * (py * W + px);
        data[o] = lut[3 * t];
        data[o + 1] = lut[3 * t + 1];
        data[o + 2] = lut[3 * t + 2];
        data[o + 3] = 255;
      }
    }
  }
}

/** The range of the plotted value over the nodes and the element mid-points of the sub-grids. */
export function fieldRange(mesh: DrawMesh, field: FieldSpec): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  const comp = new Float64Array(field.stride);
  for (let i = 0; i < mesh.nNodes; i++) {
    for (let q = 0; q < field.stride; q++) comp[q] = field.data[field.stride * i + q];
    const v = field.value(comp);
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/**
 * Iso-lines of the plotted value at the given levels, as pixel segments (x0, y0, x1, y1 per
 * segment, one list per level), from the subdivided elements by marching triangles. With
 * `within` (a pixel box: the drawing area of a close-up), elements wholly outside it are left out.
 */
export function isoSegments(mesh: DrawMesh, view: View, field: FieldSpec, levels: readonly number[], k = 1, within?: readonly number[]): number[][] {
  const out = levels.map(() => [] as number[]);
  if (levels.length === 0) return out;
  const per = mesh.order === 2 ? 6 : 3;
  const N = new Float64Array(6);
  const comp = new Float64Array(field.stride);
  const el = mesh.elements;
  // the sub-grid's pixel positions and values, grown as needed and reused from element to element
  let vx = new Float64Array(16);
  let vy = new Float64Array(16);
  let vv = new Float64Array(16);
  // the crossings of one sub-triangle with the level: up to three points
  const pts = new Float64Array(6);
  /** Appends the crossing of sub-grid side p-q with the level (where the sign changes) to pts; returns the new count. */
  const cross = (p: number, q: number, lev: number, m: number): number => {
    const fp = vv[p] - lev;
    const fq = vv[q] - lev;
    if ((fp < 0 && fq >= 0) || (fp >= 0 && fq < 0)) {
      const t = fp / (fp - fq);
      pts[m] = vx[p] + (vx[q] - vx[p]) * t;
      pts[m + 1] = vy[p] + (vy[q] - vy[p]) * t;
      return m + 2;
    }
    return m;
  };
  /** The segment of sub-triangle a, b, c at the level, when its sides cross it exactly twice. */
  const tri = (seg: number[], lev: number, a: number, b: number, c: number): void => {
    let m = cross(a, b, lev, 0);
    m = cross(b, c, lev, m);
    m = cross(c, a, lev, m);
    if (m === 4) seg.push(pts[0], pts[1], pts[2], pts[3]);
  };
  for (let e = 0; e < mesh.nElements; e++) {
    if (within && outsideBox(mesh, e, view, k, within)) continue;
    const n = subdivisions(mesh, e, view, k, true);
    const g = (n + 1) * (n + 1);
    if (vx.length < g) {
      vx = new Float64Array(g);
      vy = new Float64Array(g);
      vv = new Float64Array(g);
    }
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i <= n; i++) {
      for (let j = 0; j <= n - i; j++) {
        const id = i * (n + 1) + j;
        shape(mesh.order, j / n, i / n, N);
        let x = 0;
        let y = 0;
        for (let q = 0; q < field.stride; q++) comp[q] = 0;
        for (let a = 0; a < per; a++) {
          const v = el[per * e + a];
          x += N[a] * mesh.nodes[2 * v];
          y += N[a] * mesh.nodes[2 * v + 1];
          for (let q = 0; q < field.stride; q++) comp[q] += N[a] * field.data[field.stride * v + q];
        }
        vx[id] = (view.ox + view.s * x) * k;
        vy[id] = (view.oy - view.s * y) * k;
        const val = field.value(comp);
        vv[id] = val;
        if (val < lo) lo = val;
        if (val > hi) hi = val;
      }
    }
    for (let li = 0; li < levels.length; li++) {
      const lev = levels[li];
      if (lev < lo || lev > hi) continue;
      const seg = out[li];
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n - i; j++) {
          const a = i * (n + 1) + j;
          tri(seg, lev, a, a + 1, a + n + 1);
          if (j < n - i - 1) tri(seg, lev, a + 1, a + n + 2, a + n + 1);
        }
      }
    }
  }
  return out;
}

/**
 * Every element side once, as pixel polylines (curved sides of 6-node elements in 4 pieces); with
 * `within` (a pixel box), only the sides of elements not wholly outside it.
 */
export function meshEdgeLines(mesh: DrawMesh, view: View, within?: readonly number[]): number[][] {
  const per = mesh.order === 2 ? 6 : 3;
  const seen = new Set<number>();
  const lines: number[][] = [];
  const el = mesh.elements;
  const mids = [3, 4, 5];
  for (let e = 0; e < mesh.nElements; e++) {
    if (within && outsideBox(mesh, e, view, 1, within)) continue;
    for (let i = 0; i < 3; i++) {
      const a = el[per * e + i];
      const b = el[per * e + ((i + 1) % 3)];
      const key = Math.min(a, b) * mesh.nNodes + Math.max(a, b);
      if (seen.has(key)) continue;
      seen.add(key);
      const m = per === 6 ? el[per * e + mids[i]] : -1;
      lines.push(edgePolyline(mesh.nodes, a, b, m, view));
    }
  }
  return lines;
}

/** A side from node a to b through midside node m (or straight when m < 0), in pixels. */
export function edgePolyline(nodes: Float64Array, a: number, b: number, m: number, view: View): number[] {
  const ax = nodes[2 * a];
  const ay = nodes[2 * a + 1];
  const bx = nodes[2 * b];
  const by = nodes[2 * b + 1];
  if (m < 0) return [view.ox + view.s * ax, view.oy - view.s * ay, view.ox + view.s * bx, view.oy - view.s * by];
  const mx = nodes[2 * m];
  const my = nodes[2 * m + 1];
  const off = Math.hypot(mx - 0.5 * (ax + bx), my - 0.5 * (ay + by)) * view.s;
  const pieces = off < 0.05 ? 1 : Math.min(16, Math.max(4, Math.ceil(Math.sqrt(off) * 4)));
  const out: number[] = [];
  for (let k = 0; k <= pieces; k++) {
    const u = k / pieces;
    const na = (1 - u) * (1 - 2 * u);
    const nm = 4 * u * (1 - u);
    const nb = u * (2 * u - 1);
    out.push(view.ox + view.s * (na * ax + nm * mx + nb * bx), view.oy - view.s * (na * ay + nm * my + nb * by));
  }
  return out;
}
