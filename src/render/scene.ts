/**
 * A picture as a list of drawing items in pixel coordinates (y down), drawn in order by one of
 * two back ends: `renderPng` (the raster, antialiased) and `renderSvg` (vector paths; per-pixel
 * layers such as a contour field are embedded as PNG images at twice the resolution). Both
 * draw text from the same glyph outlines, so the two files look the same.
 */
import { colourAt, hex, type ColourMap } from './colormap.js';
import { layoutText, type Anchor, type Weight } from './font.js';
import { addStroke, Raster, type Rgb } from './raster.js';

/** left, top, right, bottom in pixels */
export type Box = [number, number, number, number];

export type Item =
  | { kind: 'fill'; paths: number[][]; colour: Rgb; alpha?: number; clip?: Box }
  | { kind: 'stroke'; lines: number[][]; width: number; colour: Rgb; alpha?: number; closed?: boolean; dash?: number[]; clip?: Box }
  | { kind: 'text'; text: string; x: number; y: number; size: number; colour: Rgb; anchor?: Anchor; weight?: Weight; rotate?: number }
  /** a per-pixel layer: paint(r, k) draws onto r at k times the scene's resolution */
  | { kind: 'layer'; paint: (r: Raster, k: number) => void; clip?: Box }
  /** a colour bar: t = 0 at the bottom (vertical) or left, t = 1 at the top or right */
  | { kind: 'gradient'; box: Box; map: ColourMap; vertical: boolean };

/** What a test or a caller may want to know about where things were drawn. */
export interface SceneInfo {
  /** regions of annotations (legend, labels, title) that may lie outside the part */
  boxes: { what: string; box: Box }[];
  [key: string]: unknown;
}

export interface Scene {
  width: number;
  height: number;
  background: Rgb;
  items: Item[];
  info: SceneInfo;
  /** for the SVG title */
  title: string;
}

export function newScene(width: number, height: number, title: string, background: Rgb = [255, 255, 255]): Scene {
  return { width, height, background, items: [], info: { boxes: [] }, title };
}

/** Adds a text item and records its box under `what` (when given); returns the box. */
export function addText(
  s: Scene,
  text: string,
  x: number,
  y: number,
  size: number,
  colour: Rgb,
  opts: { anchor?: Anchor; weight?: Weight; rotate?: number; what?: string } = {},
): Box {
  s.items.push({ kind: 'text', text, x, y, size, colour, anchor: opts.anchor, weight: opts.weight, rotate: opts.rotate });
  const box = layoutText(text, x, y, size, opts.anchor ?? 'start', opts.weight ?? 'normal', opts.rotate ?? 0).box;
  if (opts.what) s.info.boxes.push({ what: opts.what, box });
  return box;
}

// ---------------------------------------------------------------------------------------------

/**
 * The scene as a raster at `scale` raster pixels per scene pixel (1 by default; 2 draws a scene
 * laid out in CSS pixels sharp on a screen of twice the density and in print). Every item is
 * drawn at that scale from its outlines, so text and lines stay as sharp as at scale 1.
 */
export function renderPng(s: Scene, scale = 1): Raster {
  const r = new Raster(Math.round(s.width * scale), Math.round(s.height * scale), s.background);
  for (const it of s.items) drawItem(r, it, scale);
  return r;
}

/** The smallest text size (em, in scene pixels) among the scene's texts; Infinity when it has none. */
export function smallestText(s: Scene): number {
  let least = Infinity;
  for (const it of s.items) if (it.kind === 'text' && it.text.trim() && it.size < least) least = it.size;
  return least;
}

function drawItem(r: Raster, it: Item, k: number): void {
  const clip = 'clip' in it && it.clip ? it.clip : null;
  r.setClip(clip ? [clip[0] * k, clip[1] * k, clip[2] * k, clip[3] * k] : null);
  switch (it.kind) {
    case 'fill':
      r.fillPath(k === 1 ? it.paths : it.paths.map((p) => p.map((v) => v * k)), it.colour, it.alpha ?? 1);
      break;
    case 'stroke': {
      const paths: number[][] = [];
      for (const l of it.lines) addStroke(paths, k === 1 ? l : l.map((v) => v * k), it.width * k, it.closed ?? false, it.dash?.map((d) => d * k));
      r.fillPath(paths, it.colour, it.alpha ?? 1);
      break;
    }
    case 'text': {
      const t = layoutText(it.text, it.x * k, it.y * k, it.size * k, it.anchor ?? 'start', it.weight ?? 'normal', it.rotate ?? 0);
      r.fillPath(t.polygons, it.colour);
      break;
    }
    case 'layer':
      it.paint(r, k);
      break;
    case 'gradient': {
      const [x0, y0, x1, y1] = it.box.map((v) => v * k);
      const c = [0, 0, 0];
      for (let py = Math.floor(y0); py < Math.ceil(y1); py++) {
        for (let px = Math.floor(x0); px < Math.ceil(x1); px++) {
          const t = it.vertical ? (y1 - (py + 0.5)) / (y1 - y0) : (px + 0.5 - x0) / (x1 - x0);
          colourAt(it.map, t, c);
          r.set(px, py, [Math.round(c[0]), Math.round(c[1]), Math.round(c[2])]);
        }
      }
      break;
    }
  }
  r.setClip(null);
}

// ---------------------------------------------------------------------------------------------

function n2(v: number): string {
  return String(Math.round(v * 100) / 100);
}

function pathData(paths: number[][], close: boolean): string {
  const parts: string[] = [];
  for (const p of paths) {
    if (p.length < 4) continue;
    let d = `M${n2(p[0])} ${n2(p[1])}`;
    for (let k = 2; k + 1 < p.length; k += 2) d += `L${n2(p[k])} ${n2(p[k + 1])}`;
    if (close) d += 'Z';
    parts.push(d);
  }
  return parts.join('');
}

function esc(t: string): string {
  return t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

export function renderSvg(s: Scene): string {
  const out: string[] = [];
  const defs: string[] = [];
  const clips = new Map<string, string>();
  const clipRef = (b: Box | undefined): string => {
    if (!b) return '';
    const key = b.map(n2).join(',');
    let id = clips.get(key);
    if (!id) {
      id = `clip${clips.size + 1}`;
      clips.set(key, id);
      defs.push(`<clipPath id="${id}"><rect x="${n2(b[0])}" y="${n2(b[1])}" width="${n2(b[2] - b[0])}" height="${n2(b[3] - b[1])}"/></clipPath>`);
    }
    return ` clip-path="url(#${id})"`;
  };
  let gradients = 0;
  out.push(`<rect width="${s.width}" height="${s.height}" fill="${hex(s.background)}"/>`);
  for (const it of s.items) {
    switch (it.kind) {
      case 'fill':
        out.push(`<path d="${pathData(it.paths, true)}" fill="${hex(it.colour)}"${it.alpha !== undefined && it.alpha < 1 ? ` fill-opacity="${n2(it.alpha)}"` : ''}${clipRef(it.clip)}/>`);
        break;
      case 'stroke':
        out.push(
          `<path d="${pathData(it.lines, it.closed ?? false)}" fill="none" stroke="${hex(it.colour)}" stroke-width="${n2(it.width)}" stroke-linejoin="round" stroke-linecap="round"${
            it.alpha !== undefined && it.alpha < 1 ? ` stroke-opacity="${n2(it.alpha)}"` : ''
          }${it.dash ? ` stroke-dasharray="${it.dash.map(n2).join(' ')}"` : ''}${clipRef(it.clip)}/>`,
        );
        break;
      case 'text': {
        const t = layoutText(it.text, it.x, it.y, it.size, it.anchor ?? 'start', it.weight ?? 'normal', it.rotate ?? 0);
        out.push(`<path aria-label="${esc(it.text)}" d="${pathData(t.polygons, true)}" fill="${hex(it.colour)}"/>`);
        break;
      }
      case 'layer': {
        // Twice the resolution for pictures up to a million pixels, the same above.
        const k = s.width * s.height <= 1e6 ? 2 : 1;
        const r = new Raster(s.width * k, s.height * k, null);
        it.paint(r, k);
        out.push(`<image x="0" y="0" width="${s.width}" height="${s.height}" preserveAspectRatio="none" href="data:image/png;base64,${r.toPng().toString('base64')}"${clipRef(it.clip)}/>`);
        break;
      }
      case 'gradient': {
        const id = `grad${++gradients}`;
        const [x0, y0, x1, y1] = it.box;
        const stops: string[] = [];
        const c = [0, 0, 0];
        for (let i = 0; i <= 64; i++) {
          colourAt(it.map, i / 64, c);
          stops.push(`<stop offset="${n2(i / 64)}" stop-color="${hex(c)}"/>`);
        }
        const dir = it.vertical ? 'x1="0" y1="1" x2="0" y2="0"' : 'x1="0" y1="0" x2="1" y2="0"';
        defs.push(`<linearGradient id="${id}" ${dir}>${stops.join('')}</linearGradient>`);
        out.push(`<rect x="${n2(x0)}" y="${n2(y0)}" width="${n2(x1 - x0)}" height="${n2(y1 - y0)}" fill="url(#${id})"/>`);
        break;
      }
    }
  }
  return [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${s.width}" height="${s.height}" viewBox="0 0 ${s.width} ${s.height}">`,
    `<title>${esc(s.title)}</title>`,
    defs.length ? `<defs>${defs.join('')}</defs>` : '',
    ...out,
    '</svg>',
    '',
  ].join('\n');
}
