/**
 * The pictures of a solution, as scenes for the PNG and SVG back ends: the stress contour, the
 * mesh, the deformed shape, a close-up of the peak, the geometry with the nominal sections, the
 * convergence of Kt against the degrees of freedom and the stress along a line across the part.
 * Every picture of the part carries its title, what is shown and in which unit, the model and
 * the date, and the caution line.
 */
import { join } from 'node:path';
import type { StressMeasure } from '../model/schema.js';
import type { ResultJson } from './result-json.js';
import { loadsOf } from '../model/load-cases.js';
import { FieldProbe } from '../mesh/probe.js';
import { measureSizeAtNode } from '../mesh/topology.js';
import { stressMeasure } from '../post/stress.js';
import { boxesOverlap, drawLabel, drawLabelAvoiding, drawLegend, drawMarker, drawScaleBar, INK, markerBox, scaleBarBox, SOFT } from '../render/annotate.js';
import { drawChart, type Series } from '../render/chart.js';
import { DEFAULT_MAP } from '../render/colormap.js';
import { capHeight, textWidth } from '../render/font.js';
import { edgePolyline, fitView, fieldRange, isoSegments, meshEdgeLines, paintField, toPixel, type DrawMesh, type FieldSpec, type View } from '../render/field.js';
import { Raster, type Rgb } from '../render/raster.js';
import { addText, newScene, renderPng, renderSvg, type Box, type Scene } from '../render/scene.js';
import { formatValue } from '../render/ticks.js';
import { drawBoundaryConditions } from '../render/boundary-conditions.js';
import { writeAtomic } from './atomic.js';
import type { PlotSource } from './saved.js';
import { TOOL_VERSION } from '../model/version.js';

export interface PictureOptions {
  /** picture size in pixels (default 1600 x 1000) */
  width?: number;
  height?: number;
  /** the stress measure to draw (default: the analysis's) */
  measure?: StressMeasure;
  /** the value range the colours span (default: the field's range) */
  range?: [number, number] | null;
  /** the model region to show, [xmin, ymin, xmax, ymax] (default: the whole part) */
  window?: [number, number, number, number] | null;
  /** draw the element edges (default: off on the contour, on in the close-up) */
  meshLines?: boolean;
  /** iso-lines at the legend's round values (default on) */
  iso?: boolean;
  /** the line for the stress plot, [x0, y0, x1, y1] (default: the net section) */
  line?: [number, number, number, number] | null;
  /**
   * the base text size in picture pixels, from which every text of the picture is sized (default:
   * from the picture size, 11 to 22 pixels); the report sets it so that its pictures read at 8 pt
   */
  textSize?: number;
}

export const CAUTION_LINE =
  'Linear elastic, small-strain result. A peak above yield means local plastic flow; for fatigue use Kf, not Kt. Check by a qualified engineer under the applicable codes before use.';

const MEASURE_NAMES: Record<StressMeasure, string> = {
  'max-principal': 'max. principal stress',
  'min-principal': 'min. principal stress',
  'von-mises': 'von Mises stress',
  tresca: 'Tresca stress (s1 - s3)',
  sxx: 'normal stress sxx',
  syy: 'normal stress syy',
  sxy: 'shear stress sxy',
};

export function measureName(m: StressMeasure): string {
  return MEASURE_NAMES[m];
}

const NET_COLOUR: Rgb = [196, 78, 22];
const GROSS_COLOUR: Rgb = [38, 92, 160];
const PLATE_FILL: Rgb = [228, 230, 224];

/** The stress field of the source for a measure: components sxx, syy, sxy, combined per point. */
export function stressField(src: PlotSource, measure: StressMeasure): FieldSpec {
  const f = src.szzFactor;
  return { data: src.stress, stride: 3, value: (c) => stressMeasure(measure, c[0], c[1], c[2], f * (c[0] + c[1])) };
}

function drawMesh(src: PlotSource, displaced = 0): DrawMesh {
  const m = src.mesh;
  if (displaced === 0) return m;
  const nodes = new Float64Array(m.nodes.length);
  for (let i = 0; i < nodes.length; i++) nodes[i] = m.nodes[i] + displaced * src.u[i];
  return { order: m.order, nNodes: m.nNodes, nodes, nElements: m.nElements, elements: m.elements };
}

function bbox(nodes: Float64Array): [number, number, number, number] {
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (let i = 0; i < nodes.length; i += 2) {
    x0 = Math.min(x0, nodes[i]);
    x1 = Math.max(x1, nodes[i]);
    y0 = Math.min(y0, nodes[i + 1]);
    y1 = Math.max(y1, nodes[i + 1]);
  }
  return [x0, y0, x1, y1];
}

/** Closed boundary loops of the mesh as pixel polygons (for filling the plate). */
function outlineLoops(src: PlotSource, nodes: Float64Array, view: View): number[][] {
  const m = src.mesh;
  const next = new Map<number, number>();
  for (let s = 0; s < m.nBEdges; s++) next.set(m.bEdges[3 * s], s);
  const used = new Uint8Array(m.nBEdges);
  const loops: number[][] = [];
  for (let s0 = 0; s0 < m.nBEdges; s0++) {
    if (used[s0]) continue;
    const loop: number[] = [];
    let s = s0;
    while (s !== undefined && !used[s]) {
      used[s] = 1;
      const pl = edgePolyline(nodes, m.bEdges[3 * s], m.bEdges[3 * s + 1], m.bEdges[3 * s + 2], view);
      loop.push(...pl.slice(0, pl.length - 2));
      s = next.get(m.bEdges[3 * s + 1])!;
    }
    loops.push(loop);
  }
  return loops;
}

export interface Frame {
  size: number;
  draw: Box;
  legend: Box | null;
}

/** What a picture drawn from no saved solution (a sweep's chart) names in its footer. */
export interface FooterSource {
  /** the model: its title and file */
  model: string;
  /** when the data were made, ISO 8601 */
  createdAt: string;
}

/** The base text size of a W x H picture when none is asked for: 11 to 22 pixels, growing with the picture. */
function defaultTextSize(W: number, H: number): number {
  return Math.max(11, Math.min(22, Math.min(W / 1.6, H) / 58));
}

/** The model's title for a picture, with the load case it shows when the model has several (result.loadCase). */
function pictureTitle(r: ResultJson): string | null {
  if (r.loadCase === undefined) return r.model.title;
  return r.model.title ? `${r.model.title}, load case "${r.loadCase}"` : `load case "${r.loadCase}"`;
}

/**
 * Title, subtitle and footer (model, date, caution); returns the drawing area and legend column.
 * A subtitle or footer line wider than the picture wraps onto further lines at spaces (a picture
 * drawn for a narrow column keeps every word of its caution), the title up to two lines, the
 * subtitle and the caution up to three; what is left after that is cut with an ellipsis.
 */
export function frame(s: Scene, src: PlotSource | FooterSource | null, title: string, subtitle: string, withLegend: boolean, textSize?: number): Frame {
  const W = s.width;
  const H = s.height;
  const size = textSize ?? defaultTextSize(W, H);
  const m = size * 1.1;
  let y = m + capHeight(size * 1.35);
  for (const line of wrapText(title, size * 1.35, W - 2 * m, 2, 'bold')) {
    addText(s, line, m, y, size * 1.35, INK, { weight: 'bold', what: 'title' });
    y += size * 1.35 * 1.25;
  }
  y += size * 1.6 - size * 1.35 * 1.25;
  for (const line of wrapText(subtitle, size, W - 2 * m, 3)) {
    addText(s, line, m, y, size, SOFT, { what: 'subtitle' });
    y += size * 1.3;
  }
  const top = y - size * 1.3 + size * 1.0;
  const fs = size * 0.82;
  const r = src && 'result' in src ? src.result : null;
  const model = r ? `${r.model.title ?? 'untitled model'}${r.model.file ? ` (${r.model.file})` : ''}` : src && 'model' in src && typeof src.model === 'string' ? src.model : '';
  const date = src ? src.createdAt.slice(0, 10) : '';
  const foot1 = [model, `raiser ${r?.tool.version ?? TOOL_VERSION}`, date].filter(Boolean).join('  |  ');
  const caution = wrapText(CAUTION_LINE, fs, W - 2 * m, 3);
  let yb = H - m * 0.8 - fs * 1.3 * (caution.length - 1);
  caution.forEach((line, i) => addText(s, line, m, yb + fs * 1.3 * i, fs, [150, 40, 30], { what: 'caution' }));
  yb -= fs * 1.45;
  addText(s, fit(foot1, fs, W - 2 * m), m, yb, fs, SOFT, { what: 'footer' });
  const bottom = yb - fs * 1.6;
  const legendW = withLegend ? Math.max(size * 9, Math.min(W * 0.2, size * 12)) : 0;
  const draw: Box = [m, top, W - m - legendW - (withLegend ? size : 0), bottom];
  const legend: Box | null = withLegend ? [W - m - legendW, top, W - m, bottom] : null;
  return { size, draw, legend };
}

/** The text broken at spaces into lines no wider than `width`, at most `most` lines (the last cut with an ellipsis). */
function wrapText(text: string, size: number, width: number, most: number, weight: 'normal' | 'bold' = 'normal'): string[] {
  const lines: string[] = [];
  let rest = text;
  while (rest && lines.length < most - 1 && textWidth(rest, size, weight) > width) {
    const words = rest.split(' ');
    let k = 1;
    while (k < words.length && textWidth(words.slice(0, k + 1).join(' '), size, weight) <= width) k++;
    lines.push(words.slice(0, k).join(' '));
    rest = words.slice(k).join(' ');
  }
  if (rest) lines.push(fit(rest, size, width, weight));
  return lines;
}

/** The text cut with an ellipsis to fit the width. */
function fit(text: string, size: number, width: number, weight: 'normal' | 'bold' = 'normal'): string {
  if (textWidth(text, size, weight) <= width) return text;
  let t = text;
  while (t.length > 4 && textWidth(t + '...', size, weight) > width) t = t.slice(0, -1);
  return t + '...';
}

/** The words that say a picture shows the whole part drawn from a half or quarter model. */
function wholeWords(planes: PlaneOfResult[]): string {
  if (planes.length === 0) return '';
  return `; whole part: the ${planes.length === 2 ? 'quarter' : 'half'} model mirrored (dash-dot)`;
}

function describeMesh(src: PlotSource): string {
  const m = src.mesh;
  return `${m.nNodes} nodes, ${m.nElements} ${m.order === 2 ? '6-node' : '3-node'} triangles`;
}

/** The place and value of the peak of a measure: the analysis's own peak, or the nodal extreme. */
function peakOf(src: PlotSource, measure: StressMeasure): { x: number; y: number; value: number } {
  const r = src.result;
  if (measure === r.peak.measure) return { x: r.peak.x, y: r.peak.y, value: r.peak.stress };
  const f = stressField(src, measure);
  const sign = measure === 'min-principal' ? -1 : 1;
  const c = new Float64Array(3);
  let best = 0;
  let bv = -Infinity;
  for (let i = 0; i < src.mesh.nNodes; i++) {
    c[0] = src.stress[3 * i];
    c[1] = src.stress[3 * i + 1];
    c[2] = src.stress[3 * i + 2];
    const v = sign * f.value(c);
    if (v > bv) {
      bv = v;
      best = i;
    }
  }
  return { x: src.mesh.nodes[2 * best], y: src.mesh.nodes[2 * best + 1], value: sign * bv };
}

/**
 * The picture height that suits the part's shape at width W when none is asked for: the part
 * drawn across the width plus the title and footer, between 0.45 W (room for the legend) and 0.8 W.
 */
function autoHeight(W: number, win: readonly number[], withLegend: boolean, textSize?: number): number {
  const size = textSize ?? Math.max(11, Math.min(22, W / 1.6 / 58));
  const drawW = W - 2.2 * size - (withLegend ? Math.max(size * 9, Math.min(W * 0.2, size * 12)) + size : 0) - 1.6 * size;
  const aspect = Math.max(1e-6, (win[2] - win[0]) / Math.max(1e-300, win[3] - win[1]));
  const chrome = size * 9.5;
  return Math.round(Math.min(0.8 * W, Math.max(0.45 * W, chrome + drawW / aspect)));
}

function inflate(b: Box, d: number): Box {
  return [b[0] + d, b[1] + d, b[2] - d, b[3] - d];
}

/** A mirror plane as result.json records it (absent in results written before it was). */
interface PlaneOfResult {
  axis: 'x' | 'y';
  at: number;
  edges: number[];
}

function mirrorPlanes(src: PlotSource): PlaneOfResult[] {
  const planes = (src.result as { mirrorPlanes?: PlaneOfResult[] }).mirrorPlanes ?? [];
  // one plane per axis: two parallel mirror planes would make an endless strip, not a part
  return planes.filter((p, i) => planes.findIndex((q) => q.axis === p.axis) === i);
}

/**
 * The whole part of a half or quarter model, as a plot source: the modelled piece and its
 * reflections in the mirror planes the analysis recorded (result.mirrorPlanes). Copy c reflects
 * in x when bit 0 is set and in y when bit 1 is; a reflected copy has its elements' order
 * reversed (so they stay counter-clockwise), its displacement across the plane negated and its
 * shear stress sxy negated (sxy changes sign under a reflection in x or y; sxx and syy, and so
 * every invariant measure, do not). Nodes on a plane are shared with the copy across it, and the
 * boundary edges on the planes, inside the whole part, are left out, so the outline closes round
 * the whole part. Returns the source unchanged for a whole model.
 */
function wholePart(src: PlotSource): { src: PlotSource; planes: PlaneOfResult[] } {
  const planes = mirrorPlanes(src);
  if (planes.length === 0) return { src, planes };
  const m = src.mesh;
  const n = m.nNodes;
  const per = m.order === 2 ? 6 : 3;
  const box = bbox(m.nodes);
  const tol = 1e-9 * Math.max(box[2] - box[0], box[3] - box[1]);
  const px = planes.find((p) => p.axis === 'x');
  const py = planes.find((p) => p.axis === 'y');
  const copies = [0, 1, 2, 3].filter((c) => (!(c & 1) || px) && (!(c & 2) || py));
  const nc = copies.length;
  const nodes = new Float64Array(2 * n * nc);
  const u = new Float64Array(2 * n * nc);
  const stress = new Float64Array(3 * n * nc);
  const slot = new Map(copies.map((c, k) => [c, k]));
  const onX = (i: number) => !!px && Math.abs(m.nodes[2 * i] - px.at) <= tol;
  const onY = (i: number) => !!py && Math.abs(m.nodes[2 * i + 1] - py.at) <= tol;
  // the index of node i in copy c: a node on a plane belongs to the copy not reflected in it
  const index = (c: number, i: number) => slot.get(c & ~(onX(i) ? 1 : 0) & ~(onY(i) ? 2 : 0))! * n + i;
  copies.forEach((c, k) => {
    const fx = c & 1 ? -1 : 1;
    const fy = c & 2 ? -1 : 1;
    for (let i = 0; i < n; i++) {
      const j = k * n + i;
      nodes[2 * j] = c & 1 ? 2 * px!.at - m.nodes[2 * i] : m.nodes[2 * i];
      nodes[2 * j + 1] = c & 2 ? 2 * py!.at - m.nodes[2 * i + 1] : m.nodes[2 * i + 1];
      u[2 * j] = fx * src.u[2 * i];
      u[2 * j + 1] = fy * src.u[2 * i + 1];
      stress[3 * j] = src.stress[3 * i];
      stress[3 * j + 1] = src.stress[3 * i + 1];
      stress[3 * j + 2] = fx * fy * src.stress[3 * i + 2];
    }
  });
  // corners 0 1 2, mid-sides 3 (0-1) 4 (1-2) 5 (2-0); reversed: 0 2 1, 5 4 3
  const flip = per === 6 ? [0, 2, 1, 5, 4, 3] : [0, 2, 1];
  const elements = new Int32Array(per * m.nElements * nc);
  const mirrorEdge = new Set(planes.flatMap((p) => p.edges));
  const keep: number[] = [];
  for (let b = 0; b < m.nBEdges; b++) if (!mirrorEdge.has(m.bEdgeDomain[b])) keep.push(b);
  const bEdges = new Int32Array(3 * keep.length * nc);
  const bEdgeDomain = new Int32Array(keep.length * nc);
  copies.forEach((c, k) => {
    const odd = ((c & 1) ^ ((c >> 1) & 1)) === 1;
    for (let e = 0; e < m.nElements; e++) {
      for (let a = 0; a < per; a++) elements[per * (k * m.nElements + e) + a] = index(c, m.elements[per * e + (odd ? flip[a] : a)]);
    }
    keep.forEach((b, q) => {
      const o = 3 * (k * keep.length + q);
      const [s0, s1, mid] = [m.bEdges[3 * b], m.bEdges[3 * b + 1], m.bEdges[3 * b + 2]];
      bEdges[o] = index(c, odd ? s1 : s0);
      bEdges[o + 1] = index(c, odd ? s0 : s1);
      bEdges[o + 2] = mid >= 0 ? index(c, mid) : -1;
      bEdgeDomain[k * keep.length + q] = m.bEdgeDomain[b];
    });
  });
  const mesh = {
    ...m,
    nNodes: n * nc,
    nVertices: m.nVertices * nc,
    nodes,
    nElements: m.nElements * nc,
    elements,
    nBEdges: keep.length * nc,
    bEdges,
    bEdgeDomain,
    bEdgeT: new Float64Array(2 * keep.length * nc),
    nodeEdge: new Int32Array(n * nc).fill(-1),
    nodeCorner: new Int32Array(n * nc).fill(-1),
  };
  return { src: { ...src, mesh, u, stress }, planes };
}

/**
 * Marks the cut planes of a whole part drawn from a half or quarter model: a thin dash-dot line
 * along each plane across the part, and the words "symmetry plane" beside one end.
 */
function drawMirrorPlanes(s: Scene, planes: PlaneOfResult[], whole: PlotSource, view: View, fr: Frame): void {
  const [x0, y0, x1, y1] = bbox(whole.mesh.nodes);
  const over = (fr.size * 1.2) / view.s;
  for (const p of planes) {
    const [ax, ay] = p.axis === 'x' ? toPixel(view, p.at, y1 + over) : toPixel(view, x0 - over, p.at);
    const [bx, by] = p.axis === 'x' ? toPixel(view, p.at, y0 - over) : toPixel(view, x1 + over, p.at);
    s.items.push({ kind: 'stroke', lines: [[ax, ay, bx, by]], width: 1.1, colour: INK, dash: [16, 4, 3, 4], alpha: 0.8, clip: fr.draw });
    const ls = fr.size * 0.8;
    const places: [number, number][] =
      p.axis === 'x'
        ? [[ax + ls * 0.5, ay + ls * 0.3], [bx + ls * 0.5, by], [ax - ls * 0.5, ay + ls * 0.3]]
        : [[bx - ls * 0.3, by - ls * 0.5], [ax + ls * 0.3, ay - ls * 0.5], [bx - ls * 0.3, by + ls * 1.4]];
    drawLabelAvoiding(s, 'symmetry plane', places, ls, fr.draw, `symmetry plane ${p.axis} = ${formatValue(p.at)}`, { anchor: p.axis === 'x' ? 'start' : 'end', colour: SOFT });
  }
}

/** Whether any pixel of the box is covered by the mask (a raster whose alpha marks what is drawn). */
function maskCovers(mask: Raster, b: Box): boolean {
  const x0 = Math.max(0, Math.floor(b[0]));
  const x1 = Math.min(mask.width, Math.ceil(b[2]));
  const y0 = Math.max(0, Math.floor(b[1]));
  const y1 = Math.min(mask.height, Math.ceil(b[3]));
  for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) if (mask.data[4 * (y * mask.width + x) + 3] > 0) return true;
  return false;
}

interface PartLayout {
  view: View;
  /** the left end of the scale bar's bar */
  bar: [number, number];
}

/**
 * The view of the part and the place of its scale bar, so that the bar never covers the part:
 * the part fitted into the drawing area less `margin`, the bar in the first corner of the
 * drawing area (lower left, lower right, upper left, upper right) where its box covers none of
 * the part's loops (`loopsAt` gives them, in pixels, for a view) and none of the boxes drawn so
 * far; when every corner is taken, the part is fitted above a strip kept for the bar.
 */
function layoutPart(s: Scene, fr: Frame, win: readonly number[], margin: number, unit: string, loopsAt: (v: View) => number[][]): PartLayout {
  const d = fr.draw;
  const size = fr.size * 0.9;
  const maxPx = 0.22 * (d[2] - d[0]);
  const inset = fr.size * 0.6;
  const tryView = (view: View): [number, number] | null => {
    const mask = new Raster(s.width, s.height, null);
    mask.setClip(d);
    mask.fillPath(loopsAt(view), INK);
    const probe = scaleBarBox(0, 0, view.s, maxPx, unit, size).box;
    const w = probe[2] - probe[0];
    const h = probe[3] - probe[1];
    const spots: [number, number][] = [
      [d[0] + inset, d[3] - inset],
      [d[2] - inset - w + size * 0.4, d[3] - inset],
      [d[0] + inset, d[1] + inset + h - size * 0.6],
      [d[2] - inset - w + size * 0.4, d[1] + inset + h - size * 0.6],
    ];
    for (const [x, y] of spots) {
      const b = scaleBarBox(x, y, view.s, maxPx, unit, size).box;
      if (!maskCovers(mask, b) && !s.info.boxes.some((t) => boxesOverlap(t.box, b))) return [x, y];
    }
    return null;
  };
  const view = fitView(win, inflate(d, margin));
  const bar = tryView(view);
  if (bar) return { view, bar };
  const strip = capHeight(size) + size * 1.7 + inset;
  const kept = fitView(win, inflate([d[0], d[1], d[2], d[3] - strip], margin));
  return { view: kept, bar: [d[0] + inset, d[3] - inset] };
}

/** The stress contour of a measure with legend, peak, scale bar, iso-lines and (optionally) mesh lines. */
export function contourScene(model: PlotSource, opts: PictureOptions = {}, title?: string): Scene {
  // the whole part unless a window is asked for (the close-up of the peak stays as modelled)
  const { src, planes } = opts.window ? { src: model, planes: [] } : wholePart(model);
  const W = opts.width ?? 1600;
  const win = opts.window ?? bbox(src.mesh.nodes);
  const H = opts.height ?? (opts.window ? 1000 : autoHeight(W, win, true, opts.textSize));
  const measure = opts.measure ?? src.result.peak.measure;
  const unit = src.result.units.stress;
  const s = newScene(W, H, title ?? `${measureName(measure)}: ${pictureTitle(src.result) ?? 'raiser'}`);
  const fr = frame(s, src, title ?? pictureTitle(src.result) ?? 'Stress', `${measureName(measure)} (${unit}), recovered nodal stresses interpolated per pixel; ${describeMesh(model)}${wholeWords(planes)}`, true, opts.textSize);
  const field = stressField(src, measure);
  const dataRange = fieldRange(src.mesh, field);
  const peak = peakOf(src, measure);
  if (measure === 'min-principal') dataRange[0] = Math.min(dataRange[0], peak.value);
  else dataRange[1] = Math.max(dataRange[1], peak.value);
  let range: [number, number] = opts.range ? [opts.range[0], opts.range[1]] : [dataRange[0], dataRange[1]];
  if (!(range[1] > range[0])) range = [range[0] - (Math.abs(range[0]) || 1) * 0.01, range[0] + (Math.abs(range[0]) || 1) * 0.01];
  const { view, bar } = layoutPart(s, fr, win, fr.size * 0.8, src.result.units.length, (v) => outlineLoops(src, src.mesh.nodes, v));
  const scale = { lo: range[0], hi: range[1], map: DEFAULT_MAP };
  s.items.push({ kind: 'layer', paint: (r, k) => paintField(r, src.mesh, view, field, scale, k), clip: fr.draw });
  const legend = drawLegend(s, fr.legend!, [measureName(measure), unit], DEFAULT_MAP, range, dataRange, fr.size);
  if (opts.iso !== false) {
    const levels = legend.ticks.map((t) => t.value).filter((v) => v > range[0] && v < range[1]);
    // a close-up (a window) draws the lines of the elements it shows, not of the whole part (the
    // lines left out lay outside the clip; the fill's float32 sums see fewer edges, which moved one
    // colour sample by 1/255 in one of the seven examples' close-ups, mounting-plate, and none elsewhere)
    const segs = isoSegments(src.mesh, view, field, levels, 1, opts.window ? fr.draw : undefined);
    const lines: number[][] = [];
    for (const l of segs) for (let k = 0; k + 3 < l.length; k += 4) lines.push([l[k], l[k + 1], l[k + 2], l[k + 3]]);
    s.items.push({ kind: 'stroke', lines, width: 0.9, colour: [20, 20, 28], alpha: 0.45, clip: fr.draw });
  }
  if (opts.meshLines) s.items.push({ kind: 'stroke', lines: meshEdgeLines(src.mesh, view, opts.window ? fr.draw : undefined), width: 0.7, colour: [20, 20, 28], alpha: 0.4, clip: fr.draw });
  s.items.push({ kind: 'stroke', lines: outlineLoops(src, src.mesh.nodes, view), closed: true, width: 1.8, colour: INK, clip: fr.draw });
  drawMirrorPlanes(s, planes, src, view, fr);
  const [ppx, ppy] = toPixel(view, peak.x, peak.y);
  const inside = ppx >= fr.draw[0] && ppx <= fr.draw[2] && ppy >= fr.draw[1] && ppy <= fr.draw[3];
  const sb = drawScaleBar(s, bar[0], bar[1], view.s, 0.22 * (fr.draw[2] - fr.draw[0]), src.result.units.length, fr.size * 0.9);
  if (inside) drawMarker(s, ppx, ppy, `peak ${formatValue(peak.value)} ${unit}`, fr.size, fr.draw, 'peak');
  Object.assign(s.info, { view, draw: fr.draw, range, dataRange, ticks: legend.ticks, bar: legend.bar, peak: inside ? [ppx, ppy] : null, peakValue: peak.value, measure, scaleBar: sb.length });
  return s;
}

/** The mesh: elements on a light plate, the outline, and the mesh figures. */
export function meshScene(model: PlotSource, opts: PictureOptions = {}): Scene {
  const { src, planes } = opts.window ? { src: model, planes: [] } : wholePart(model);
  const W = opts.width ?? 1600;
  const H = opts.height ?? autoHeight(W, opts.window ?? bbox(src.mesh.nodes), false, opts.textSize);
  const r = src.result;
  const s = newScene(W, H, `mesh: ${pictureTitle(r) ?? 'raiser'}`);
  const fr = frame(s, src, `Mesh: ${pictureTitle(r) ?? ''}`.trim(), `${describeMesh(model)}, ${r.mesh.dofs} DOF, smallest angle ${formatValue(r.mesh.minAngleDeg, 3)} deg, largest ${formatValue(r.mesh.maxAngleDeg, 3)} deg${wholeWords(planes)}`, false, opts.textSize);
  const { view, bar } = layoutPart(s, fr, opts.window ?? bbox(src.mesh.nodes), fr.size * 0.8, r.units.length, (v) => outlineLoops(src, src.mesh.nodes, v));
  s.items.push({ kind: 'fill', paths: outlineLoops(src, src.mesh.nodes, view), colour: PLATE_FILL, clip: fr.draw });
  s.items.push({ kind: 'stroke', lines: meshEdgeLines(src.mesh, view), width: 0.7, colour: [40, 44, 56], alpha: 0.75, clip: fr.draw });
  s.items.push({ kind: 'stroke', lines: outlineLoops(src, src.mesh.nodes, view), closed: true, width: 1.8, colour: INK, clip: fr.draw });
  drawMirrorPlanes(s, planes, src, view, fr);
  drawScaleBar(s, bar[0], bar[1], view.s, 0.22 * (fr.draw[2] - fr.draw[0]), r.units.length, fr.size * 0.9);
  Object.assign(s.info, { view, draw: fr.draw });
  return s;
}

/** The deformed shape, displacements magnified by a round factor, coloured by displacement magnitude. */
export function deformedScene(model: PlotSource, opts: PictureOptions = {}): Scene {
  const { src, planes } = opts.window ? { src: model, planes: [] } : wholePart(model);
  const W = opts.width ?? 1600;
  const H = opts.height ?? autoHeight(W, opts.window ?? bbox(src.mesh.nodes), true, opts.textSize);
  const r = src.result;
  let umax = 0;
  for (let i = 0; i < src.mesh.nNodes; i++) umax = Math.max(umax, Math.hypot(src.u[2 * i], src.u[2 * i + 1]));
  const box = bbox(src.mesh.nodes);
  const size = Math.max(box[2] - box[0], box[3] - box[1]);
  const factor = umax > 0 ? roundFactor((0.08 * size) / umax) : 1;
  const unit = r.units.length;
  const s = newScene(W, H, `deformed shape: ${pictureTitle(r) ?? 'raiser'}`);
  const fr = frame(s, src, `Deformed shape: ${pictureTitle(r) ?? ''}`.trim(), `displacements drawn ${formatValue(factor, 3)} times magnified; largest displacement ${formatValue(umax)} ${unit}; undeformed outline dashed${wholeWords(planes)}`, true, opts.textSize);
  const dm = drawMesh(src, factor);
  const dbox = bbox(dm.nodes);
  const all: [number, number, number, number] = opts.window ?? [Math.min(box[0], dbox[0]), Math.min(box[1], dbox[1]), Math.max(box[2], dbox[2]), Math.max(box[3], dbox[3])];
  const factorText = `displacements x ${formatValue(factor, 3)}`;
  // the factor's label is placed first, so that the scale bar keeps clear of it, and drawn last
  const labelFrom = s.items.length;
  drawLabel(s, factorText, fr.draw[2] - fr.size * 0.6, fr.draw[1] + fr.size * 1.6, fr.size, 'factor label', { anchor: 'end', weight: 'bold' });
  const factorLabel = s.items.splice(labelFrom);
  const { view, bar } = layoutPart(s, fr, all, fr.size * 0.8, unit, (v) => [...outlineLoops(src, src.mesh.nodes, v), ...outlineLoops(src, dm.nodes, v)]);
  const field: FieldSpec = { data: src.u, stride: 2, value: (c) => Math.hypot(c[0], c[1]) };
  const range: [number, number] = opts.range ?? [0, umax || 1];
  s.items.push({ kind: 'stroke', lines: outlineLoops(src, src.mesh.nodes, view), closed: true, width: 1.2, colour: SOFT, dash: [6, 4], clip: fr.draw });
  s.items.push({ kind: 'layer', paint: (rr, k) => paintField(rr, dm, view, field, { lo: range[0], hi: range[1], map: DEFAULT_MAP }, k), clip: fr.draw });
  if (opts.meshLines) s.items.push({ kind: 'stroke', lines: meshEdgeLines(dm, view), width: 0.6, colour: [20, 20, 28], alpha: 0.35, clip: fr.draw });
  s.items.push({ kind: 'stroke', lines: outlineLoops(src, dm.nodes, view), closed: true, width: 1.8, colour: INK, clip: fr.draw });
  drawMirrorPlanes(s, planes, src, view, fr);
  drawLegend(s, fr.legend!, ['displacement', `magnitude (${unit})`], DEFAULT_MAP, range, [0, umax], fr.size);
  s.items.push(...factorLabel);
  drawScaleBar(s, bar[0], bar[1], view.s, 0.22 * (fr.draw[2] - fr.draw[0]), unit, fr.size * 0.9);
  Object.assign(s.info, { view, draw: fr.draw, factor, umax });
  return s;
}

/** 1, 2 or 5 times a power of ten, the largest not above f. */
function roundFactor(f: number): number {
  const p = Math.pow(10, Math.floor(Math.log10(f)));
  for (const m of [5, 2, 1]) if (m * p <= f) return m * p;
  return p;
}

/** The model window around the peak for the close-up: several elements and the notch radius. */
function peakWindow(src: PlotSource, measure?: StressMeasure): [number, number, number, number] {
  const pk = peakOf(src, measure ?? src.result.peak.measure);
  const m = src.mesh;
  let near = 0;
  let nd = Infinity;
  for (let i = 0; i < m.nNodes; i++) {
    const d = Math.hypot(m.nodes[2 * i] - pk.x, m.nodes[2 * i + 1] - pk.y);
    if (d < nd) {
      nd = d;
      near = i;
    }
  }
  const h = measureSizeAtNode(m, near);
  const box = bbox(m.nodes);
  const scale = Math.hypot(box[2] - box[0], box[3] - box[1]);
  const radius = src.result.fatigue?.radius;
  const half = Math.min(0.3 * scale, Math.max(10 * h, Number.isFinite(radius) && radius ? 2.5 * radius : 0, 0.02 * scale));
  return [pk.x - half, pk.y - half, pk.x + half, pk.y + half];
}

/** A close-up of the peak region with mesh lines. */
export function closeupScene(src: PlotSource, opts: PictureOptions = {}): Scene {
  const measure = opts.measure ?? src.result.peak.measure;
  const win = opts.window ?? peakWindow(src, measure);
  return contourScene(src, { ...opts, window: win, meshLines: opts.meshLines ?? true }, `Close-up of the peak: ${pictureTitle(src.result) ?? ''}`.trim());
}

/** The geometry with the net and gross sections and the peak. */
export function geometryScene(model: PlotSource, opts: PictureOptions = {}): Scene {
  const { src, planes } = opts.window ? { src: model, planes: [] } : wholePart(model);
  const W = opts.width ?? 1600;
  const H = opts.height ?? autoHeight(W, opts.window ?? bbox(src.mesh.nodes), false, opts.textSize) + 60;
  const r = src.result;
  const s = newScene(W, H, `geometry: ${pictureTitle(r) ?? 'raiser'}`);
  // Where the loads and supports act, as the finite element stage applied them (no domain is
  // built again here, so a drawing-based model draws without its drawing file); a solution saved
  // before raiser recorded that has none, and the subtitle says so.
  const applied = (r as Partial<typeof r>).boundaryConditions ?? null;
  const bcWords = applied ? 'loads L (arrows, not to scale) and supports S' : 'loads and supports not drawn (this saved solution does not record where they act: solve again)';
  const fr = frame(s, src, `Geometry and nominal sections: ${pictureTitle(r) ?? ''}`.trim(), `each raiser's net section (least material across the flow) solid, gross section dashed; ${bcWords}; lengths in ${r.units.length}${wholeWords(planes)}`, false, opts.textSize);
  // room around the plate for the load arrows (2.6 sizes) and their labels
  const { view, bar } = layoutPart(s, fr, opts.window ?? bbox(src.mesh.nodes), fr.size * 4.4, r.units.length, (v) => outlineLoops(src, src.mesh.nodes, v));
  // The peak's ring is kept free of the section labels placed before it is drawn.
  const [px, py] = toPixel(view, r.peak.x, r.peak.y);
  s.info.boxes.push({ what: 'peak marker', box: markerBox(px, py, fr.size * 0.9) });
  // the scale bar first, so that the labels keep clear of it
  drawScaleBar(s, bar[0], bar[1], view.s, 0.22 * (fr.draw[2] - fr.draw[0]), r.units.length, fr.size * 0.9);
  s.items.push({ kind: 'fill', paths: outlineLoops(src, src.mesh.nodes, view), colour: PLATE_FILL, clip: fr.draw });
  s.items.push({ kind: 'stroke', lines: outlineLoops(src, src.mesh.nodes, view), closed: true, width: 1.8, colour: INK, clip: fr.draw });
  drawMirrorPlanes(s, planes, src, view, fr);
  type Sec = { ligaments: { from: [number, number]; to: [number, number] }[]; from: [number, number]; to: [number, number] };
  const sec = (c: Sec, colour: Rgb, dash: number[] | undefined, label: string, below: boolean) => {
    const lines = c.ligaments.map((iv) => [...toPixel(view, iv.from[0], iv.from[1]), ...toPixel(view, iv.to[0], iv.to[1])]);
    s.items.push({ kind: 'stroke', lines, width: 3, colour, dash });
    const [ax, ay] = toPixel(view, c.from[0], c.from[1]);
    const [bx, by] = toPixel(view, c.to[0], c.to[1]);
    const end = below ? (ay > by ? [ax, ay] : [bx, by]) : ay < by ? [ax, ay] : [bx, by];
    const other = end[0] === ax && end[1] === ay ? [bx, by] : [ax, ay];
    const ls = fr.size * 0.9;
    // beside the chosen end of the section, nudged along, then stacked away from the part, then
    // the same beside the other end
    const places: [number, number][] = [];
    for (const [ex, ey, dn] of [
      [end[0], end[1], below ? 1 : -1],
      [other[0], other[1], below ? -1 : 1],
    ]) {
      const y = ey + (dn > 0 ? fr.size * 1.6 : -fr.size * 0.6);
      for (let j = 0; j < 6; j++) for (const k of [0, 1, -1, 2, -2, 3, -3, 5, -5]) places.push([ex + k * 4 * ls, y + dn * j * ls * 1.7]);
    }
    drawLabelAvoiding(s, label, places, ls, fr.draw, `${label} label`, { anchor: 'middle', colour });
  };
  // Each raiser's sections; the governing one's labels name it.
  for (const x of r.raisers) {
    if (x.gross) sec(x.gross, GROSS_COLOUR, [8, 5], `gross ${formatValue(x.gross.length)} ${r.units.length}`, true);
    if (!x.section) continue;
    const carried = x.section.mirror ? 'half of a symmetric section' : `N ${formatValue(x.section.N ?? NaN)} ${r.units.force}, M ${formatValue(x.section.M ?? NaN)} ${r.units.moment}`;
    sec(x.section, NET_COLOUR, undefined, `${x.name}: net ${formatValue(x.section.length)} ${r.units.length}; ${carried}`, false);
  }
  const drawn = applied ? drawBoundaryConditions(s, model.mesh, loadsOf(src.model), src.model.supports, applied, view, fr.size, r.pins?.items) : { loads: 0, supports: 0 };
  drawMarker(s, px, py, `peak, ${r.peak.feature}`, fr.size * 0.9, fr.draw, 'peak');
  Object.assign(s.info, { view, draw: fr.draw, boundaryConditions: drawn });
  return s;
}

/** Kt against degrees of freedom over the certified series, with the band and the extrapolated value. */
export function convergenceScene(src: PlotSource, opts: PictureOptions = {}): Scene | null {
  const r = src.result;
  const c = r.convergence;
  if (c.meshes.length < 2) return null;
  const W = opts.width ?? 1200;
  const H = opts.height ?? 800;
  const s = newScene(W, H, `convergence: ${pictureTitle(r) ?? 'raiser'}`);
  const gov = r.raisers.find((x) => x.governing);
  const what = r.kt.kind ? `Kt ${r.kt.kind} of ${r.kt.raiser}` : gov ? `the peak of ${gov.name}` : 'the highest stress';
  const fr = frame(s, src, `Convergence: ${pictureTitle(r) ?? ''}`.trim(), `${what} on each mesh of the series; error band ${c.estimatedError === null ? 'not available' : `+-${formatValue(100 * c.estimatedError, 2)}%`} on the finest (grid convergence index)`, false, opts.textSize);
  const values = c.meshes.map((m) => (r.kt.kind ? m.kt : gov ? m.raiserPeak : m.peak));
  const series: Series[] = [{ name: what, points: c.meshes.flatMap((m, i) => [m.dofs, values[i] ?? NaN]), colour: NET_COLOUR, markers: true }];
  const last = c.meshes[c.meshes.length - 1];
  const refLines = [];
  if (r.kt.extrapolated !== null) refLines.push({ y: r.kt.extrapolated, label: `extrapolated ${formatValue(r.kt.extrapolated, 5)}`, colour: NET_COLOUR, dash: [3, 4] });
  if (r.chart && r.chart.value !== null && r.kt.kind === r.chart.nominal) refLines.push({ y: r.chart.value, label: `chart ${r.chart.id} (${r.chart.nominal}) ${formatValue(r.chart.value, 4)}`, colour: SOFT, dash: [10, 4] });
  const bands = [];
  if (r.kt.band) bands.push({ x: last.dofs, lo: r.kt.band[0], hi: r.kt.band[1], colour: NET_COLOUR });
  const res = drawChart(s, fr.draw, { xLabel: 'degrees of freedom (log scale)', yLabel: r.kt.kind ? 'Kt' : `stress (${r.units.stress})`, xLog: true, series, refLines, bands }, fr.size);
  Object.assign(s.info, { plot: res.plot, points: c.meshes.map((m, i) => [res.xToPx(m.dofs), res.yToPx(values[i] ?? NaN)]) });
  return s;
}

/** Stress along a line across the part (the net section by default): the measure and the stress normal to the line. */
export function lineScene(src: PlotSource, opts: PictureOptions = {}): Scene {
  const r = src.result;
  const W = opts.width ?? 1200;
  const H = opts.height ?? 800;
  const measure = opts.measure ?? r.peak.measure;
  const unit = r.units.stress;
  const gov = r.raisers.find((x) => x.governing && x.section) ?? r.raisers.find((x) => x.section);
  const govSec = gov?.section ?? null;
  const line = opts.line ?? (govSec ? [govSec.from[0], govSec.from[1], govSec.to[0], govSec.to[1]] : [r.peak.x, r.peak.y, r.peak.x, r.peak.y]);
  const [x0, y0, x1, y1] = line;
  const L = Math.hypot(x1 - x0, y1 - y0);
  const isNet = !opts.line && govSec !== null;
  const s = newScene(W, H, `stress along a line: ${pictureTitle(r) ?? 'raiser'}`);
  const fr = frame(
    s,
    src,
    `Stress along ${isNet ? `the net section of ${gov!.name}` : 'a line'}: ${pictureTitle(r) ?? ''}`.trim(),
    `from (${formatValue(x0, 5)}, ${formatValue(y0, 5)}) to (${formatValue(x1, 5)}, ${formatValue(y1, 5)}) ${r.units.length}; gaps where the line leaves the material`,
    false,
    opts.textSize,
  );
  const probe = new FieldProbe(src.mesh);
  // The stress across the line: along its normal (the flow the section is taken across).
  const Ll = Math.hypot(x1 - x0, y1 - y0) || 1;
  const [dx, dy] = govSec && isNet ? govSec.normal : [(y1 - y0) / Ll, -(x1 - x0) / Ll];
  const nS = 400;
  const pm: number[] = [];
  const pn: number[] = [];
  for (let k = 0; k <= nS; k++) {
    const t = k / nS;
    // Stay a hair inside the ends, which lie on the boundary.
    const tt = 1e-7 + t * (1 - 2e-7);
    const x = x0 + (x1 - x0) * tt;
    const y = y0 + (y1 - y0) * tt;
    const sxx = probe.value(src.stress, 3, 0, x, y);
    const syy = probe.value(src.stress, 3, 1, x, y);
    const sxy = probe.value(src.stress, 3, 2, x, y);
    const d = t * L;
    if (!Number.isFinite(sxx)) {
      pm.push(d, NaN);
      pn.push(d, NaN);
      continue;
    }
    pm.push(d, stressMeasure(measure, sxx, syy, sxy, src.szzFactor * (sxx + syy)));
    pn.push(d, dx * dx * sxx + 2 * dx * dy * sxy + dy * dy * syy);
  }
  const series: Series[] = [
    { name: measureName(measure), points: pm, colour: NET_COLOUR },
    { name: 'stress normal to the section', points: pn, colour: GROSS_COLOUR, dash: [8, 5] },
  ];
  // The nominal stress distribution the Kt refers to: the beam formula on the net section.
  if (isNet && govSec && govSec.N !== null && govSec.M !== null) {
    const ex = (x1 - x0) / L;
    const ey = (y1 - y0) / L;
    const beam: number[] = [];
    for (const d of [0, L]) {
      const v = (x0 + d * ex - govSec.centroid[0]) * ex + (y0 + d * ey - govSec.centroid[1]) * ey;
      beam.push(d, govSec.N / govSec.area - (govSec.mirror ? 0 : (govSec.M * v) / govSec.inertia));
    }
    series.push({ name: govSec.mirror ? 'nominal stress N / A (half of a symmetric section)' : 'nominal stress N / A - M y / I (beam formula)', points: beam, colour: SOFT, dash: [2, 4] });
  }
  const net = gov?.kt.net;
  const refLines = isNet && net && net.nominal !== null ? [{ y: net.nominal, label: `net nominal stress at the raiser ${formatValue(net.nominal)} ${unit}`, colour: SOFT }] : [];
  const res = drawChart(s, fr.draw, { xLabel: `distance along the line (${r.units.length})`, yLabel: `stress (${unit})`, series, refLines, yInclude: [0] }, fr.size);
  Object.assign(s.info, { plot: res.plot, samples: pm });
  return s;
}

export interface PictureSet {
  name: string;
  scene: Scene;
}

/** The options of the smaller chart pictures (section, convergence): three quarters wide, four fifths high. */
function smallOptions(opts: PictureOptions): PictureOptions {
  return { ...opts, width: opts.width ? Math.round(opts.width * 0.75) : undefined, height: opts.height ? Math.round(opts.height * 0.8) : undefined };
}

/** One picture raiser draws from a solution. */
export interface PictureKind {
  /** the name `raiser plot --only` takes */
  name: string;
  /** the file name without its extension (.png, .svg) */
  stem: string;
  /** what it shows, in a few words */
  title: string;
  /** drawn only from a convergence series of two meshes or more */
  needsConvergence: boolean;
  /** the standard set draws it with its own window whatever window was asked for */
  ownWindow: boolean;
  /** the scene, or null when the solution has nothing to show in it */
  scene: (src: PlotSource, opts: PictureOptions) => Scene | null;
}

/** The registry of pictures, in the order they are drawn; everything that lists pictures reads it. */
export const PICTURES: readonly PictureKind[] = [
  { name: 'contour', stem: 'contour', title: 'stress contour', needsConvergence: false, ownWindow: false, scene: contourScene },
  { name: 'peak', stem: 'peak', title: 'close-up of the peak', needsConvergence: false, ownWindow: true, scene: closeupScene },
  { name: 'mesh', stem: 'mesh', title: 'mesh', needsConvergence: false, ownWindow: false, scene: meshScene },
  { name: 'deformed', stem: 'deformed', title: 'deformed shape', needsConvergence: false, ownWindow: false, scene: (src, o) => deformedScene(src, { ...o, range: null }) },
  { name: 'geometry', stem: 'geometry', title: 'geometry, sections, loads and supports', needsConvergence: false, ownWindow: true, scene: geometryScene },
  { name: 'section', stem: 'section', title: 'stress along the net section', needsConvergence: false, ownWindow: false, scene: (src, o) => lineScene(src, smallOptions(o)) },
  { name: 'convergence', stem: 'convergence', title: 'Kt against degrees of freedom', needsConvergence: true, ownWindow: false, scene: (src, o) => convergenceScene(src, smallOptions(o)) },
];

/** The pictures a solution has: all of them, the convergence chart only with a series of two meshes or more. */
export function picturesFor(withConvergence: boolean): PictureKind[] {
  return PICTURES.filter((p) => withConvergence || !p.needsConvergence);
}

/** The standard set drawn by `raiser solve -o` and `raiser plot`. */
export function standardPictures(src: PlotSource, opts: PictureOptions = {}): PictureSet[] {
  const out: PictureSet[] = [];
  for (const p of PICTURES) {
    const scene = p.scene(src, p.ownWindow ? { ...opts, window: null } : opts);
    if (scene) out.push({ name: p.stem, scene });
  }
  return out;
}

/** The file names the standard pictures take (PNG and SVG each). */
export function pictureFileNames(withConvergence: boolean): string[] {
  return picturesFor(withConvergence).flatMap((p) => [`${p.stem}.png`, `${p.stem}.svg`]);
}

/** Renders and writes the pictures; returns the paths written and the PNG bytes by name. */
export function writePictures(dir: string, pictures: PictureSet[], formats: ('png' | 'svg')[] = ['png', 'svg']): { written: string[]; png: Map<string, Buffer> } {
  const written: string[] = [];
  const png = new Map<string, Buffer>();
  for (const p of pictures) {
    const bytes = renderPng(p.scene).toPng();
    png.set(p.name, bytes);
    if (formats.includes('png')) {
      const f = join(dir, `${p.name}.png`);
      writeAtomic(f, bytes);
      written.push(f);
    }
    if (formats.includes('svg')) {
      const f = join(dir, `${p.name}.svg`);
      writeAtomic(f, renderSvg(p.scene));
      written.push(f);
    }
  }
  return { written, png };
}

