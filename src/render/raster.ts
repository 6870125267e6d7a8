/**
 * A small RGBA raster: antialiased lines (Xiaolin Wu's algorithm, "An efficient antialiasing
 * technique", SIGGRAPH 1991), filled triangles with per-pixel colour, PNG output through pngjs.
 * Pixel (0, 0) is the top-left corner; callers map model coordinates (y up) to it.
 */
import { PNG } from 'pngjs';

export class Raster {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8Array;

  constructor(width: number, height: number, background: [number, number, number] = [255, 255, 255]) {
    this.width = width;
    this.height = height;
    this.data = new Uint8Array(4 * width * height);
    for (let i = 0; i < width * height; i++) {
      this.data[4 * i] = background[0];
      this.data[4 * i + 1] = background[1];
      this.data[4 * i + 2] = background[2];
      this.data[4 * i + 3] = 255;
    }
  }

  /** Blends colour c into pixel (x, y) with coverage a in [0, 1]. */
  blend(x: number, y: number, c: readonly number[], a: number): void {
    if (x < 0 || y < 0 || x >= this.width || y >= this.height || a <= 0) return;
    const o = 4 * (y * this.width + x);
    const d = this.data;
    const k = Math.min(1, a);
    d[o] = d[o] + (c[0] - d[o]) * k;
    d[o + 1] = d[o + 1] + (c[1] - d[o + 1]) * k;
    d[o + 2] = d[o + 2] + (c[2] - d[o + 2]) * k;
  }

  set(x: number, y: number, c: readonly number[]): void {
    if (x < 0 || y < 0 || x >= this.width || y >= this.height) return;
    const o = 4 * (y * this.width + x);
    this.data[o] = c[0];
    this.data[o + 1] = c[1];
    this.data[o + 2] = c[2];
  }

  /** Antialiased line of width about one pixel, with opacity alpha. */
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
    const minX = Math.max(0, Math.floor(Math.min(x0, x1, x2)));
    const maxX = Math.min(this.width - 1, Math.ceil(Math.max(x0, x1, x2)));
    const minY = Math.max(0, Math.floor(Math.min(y0, y1, y2)));
    const maxY = Math.min(this.height - 1, Math.ceil(Math.max(y0, y1, y2)));
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

  toPng(): Buffer {
    const png = new PNG({ width: this.width, height: this.height });
    png.data = Buffer.from(this.data.buffer, this.data.byteOffset, this.data.byteLength);
    return PNG.sync.write(png);
  }
}
