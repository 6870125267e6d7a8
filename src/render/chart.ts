/**
 * Line charts drawn by the same scene renderer as the contour pictures: axes with round ticks
 * (linear, or logarithmic at 1, 2, 5 times powers of ten), grid, series as lines with markers,
 * shaded bands, horizontal reference lines with labels, and a key.
 */
import { capHeight, textWidth } from './font.js';
import type { Rgb } from './raster.js';
import { discPolygon } from './raster.js';
import { addText, type Box, type Scene } from './scene.js';
import { formatTicks, formatValue, niceStep, ticksIn } from './ticks.js';
import { INK, PAPER, SOFT } from './annotate.js';

export interface Series {
  name: string;
  /** x0, y0, x1, y1, ... in data units */
  points: number[];
  colour: Rgb;
  markers?: boolean;
  dash?: number[];
  width?: number;
}

export interface RefLine {
  y: number;
  label: string;
  colour: Rgb;
  dash?: number[];
}

export interface Band {
  /** x, lower y, upper y */
  x: number;
  lo: number;
  hi: number;
  colour: Rgb;
  label?: string;
}

export interface ChartSpec {
  xLabel: string;
  yLabel: string;
  xLog?: boolean;
  series: Series[];
  refLines?: RefLine[];
  /** error bars */
  bands?: Band[];
  /** y range to include besides the data */
  yInclude?: number[];
}

export interface ChartResult {
  plot: Box;
  xToPx: (x: number) => number;
  yToPx: (y: number) => number;
}

export function drawChart(s: Scene, box: Box, spec: ChartSpec, size: number): ChartResult {
  const xs: number[] = [];
  const ys: number[] = [...(spec.yInclude ?? [])];
  for (const se of spec.series) {
    for (let k = 0; k + 1 < se.points.length; k += 2) {
      if (Number.isFinite(se.points[k]) && Number.isFinite(se.points[k + 1])) {
        xs.push(se.points[k]);
        ys.push(se.points[k + 1]);
      }
    }
  }
  for (const r of spec.refLines ?? []) if (Number.isFinite(r.y)) ys.push(r.y);
  for (const b of spec.bands ?? []) ys.push(b.lo, b.hi);
  let xmin = Math.min(...xs);
  let xmax = Math.max(...xs);
  let ymin = Math.min(...ys);
  let ymax = Math.max(...ys);
  if (!Number.isFinite(xmin)) [xmin, xmax] = [0, 1];
  if (!Number.isFinite(ymin)) [ymin, ymax] = [0, 1];
  if (ymax - ymin <= 1e-12 * Math.max(1, Math.abs(ymax))) {
    const d = Math.abs(ymax) * 0.01 || 1;
    ymin -= d;
    ymax += d;
  }
  const ypad = 0.06 * (ymax - ymin);
  ymin -= ypad;
  ymax += ypad;
  const fx = (v: number) => (spec.xLog ? Math.log10(v) : v);
  let fx0 = fx(xmin);
  let fx1 = fx(xmax);
  if (fx1 - fx0 <= 1e-12) {
    fx0 -= spec.xLog ? 0.1 : 0.5;
    fx1 += spec.xLog ? 0.1 : 0.5;
  } else {
    const p = 0.05 * (fx1 - fx0);
    fx0 -= p;
    fx1 += p;
  }
  const yStep = niceStep(ymin, ymax, 6);
  const yTicks = ticksIn(ymin, ymax, yStep);
  const yLabels = formatTicks(yTicks, yStep);
  const leftText = Math.max(...yLabels.map((l) => textWidth(l, size)), 0);
  const plot: Box = [box[0] + leftText + size * 2.6, box[1] + size * 0.8, box[2] - size * 0.8, box[3] - size * 3.2];
  const xToPx = (x: number) => plot[0] + ((fx(x) - fx0) / (fx1 - fx0)) * (plot[2] - plot[0]);
  const yToPx = (y: number) => plot[3] - ((y - ymin) / (ymax - ymin)) * (plot[3] - plot[1]);
  // Grid and ticks.
  const grid: number[][] = [];
  const tickLines: number[][] = [];
  yTicks.forEach((v, i) => {
    const py = yToPx(v);
    grid.push([plot[0], py, plot[2], py]);
    tickLines.push([plot[0] - size * 0.35, py, plot[0], py]);
    addText(s, yLabels[i], plot[0] - size * 0.55, py + capHeight(size) / 2, size, INK, { anchor: 'end' });
  });
  const xTicks: number[] = [];
  if (spec.xLog) {
    for (let e = Math.floor(fx0); e <= Math.ceil(fx1); e++) {
      for (const m of [1, 2, 5]) {
        const v = m * Math.pow(10, e);
        if (fx(v) >= fx0 && fx(v) <= fx1) xTicks.push(v);
      }
    }
  } else xTicks.push(...ticksIn(fx0, fx1, niceStep(fx0, fx1, 6)));
  const xLabels = spec.xLog ? xTicks.map((v) => formatValue(v, 3)) : formatTicks(xTicks, niceStep(fx0, fx1, 6));
  let lastRight = -Infinity;
  xTicks.forEach((v, i) => {
    const px = xToPx(v);
    grid.push([px, plot[1], px, plot[3]]);
    tickLines.push([px, plot[3], px, plot[3] + size * 0.35]);
    const w = textWidth(xLabels[i], size);
    if (px - w / 2 > lastRight + size * 0.5) {
      addText(s, xLabels[i], px, plot[3] + size * 1.55, size, INK, { anchor: 'middle' });
      lastRight = px + w / 2;
    }
  });
  s.items.push({ kind: 'stroke', lines: grid, width: 1, colour: [222, 224, 228], clip: plot });
  s.items.push({ kind: 'stroke', lines: tickLines, width: 1, colour: INK });
  addText(s, spec.xLabel, 0.5 * (plot[0] + plot[2]), box[3] - size * 0.35, size, INK, { anchor: 'middle' });
  addText(s, spec.yLabel, box[0] + size * 0.95, 0.5 * (plot[1] + plot[3]), size, INK, { anchor: 'middle', rotate: -Math.PI / 2 });
  // Bands, reference lines, series.
  for (const b of spec.bands ?? []) {
    const px = xToPx(b.x);
    const w = size * 0.5;
    s.items.push({ kind: 'stroke', lines: [[px, yToPx(b.lo), px, yToPx(b.hi)], [px - w, yToPx(b.lo), px + w, yToPx(b.lo)], [px - w, yToPx(b.hi), px + w, yToPx(b.hi)]], width: 1.5, colour: b.colour, clip: plot });
  }
  for (const r of spec.refLines ?? []) {
    if (!Number.isFinite(r.y)) continue;
    const py = yToPx(r.y);
    s.items.push({ kind: 'stroke', lines: [[plot[0], py, plot[2], py]], width: 1.5, colour: r.colour, dash: r.dash ?? [7, 5], clip: plot });
    addText(s, r.label, plot[2] - size * 0.4, py - size * 0.45, size * 0.9, r.colour, { anchor: 'end' });
  }
  for (const se of spec.series) {
    // A non-finite point breaks the line (the line leaves the material there).
    const pieces: number[][] = [[]];
    const discs: number[][] = [];
    for (let k = 0; k + 1 < se.points.length; k += 2) {
      const x = se.points[k];
      const y = se.points[k + 1];
      if (!Number.isFinite(x) || !Number.isFinite(y)) {
        if (pieces[pieces.length - 1].length > 0) pieces.push([]);
        continue;
      }
      const px = xToPx(x);
      const py = yToPx(y);
      pieces[pieces.length - 1].push(px, py);
      if (se.markers) discs.push(discPolygon(px, py, size * 0.32));
    }
    s.items.push({ kind: 'stroke', lines: pieces.filter((p) => p.length >= 4), width: se.width ?? 2, colour: se.colour, dash: se.dash, clip: plot });
    if (discs.length) s.items.push({ kind: 'fill', paths: discs, colour: se.colour });
  }
  s.items.push({ kind: 'stroke', lines: [[plot[0], plot[1], plot[2], plot[1], plot[2], plot[3], plot[0], plot[3]]], width: 1.2, colour: INK, closed: true });
  // Key, on a paper-coloured box in the corner of the plot that covers the fewest data points.
  if (spec.series.length > 0) {
    const kw = size * 3.1 + Math.max(...spec.series.map((se) => textWidth(se.name, size * 0.9)));
    const kh = size * 1.35 * spec.series.length + size * 0.5;
    const pad = size * 0.4;
    const corners: [number, number][] = [
      [plot[0] + pad, plot[1] + pad],
      [plot[2] - pad - kw, plot[1] + pad],
      [plot[0] + pad, plot[3] - pad - kh],
      [plot[2] - pad - kw, plot[3] - pad - kh],
    ];
    const covered = ([x0, y0]: [number, number]) => {
      let n = 0;
      for (const se of spec.series) {
        for (let k = 0; k + 1 < se.points.length; k += 2) {
          const px = xToPx(se.points[k]);
          const py = yToPx(se.points[k + 1]);
          if (px >= x0 - size && px <= x0 + kw + size && py >= y0 - size && py <= y0 + kh + size) n++;
        }
      }
      return n;
    };
    let [bx0, by0] = corners[0];
    let best = Infinity;
    for (const c of corners) {
      const n = covered(c);
      if (n < best) [best, bx0, by0] = [n, c[0], c[1]];
    }
    s.items.push({ kind: 'fill', paths: [[bx0, by0, bx0 + kw, by0, bx0 + kw, by0 + kh, bx0, by0 + kh]], colour: PAPER, alpha: 0.88 });
    s.info.boxes.push({ what: 'key', box: [bx0, by0, bx0 + kw, by0 + kh] });
    let ky = by0 + size * 1.0;
    for (const se of spec.series) {
      const kx = bx0 + size * 0.4;
      s.items.push({ kind: 'stroke', lines: [[kx, ky - capHeight(size) / 2, kx + size * 1.8, ky - capHeight(size) / 2]], width: se.width ?? 2, colour: se.colour, dash: se.dash });
      addText(s, se.name, kx + size * 2.3, ky, size * 0.9, SOFT);
      ky += size * 1.35;
    }
  }
  return { plot, xToPx, yToPx };
}
