/**
 * The furniture of a picture: the colour legend with its round values, the scale bar, a marked
 * point with a label, and a label with a light backing. All draw into a Scene and record the
 * box they cover in scene.info.boxes.
 */
import type { ColourMap } from './colormap.js';
import { capHeight, textWidth } from './font.js';
import { discPolygon, type Rgb } from './raster.js';
import { addText, type Box, type Scene } from './scene.js';
import { formatTicks, formatValue, niceStep, roundDown125, ticksIn } from './ticks.js';

export const INK: Rgb = [28, 30, 38];
export const SOFT: Rgb = [96, 100, 110];
export const PAPER: Rgb = [255, 255, 255];

export interface LegendTick {
  value: number;
  label: string;
  /** pixel y of the tick on the bar */
  y: number;
}

export interface LegendResult {
  bar: Box;
  ticks: LegendTick[];
  step: number;
  box: Box;
}

/**
 * A vertical colour legend in the column `col` (left, top, right, bottom): heading lines, the
 * bar with ticks at round values, the maximum above the bar and the minimum below it. `field`
 * is the range of the data, `range` the range the colours span (the same unless the user chose
 * one; values beyond it take the end colours, shown by arrow heads on the bar).
 */
export function drawLegend(s: Scene, col: Box, heading: string[], map: ColourMap, range: [number, number], field: [number, number], size: number): LegendResult {
  const [x0, y0, x1, y1] = col;
  let y = y0 + capHeight(size * 1.05);
  for (const [i, line] of heading.entries()) {
    // A heading wider than the column is set smaller rather than run past the picture's edge.
    const want = i === 0 ? size * 1.05 : size;
    const w = textWidth(line, want, i === 0 ? 'bold' : 'normal');
    const fitted = w > x1 - x0 ? (want * (x1 - x0)) / w : want;
    addText(s, line, x0, y, fitted, i === 0 ? INK : SOFT, { weight: i === 0 ? 'bold' : 'normal' });
    y += size * 1.45;
  }
  const maxLabel = `max ${formatValue(field[1])}`;
  const minLabel = `min ${formatValue(field[0])}`;
  addText(s, maxLabel, x0, y + capHeight(size) * 0.2, size, INK);
  y += size * 1.0;
  const barW = Math.max(10, size * 1.3);
  const top = y + size * 0.6;
  const bottom = y1 - size * 2.2;
  const bar: Box = [x0, top, x0 + barW, bottom];
  s.items.push({ kind: 'gradient', box: bar, map, vertical: true });
  s.items.push({ kind: 'stroke', lines: [[bar[0], bar[1], bar[2], bar[1], bar[2], bar[3], bar[0], bar[3]]], width: 1, colour: INK, closed: true });
  addText(s, minLabel, x0, bottom + size * 1.55, size, INK);
  const [lo, hi] = range;
  const yAt = (v: number) => bottom - ((v - lo) / (hi - lo || 1)) * (bottom - top);
  // Arrow heads where the colours are clipped.
  const ah = barW * 0.55;
  if (field[1] > hi * (1 + 1e-12) + 1e-300) s.items.push({ kind: 'fill', paths: [[bar[0], top - 2, bar[2], top - 2, 0.5 * (bar[0] + bar[2]), top - 2 - ah]], colour: INK });
  if (field[0] < lo - Math.abs(lo) * 1e-12 - 1e-300) s.items.push({ kind: 'fill', paths: [[bar[0], bottom + 2, 0.5 * (bar[0] + bar[2]), bottom + 2 + ah, bar[2], bottom + 2]], colour: INK });
  const most = Math.max(2, Math.min(10, Math.floor((bottom - top) / (size * 2.2))));
  const step = niceStep(lo, hi, most);
  const values = ticksIn(lo, hi, step);
  const labels = formatTicks(values, step);
  const ticks: LegendTick[] = [];
  const lines: number[][] = [];
  values.forEach((v, i) => {
    const ty = yAt(v);
    lines.push([bar[2], ty, bar[2] + size * 0.4, ty]);
    addText(s, labels[i], bar[2] + size * 0.6, ty + capHeight(size) / 2, size, INK);
    ticks.push({ value: v, label: labels[i], y: ty });
  });
  s.items.push({ kind: 'stroke', lines, width: 1, colour: INK });
  const box: Box = [col[0], col[1], col[2], col[3]];
  s.info.boxes.push({ what: 'legend', box });
  return { bar, ticks, step, box };
}

/** A label with a light backing box; returns its box. */
export function drawLabel(s: Scene, text: string, x: number, y: number, size: number, what: string, opts: { anchor?: 'start' | 'middle' | 'end'; weight?: 'normal' | 'bold'; colour?: Rgb } = {}): Box {
  const w = textWidth(text, size, opts.weight);
  const anchor = opts.anchor ?? 'start';
  const left = anchor === 'start' ? x : anchor === 'middle' ? x - w / 2 : x - w;
  const pad = size * 0.3;
  const box: Box = [left - pad, y - capHeight(size) - pad, left + w + pad, y + size * 0.25 + pad];
  s.items.push({ kind: 'fill', paths: [[box[0], box[1], box[2], box[1], box[2], box[3], box[0], box[3]]], colour: PAPER, alpha: 0.88 });
  addText(s, text, x, y, size, opts.colour ?? INK, { anchor, weight: opts.weight });
  s.info.boxes.push({ what, box });
  return box;
}

/**
 * A marked point: a ring with a cross at (px, py) and a leader to a label placed in the first
 * of four diagonal directions where it fits inside `area`. Returns the label box.
 */
export function drawMarker(s: Scene, px: number, py: number, text: string, size: number, area: Box, what: string): Box {
  const r = size * 0.6;
  const ring = (rad: number, width: number, colour: Rgb) => {
    const p = discPolygon(px, py, rad);
    s.items.push({ kind: 'stroke', lines: [p], width, colour, closed: true });
  };
  ring(r, 4, PAPER);
  ring(r, 1.8, INK);
  s.items.push({ kind: 'stroke', lines: [[px - r * 1.6, py, px - r * 0.4, py], [px + r * 0.4, py, px + r * 1.6, py], [px, py - r * 1.6, px, py - r * 0.4], [px, py + r * 0.4, px, py + r * 1.6]], width: 1.4, colour: INK });
  const w = textWidth(text, size, 'bold') + size * 0.6;
  const h = size * 1.6;
  const d = size * 2.6;
  const candidates: [number, number][] = [
    [1, -1],
    [-1, -1],
    [1, 1],
    [-1, 1],
  ];
  let chosen: [number, number] = candidates[0];
  for (const c of candidates) {
    const lx = px + c[0] * d;
    const ly = py + c[1] * d;
    const bx0 = c[0] > 0 ? lx : lx - w;
    const by0 = c[1] < 0 ? ly - h : ly;
    if (bx0 >= area[0] && bx0 + w <= area[2] && by0 >= area[1] && by0 + h <= area[3]) {
      chosen = c;
      break;
    }
  }
  const lx = px + chosen[0] * d;
  const ly = py + chosen[1] * d;
  const ex = px + chosen[0] * r * 0.75;
  const ey = py + chosen[1] * r * 0.75;
  s.items.push({ kind: 'stroke', lines: [[ex, ey, lx, ly]], width: 3.2, colour: PAPER });
  s.items.push({ kind: 'stroke', lines: [[ex, ey, lx, ly]], width: 1.3, colour: INK });
  const baseline = chosen[1] < 0 ? ly - size * 0.45 : ly + size * 1.15;
  const tx = chosen[0] > 0 ? lx + size * 0.3 : lx - size * 0.3;
  const box = drawLabel(s, text, tx, baseline, size, what, { anchor: chosen[0] > 0 ? 'start' : 'end', weight: 'bold' });
  s.info.boxes.push({ what: `${what} marker`, box: [Math.min(px - r * 1.7, lx), Math.min(py - r * 1.7, ly), Math.max(px + r * 1.7, lx), Math.max(py + r * 1.7, ly)] });
  return box;
}

/** A scale bar of a round length (at most `maxPx` pixels long) with its label, left end at (x, y). */
export function drawScaleBar(s: Scene, x: number, y: number, pxPerUnit: number, maxPx: number, unit: string, size: number): { length: number; box: Box } {
  const length = roundDown125(maxPx / pxPerUnit);
  const L = length * pxPerUnit;
  const label = `${formatValue(length)} ${unit}`;
  const tw = textWidth(label, size);
  const box: Box = [x - size * 0.4, y - capHeight(size) - size * 1.1, x + Math.max(L, tw) + size * 0.4, y + size * 0.6];
  s.items.push({ kind: 'fill', paths: [[box[0], box[1], box[2], box[1], box[2], box[3], box[0], box[3]]], colour: PAPER, alpha: 0.88 });
  const h = size * 0.35;
  s.items.push({ kind: 'fill', paths: [[x, y - h, x + L / 2, y - h, x + L / 2, y, x, y]], colour: INK });
  s.items.push({ kind: 'stroke', lines: [[x, y - h, x + L, y - h, x + L, y, x, y]], width: 1, colour: INK, closed: true });
  addText(s, label, x, y - h - size * 0.45, size, INK);
  s.info.boxes.push({ what: 'scale bar', box });
  return { length, box };
}
