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

/** The box drawLabel covers for a label at (x, y). */
function labelBox(text: string, x: number, y: number, size: number, anchor: 'start' | 'middle' | 'end' = 'start', weight: 'normal' | 'bold' = 'normal'): Box {
  const w = textWidth(text, size, weight);
  const left = anchor === 'start' ? x : anchor === 'middle' ? x - w / 2 : x - w;
  const pad = size * 0.3;
  return [left - pad, y - capHeight(size) - pad, left + w + pad, y + size * 0.25 + pad];
}

/** A label with a light backing box; returns its box. */
export function drawLabel(s: Scene, text: string, x: number, y: number, size: number, what: string, opts: { anchor?: 'start' | 'middle' | 'end'; weight?: 'normal' | 'bold'; colour?: Rgb } = {}): Box {
  const anchor = opts.anchor ?? 'start';
  const box = labelBox(text, x, y, size, anchor, opts.weight);
  s.items.push({ kind: 'fill', paths: [[box[0], box[1], box[2], box[1], box[2], box[3], box[0], box[3]]], colour: PAPER, alpha: 0.88 });
  addText(s, text, x, y, size, opts.colour ?? INK, { anchor, weight: opts.weight });
  s.info.boxes.push({ what, box });
  return box;
}

/**
 * A label at the first of the candidate places (x, y) where its box lies inside `area` and
 * overlaps no box recorded before it; at the first candidate when none is free.
 */
export function drawLabelAvoiding(s: Scene, text: string, places: [number, number][], size: number, area: Box, what: string, opts: { anchor?: 'start' | 'middle' | 'end'; weight?: 'normal' | 'bold'; colour?: Rgb } = {}): Box {
  const free = places.find(([x, y]) => {
    const b = labelBox(text, x, y, size, opts.anchor ?? 'start', opts.weight);
    return b[0] >= area[0] && b[2] <= area[2] && b[1] >= area[1] && b[3] <= area[3] && !s.info.boxes.some((t) => boxesOverlap(t.box, b));
  });
  const [x, y] = free ?? places[0];
  return drawLabel(s, text, x, y, size, what, opts);
}

/** Whether two boxes overlap (touching edges do not count). */
export function boxesOverlap(a: Box, b: Box): boolean {
  return a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
}

/** The box a marker's ring and cross cover at (px, py) for text size `size`. */
export function markerBox(px: number, py: number, size: number): Box {
  const r = size * 0.6 * 1.7;
  return [px - r, py - r, px + r, py + r];
}

/**
 * A marked point: a ring with a cross at (px, py) and a leader to a label placed in the first
 * of eight directions (the four diagonals, then the same farther out) where it fits inside
 * `area` and overlaps no box recorded before it (other labels, markers, the scale bar).
 * Records the ring as `${what} marker` and returns the label box.
 */
export function drawMarker(s: Scene, px: number, py: number, text: string, size: number, area: Box, what: string): Box {
  const r = size * 0.6;
  const taken = s.info.boxes.map((b) => b.box);
  const ringBox = markerBox(px, py, size);
  const ring = (rad: number, width: number, colour: Rgb) => {
    const p = discPolygon(px, py, rad);
    s.items.push({ kind: 'stroke', lines: [p], width, colour, closed: true });
  };
  ring(r, 4, PAPER);
  ring(r, 1.8, INK);
  s.items.push({ kind: 'stroke', lines: [[px - r * 1.6, py, px - r * 0.4, py], [px + r * 0.4, py, px + r * 1.6, py], [px, py - r * 1.6, px, py - r * 0.4], [px, py + r * 0.4, px, py + r * 1.6]], width: 1.4, colour: INK });
  const w = textWidth(text, size, 'bold') + size * 0.6;
  const pad = size * 0.3;
  const candidates: [number, number, number][] = [];
  for (const far of [1, 1.8, 2.8]) for (const [cx, cy] of [[1, -1], [-1, -1], [1, 1], [-1, 1]]) candidates.push([cx, cy, far]);
  // the label box for a direction: as drawLabel draws it at the end of the leader
  const labelBox = (c: [number, number, number]): Box => {
    const d = size * 2.6 * c[2];
    const lx = px + c[0] * d;
    const ly = py + c[1] * d;
    const baseline = c[1] < 0 ? ly - size * 0.45 : ly + size * 1.15;
    const tx = c[0] > 0 ? lx + size * 0.3 : lx - size * 0.3;
    const tw = w - size * 0.6;
    const left = c[0] > 0 ? tx : tx - tw;
    return [left - pad, baseline - capHeight(size) - pad, left + tw + pad, baseline + size * 0.25 + pad];
  };
  const fits = (b: Box) => b[0] >= area[0] && b[2] <= area[2] && b[1] >= area[1] && b[3] <= area[3];
  const chosen =
    candidates.find((c) => fits(labelBox(c)) && !boxesOverlap(labelBox(c), ringBox) && !taken.some((t) => boxesOverlap(t, labelBox(c)))) ??
    candidates.find((c) => fits(labelBox(c))) ??
    candidates[0];
  const d = size * 2.6 * chosen[2];
  const lx = px + chosen[0] * d;
  const ly = py + chosen[1] * d;
  const ex = px + chosen[0] * r * 0.75;
  const ey = py + chosen[1] * r * 0.75;
  s.items.push({ kind: 'stroke', lines: [[ex, ey, lx, ly]], width: 3.2, colour: PAPER });
  s.items.push({ kind: 'stroke', lines: [[ex, ey, lx, ly]], width: 1.3, colour: INK });
  const baseline = chosen[1] < 0 ? ly - size * 0.45 : ly + size * 1.15;
  const tx = chosen[0] > 0 ? lx + size * 0.3 : lx - size * 0.3;
  const box = drawLabel(s, text, tx, baseline, size, what, { anchor: chosen[0] > 0 ? 'start' : 'end', weight: 'bold' });
  if (!s.info.boxes.some((b) => b.what === `${what} marker`)) s.info.boxes.push({ what: `${what} marker`, box: ringBox });
  return box;
}

/** The round length a scale bar shows and the box it covers with its left end at (x, y). */
export function scaleBarBox(x: number, y: number, pxPerUnit: number, maxPx: number, unit: string, size: number): { length: number; box: Box } {
  const length = roundDown125(maxPx / pxPerUnit);
  const L = length * pxPerUnit;
  const tw = textWidth(`${formatValue(length)} ${unit}`, size);
  return { length, box: [x - size * 0.4, y - capHeight(size) - size * 1.1, x + Math.max(L, tw) + size * 0.4, y + size * 0.6] };
}

/** A scale bar of a round length (at most `maxPx` pixels long) with its label, left end at (x, y). */
export function drawScaleBar(s: Scene, x: number, y: number, pxPerUnit: number, maxPx: number, unit: string, size: number): { length: number; box: Box } {
  const { length, box } = scaleBarBox(x, y, pxPerUnit, maxPx, unit, size);
  const L = length * pxPerUnit;
  const label = `${formatValue(length)} ${unit}`;
  s.items.push({ kind: 'fill', paths: [[box[0], box[1], box[2], box[1], box[2], box[3], box[0], box[3]]], colour: PAPER, alpha: 0.88 });
  const h = size * 0.35;
  s.items.push({ kind: 'fill', paths: [[x, y - h, x + L / 2, y - h, x + L / 2, y, x, y]], colour: INK });
  s.items.push({ kind: 'stroke', lines: [[x, y - h, x + L, y - h, x + L, y, x, y]], width: 1, colour: INK, closed: true });
  addText(s, label, x, y - h - size * 0.45, size, INK);
  s.info.boxes.push({ what: 'scale bar', box });
  return { length, box };
}
