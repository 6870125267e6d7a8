/**
 * A small RGBA raster with antialiased vector fills, PNG output through ./png.ts.
 * Pixel (0, 0) is the top-left corner, y down; callers map model coordinates (y up) to it.
 *
 * Filled paths are rasterised by exact signed-area accumulation: every edge adds, to the cells
 * it crosses, the signed area between it and the cell's right side, and a running sum along
 * each row gives the coverage of every pixel (the method of R. Levien's font-rs, "Inside the
 * fastest font renderer in the world", 2016, after the accumulation idea of libart and
 * stb_truetype). The coverage is min(1, |winding|): a non-zero fill for subpaths of one
 * orientation, with opposite subpaths (holes of a plate, counters of a glyph) cut out. Strokes
 * are filled as one path of consistently oriented quads and round joins, so a polyline
 * overlapping itself does not darken twice.
 */
import { encodePng } from './png.js';

export type Rgb = readonly [number, number, number];

/** A path: closed subpaths, each a flat list x0, y0, x1, y1, ... in pixels. */
export type Subpaths = ArrayLike<number>[];

export class Raster {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8Array;
  /** drawing is limited to [x0, x1) x [y0, y1) */
  private clipBox: [number, number, number, number];

  constructor(width: number, height: number, background: Rgb | null = [255, 255, 255]) {
    if (!(Number.isInteger(width) && Number.isInteger(height) && width > 0 && height > 0)) throw new RangeError(`Raster: bad size ${width} x ${height}`);
    this.width = width;
    this.height = height;
    this.data = new Uint8Array(4 * width * height);
    this.clipBox = [0, 0, width, height];
    if (background) {
      // the first pixel, then copies doubling in length (no per-pixel loop)
      const d = this.data;
      d[0] = background[0];
      d[1] = background[1];
      d[2] = background[2];
      d[3] = 255;
      for (let filled = 4; filled < d.length; filled *= 2) d.copyWithin(filled, 0, Math.min(filled, d.length - filled));
    }
  }

  /** Limits drawing to a rectangle (pixel edges, clamped to the raster); null removes the limit. */
  setClip(box: readonly [number, number, number, number] | null): void {
    if (!box) {
      this.clipBox = [0, 0, this.width, this.height];
      return;
    }
    this.clipBox = [
      Math.max(0, Math.floor(box[0])),
      Math.max(0, Math.floor(box[1])),
      Math.min(this.width, Math.ceil(box[2])),
      Math.min(this.height, Math.ceil(box[3])),
    ];
  }

  get clip(): readonly [number, number, number, number] {
    return this.clipBox;
  }

  private inside(x: number, y: number): boolean {
    const c = this.clipBox;
    return x >= c[0] && y >= c[1] && x < c[2] && y < c[3];
  }

  /** Blends colour c into pixel (x, y) with coverage a in [0, 1] (source-over). */
  blend(x: number, y: number, c: readonly number[], a: number): void {
    if (a <= 0 || !this.inside(x, y)) return;
    const o = 4 * (y * this.width + x);
    const d = this.data;
    const k = Math.min(1, a);
    const da = d[o + 3] / 255;
    const oa = k + da * (1 - k);
    if (oa <= 0) return;
    // Straight (non-premultiplied) alpha: out = (c k + d da (1 - k)) / oa.
    d[o] = Math.round((c[0] * k + d[o] * da * (1 - k)) / oa);
    d[o + 1] = Math.round((c[1] * k + d[o + 1] * da * (1 - k)) / oa);
    d[o + 2] = Math.round((c[2] * k + d[o + 2] * da * (1 - k)) / oa);
    d[o + 3] = Math.round(255 * oa);
  }

  set(x: number, y: number, c: readonly number[]): void {
    if (!this.inside(x, y)) return;
    const o = 4 * (y * this.width + x);
    this.data[o] = c[0];
    this.data[o + 1] = c[1];
    this.data[o + 2] = c[2];
    this.data[o + 3] = 255;
  }

  /** The colour at (x, y) as [r, g, b, a]. */
  get(x: number, y: number): [number, number, number, number] {
    const o = 4 * (y * this.width + x);
    return [this.data[o], this.data[o + 1], this.data[o + 2], this.data[o + 3]];
  }

  /**
   * Fills closed subpaths with colour c at opacity alpha, antialiased (coverage from exact
   * areas). Subpaths of one orientation add up; a subpath of the opposite orientation inside
   * another cuts a hole.
   */
  fillPath(paths: Subpaths, c: Rgb, alpha = 1): void {
    let xmin = Infinity;
    let ymin = Infinity;
    let xmax = -Infinity;
    let ymax = -Infinity;
    for (const p of paths) {
      for (let k = 0; k + 1 < p.length; k += 2) {
        const x = p[k];
        const y = p[k + 1];
        if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
        if (x < xmin) xmin = x;
        if (x > xmax) xmax = x;
        if (y < ymin) ymin = y;
        if (y > ymax) ymax = y;
      }
    }
    const cb = this.clipBox;
    const bx0 = Math.max(cb[0], Math.floor(xmin));
    const by0 = Math.max(cb[1], Math.floor(ymin));
    const bx1 = Math.min(cb[2], Math.ceil(xmax));
    const by1 = Math.min(cb[3], Math.ceil(ymax));
    if (!(bx1 > bx0 && by1 > by0)) return;
    const w = bx1 - bx0;
    const h = by1 - by0;
    const stride = w + 2;
    const acc = new Float32Array(stride * h);
    for (const p of paths) {
      const n = p.length >> 1;
      if (n < 2) continue;
      for (let k = 0; k < n; k++) {
        const j = (k + 1) % n;
        accumulateClipped(acc, stride, w, h, p[2 * k] - bx0, p[2 * k + 1] - by0, p[2 * j] - bx0, p[2 * j + 1] - by0);
      }
    }
    // The blend of `blend` written out for the covered pixels (all inside the clip box): where the
    // coverage times alpha is 1 the result is the colour itself, whatever was below.
    const d = this.data;
    const [c0, c1, c2] = c;
    const r0 = Math.round(c0);
    const r1 = Math.round(c1);
    const r2 = Math.round(c2);
    for (let y = 0; y < h; y++) {
      let s = 0;
      const row = y * stride;
      let o = 4 * ((by0 + y) * this.width + bx0);
      for (let x = 0; x < w; x++, o += 4) {
        s += acc[row + x];
        const cov = Math.min(1, Math.abs(s));
        if (!(cov > 1 / 512)) continue;
        const a = cov * alpha;
        if (a <= 0) continue;
        if (a >= 1) {
          d[o] = r0;
          d[o + 1] = r1;
          d[o + 2] = r2;
          d[o + 3] = 255;
          continue;
        }
        const da = d[o + 3] / 255;
        const oa = a + da * (1 - a);
        if (oa <= 0) continue;
        d[o] = Math.round((c0 * a + d[o] * da * (1 - a)) / oa);
        d[o + 1] = Math.round((c1 * a + d[o + 1] * da * (1 - a)) / oa);
        d[o + 2] = Math.round((c2 * a + d[o + 2] * da * (1 - a)) / oa);
        d[o + 3] = Math.round(255 * oa);
      }
    }
  }

  /**
   * Strokes a polyline (x0, y0, x1, y1, ...) of the given width in pixels, with round joins
   * and caps; `closed` joins the last point to the first; `dash` [on, off] in pixels.
   */
  strokePolyline(pts: ArrayLike<number>, width: number, c: Rgb, alpha = 1, closed = false, dash?: readonly number[]): void {
    const paths: number[][] = [];
    addStroke(paths, pts, width, closed, dash);
    this.fillPath(paths, c, alpha);
  }

  /** A thin antialiased line about one pixel wide (X. Wu, "An efficient antialiasing technique", SIGGRAPH 1991). */
  line(x0: number, y0: number, x1: number, y1: number, c: readonly number[], alpha = 1): void {
    const steep = Math.abs(y1 - y0) > Math.abs(x1 - x0);
    if (steep) [x0, y0, x1, y1] = [y0, x0, y1, x1];
    if (x0 > x1) [x0, y0, x1, y1] = [x1, y1, x0, y0];
    const dx = x1 - x0;
    const grad = dx === 0 ? 1 : (y1 - y0) / dx;
    const plot = (x: number, y: number, a: number) => (steep ? this.blend(y, x, c, a * alpha) : this.blend(x, y, c, a * alpha));
    const xs = Math.round(x0);
    const xe = Math.round(x1);
    let y = y0 + grad * (xs - x0);
    for (let x = xs; x <= xe; x++) {
      const fy = Math.floor(y);
      const f = y - fy;
      plot(x, fy, 1 - f);
      plot(x, fy + 1, f);
      y += grad;
    }
  }

  /**
   * Fills the triangle, calling colour(b0, b1, b2, out) with the barycentric coordinates of each
   * covered pixel centre; out receives r, g, b, and a coverage (0 skips the pixel).
   */
  fillTriangle(
    x0: number, y0: number, x1: number, y1: number, x2: number, y2: number,
    colour: (b0: number, b1: number, b2: number, out: number[]) => void,
  ): void {
    const cb = this.clipBox;
    const minX = Math.max(cb[0], Math.floor(Math.min(x0, x1, x2)));
    const maxX = Math.min(cb[2] - 1, Math.ceil(Math.max(x0, x1, x2)));
    const minY = Math.max(cb[1], Math.floor(Math.min(y0, y1, y2)));
    const maxY = Math.min(cb[3] - 1, Math.ceil(Math.max(y0, y1, y2)));
    const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    if (det === 0) return;
    const out = [0, 0, 0, 0];
    for (let py = minY; py <= maxY; py++) {
      const cy = py + 0.5;
      for (let px = minX; px <= maxX; px++) {
        const cx = px + 0.5;
        const b1 = ((cx - x0) * (y2 - y0) - (x2 - x0) * (cy - y0)) / det;
        const b2 = ((x1 - x0) * (cy - y0) - (cx - x0) * (y1 - y0)) / det;
        const b0 = 1 - b1 - b2;
        const eps = -1e-9;
        if (b0 < eps || b1 < eps || b2 < eps) continue;
        colour(b0, b1, b2, out);
        if (out[3] <= 0) continue;
        if (out[3] >= 1) this.set(px, py, out);
        else this.blend(px, py, out, out[3]);
      }
    }
  }

  /** Draws another raster (with its alpha) at integer offset (ox, oy). */
  drawRaster(src: Raster, ox: number, oy: number): void {
    for (let y = 0; y < src.height; y++) {
      for (let x = 0; x < src.width; x++) {
        const o = 4 * (y * src.width + x);
        const a = src.data[o + 3];
        if (a === 0) continue;
        const c = [src.data[o], src.data[o + 1], src.data[o + 2]];
        if (a === 255) this.set(ox + x, oy + y, c);
        else this.blend(ox + x, oy + y, c, a / 255);
      }
    }
  }

  /** PNG bytes: RGB when every pixel is opaque, RGBA otherwise (Paeth filter on every row, see ./png.ts). */
  toPng(): Buffer {
    return encodePng(this.data, this.width, this.height);
  }
}

/**
 * Adds the edge (x0, y0) -> (x1, y1), in buffer coordinates, to the accumulation buffer,
 * split where it leaves [0, w] in x: the parts left of the box run down its left side (they
 * still change the winding of every pixel to their right), the parts right of it are dropped.
 */
function accumulateClipped(acc: Float32Array, stride: number, w: number, h: number, x0: number, y0: number, x1: number, y1: number): void {
  if (y0 === y1 || !Number.isFinite(x0 + y0 + x1 + y1)) return;
  // Split at x = 0 and x = w: the parameters 0 <= t <= 1 of the crossings, in increasing order
  // (no array per edge: this runs for every edge of every fill).
  let tl = -1;
  let tr = -1;
  if ((x0 < 0) !== (x1 < 0)) tl = (0 - x0) / (x1 - x0);
  if ((x0 > w) !== (x1 > w)) tr = (w - x0) / (x1 - x0);
  if (tl >= 0 && tr >= 0 && tr < tl) [tl, tr] = [tr, tl];
  const pieces = 1 + (tl >= 0 ? 1 : 0) + (tr >= 0 ? 1 : 0);
  for (let k = 0; k < pieces; k++) {
    const ta = k === 0 ? 0 : k === 1 ? (tl >= 0 ? tl : tr) : tr;
    const tb = k === pieces - 1 ? 1 : k === 0 ? (tl >= 0 ? tl : tr) : tr;
    if (tb <= ta) continue;
    const ax = x0 + (x1 - x0) * ta;
    const ay = y0 + (y1 - y0) * ta;
    const bx = x0 + (x1 - x0) * tb;
    const by = y0 + (y1 - y0) * tb;
    const mx = 0.5 * (ax + bx);
    if (mx > w) continue;
    if (mx < 0) accumulateLine(acc, stride, h, 0, ay, 0, by);
    else accumulateLine(acc, stride, h, Math.min(w, Math.max(0, ax)), ay, Math.min(w, Math.max(0, bx)), by);
  }
}

/** The signed-area accumulation of one edge inside the box (font-rs, R. Levien 2016). */
function accumulateLine(a: Float32Array, stride: number, h: number, x0: number, y0: number, x1: number, y1: number): void {
  if (y0 === y1) return;
  let dir = 1;
  if (y0 > y1) {
    dir = -1;
    [x0, y0, x1, y1] = [x1, y1, x0, y0];
  }
  const dxdy = (x1 - x0) / (y1 - y0);
  let x = x0;
  if (y0 < 0) {
    x -= y0 * dxdy;
    y0 = 0;
  }
  const yEnd = Math.min(h, Math.ceil(y1));
  for (let y = Math.max(0, Math.floor(y0)); y < yEnd; y++) {
    const ls = y * stride;
    const dy = Math.min(y + 1, y1) - Math.max(y, y0);
    if (dy <= 0) continue;
    const xnext = x + dxdy * dy;
    const d = dy * dir;
    const xa = x < xnext ? x : xnext;
    const xb = x < xnext ? xnext : x;
    const x0floor = Math.floor(xa);
    const x0i = x0floor;
    const x1ceil = Math.ceil(xb);
    const x1i = x1ceil;
    if (x1i <= x0i + 1) {
      const xmf = 0.5 * (x + xnext) - x0floor;
      a[ls + x0i] += d - d * xmf;
      a[ls + x0i + 1] += d * xmf;
    } else {
      const s = 1 / (xb - xa);
      const x0f = xa - x0floor;
      const a0 = 0.5 * s * (1 - x0f) * (1 - x0f);
      const x1f = xb - x1ceil + 1;
      const am = 0.5 * s * x1f * x1f;
      a[ls + x0i] += d * a0;
      if (x1i === x0i + 2) {
        a[ls + x0i + 1] += d * (1 - a0 - am);
      } else {
        const a1 = s * (1.5 - x0f);
        a[ls + x0i + 1] += d * (a1 - a0);
        for (let xi = x0i + 2; xi < x1i - 1; xi++) a[ls + xi] += d * s;
        const a2 = a1 + (x1i - x0i - 3) * s;
        a[ls + x1i - 1] += d * (1 - a2 - am);
      }
      a[ls + x1i] += d * am;
    }
    x = xnext;
  }
}

/** Signed area (pixel coordinates) of a closed flat polygon. */
function signedArea(p: ArrayLike<number>): number {
  let s = 0;
  const n = p.length >> 1;
  for (let k = 0; k < n; k++) {
    const j = (k + 1) % n;
    s += p[2 * k] * p[2 * j + 1] - p[2 * j] * p[2 * k + 1];
  }
  return s / 2;
}

function pushOriented(paths: number[][], poly: number[]): void {
  if (signedArea(poly) < 0) {
    const r: number[] = [];
    for (let k = poly.length - 2; k >= 0; k -= 2) r.push(poly[k], poly[k + 1]);
    paths.push(r);
  } else paths.push(poly);
}

/** A disc as a polygon with segments about one pixel long (at least 8). */
export function discPolygon(cx: number, cy: number, r: number): number[] {
  const n = Math.max(8, Math.min(128, Math.ceil(2 * Math.PI * r)));
  const out: number[] = [];
  for (let k = 0; k < n; k++) {
    const a = (2 * Math.PI * k) / n;
    out.push(cx + r * Math.cos(a), cy + r * Math.sin(a));
  }
  return out;
}

/**
 * Appends to `paths` the outline of a stroked polyline: one quad per segment and a disc at each
 * vertex (round joins and caps), all of one orientation. Dashes split the polyline first.
 */
export function addStroke(paths: number[][], pts: ArrayLike<number>, width: number, closed = false, dash?: readonly number[]): void {
  const hw = width / 2;
  const n = pts.length >> 1;
  if (n < 2) return;
  const pieces: number[][] = dash && dash.length >= 2 ? dashPolyline(pts, closed, dash[0], dash[1]) : [Array.from(pts as ArrayLike<number>).concat(closed ? [pts[0], pts[1]] : [])];
  for (const q of pieces) {
    const m = q.length >> 1;
    for (let k = 0; k + 1 < m; k++) {
      const ax = q[2 * k];
      const ay = q[2 * k + 1];
      const bx = q[2 * k + 2];
      const by = q[2 * k + 3];
      const l = Math.hypot(bx - ax, by - ay);
      if (l === 0) continue;
      const nx = (-(by - ay) / l) * hw;
      const ny = ((bx - ax) / l) * hw;
      pushOriented(paths, [ax + nx, ay + ny, bx + nx, by + ny, bx - nx, by - ny, ax - nx, ay - ny]);
    }
    if (hw >= 0.75) {
      // Round joins where the line turns by more than 15 degrees (a smaller turn leaves a gap of
      // under hw/4 at the outer side). No disc elsewhere: a disc over the quads counts the
      // antialiased fringe twice and darkens it. Butt ends at open ends.
      const closedPiece = m > 2 && q[0] === q[2 * m - 2] && q[1] === q[2 * m - 1];
      for (let k = 0; k < m; k++) {
        const prev = k > 0 ? k - 1 : closedPiece ? m - 2 : -1;
        const next = k < m - 1 ? k + 1 : closedPiece ? 1 : -1;
        if (prev < 0 || next < 0) continue;
        const ux = q[2 * k] - q[2 * prev];
        const uy = q[2 * k + 1] - q[2 * prev + 1];
        const vx = q[2 * next] - q[2 * k];
        const vy = q[2 * next + 1] - q[2 * k + 1];
        const turn = Math.abs(Math.atan2(ux * vy - uy * vx, ux * vx + uy * vy));
        if (turn > (15 * Math.PI) / 180) pushOriented(paths, discPolygon(q[2 * k], q[2 * k + 1], hw));
      }
    }
  }
}

/** Splits a polyline into dashes of length `on` separated by gaps `off` (pixels). */
function dashPolyline(pts: ArrayLike<number>, closed: boolean, on: number, off: number): number[][] {
  const out: number[][] = [];
  const n = pts.length >> 1;
  const m = closed ? n + 1 : n;
  let drawing = true;
  let left = on;
  let cur: number[] = [pts[0], pts[1]];
  for (let k = 0; k + 1 < m; k++) {
    let ax = pts[2 * (k % n)];
    let ay = pts[2 * (k % n) + 1];
    const bx = pts[2 * ((k + 1) % n)];
    const by = pts[2 * ((k + 1) % n) + 1];
    let l = Math.hypot(bx - ax, by - ay);
    while (l > left) {
      const t = left / l;
      const px = ax + (bx - ax) * t;
      const py = ay + (by - ay) * t;
      if (drawing) {
        cur.push(px, py);
        out.push(cur);
      } else cur = [px, py];
      drawing = !drawing;
      ax = px;
      ay = py;
      l -= left;
      left = drawing ? on : off;
    }
    left -= l;
    if (drawing) cur.push(bx, by);
  }
  if (drawing && cur.length >= 4) out.push(cur);
  return out;
}
