/**
 * The pictures of the HTML report, drawn for its column rather than scaled down from the
 * standalone files: each scene is laid out in CSS pixels at the column's width (180 mm = 680
 * CSS pixels at 96 per inch), with its base text size chosen so that its smallest text (the
 * footer, the scale bar, the load labels) is at least MIN_TEXT_PX there, which prints at 8 pt
 * or more on A4 and Letter (the printed column is 180 to 188 mm wide).
 *
 * Why raster, at 2 raster pixels per CSS pixel, as 256-colour PNG: measured on the strap
 * example at this size, the scene's own SVG is larger than the PNG for every picture (contour
 * 258 KB, close-up 574 KB, convergence 198 KB, because every glyph is an outline of its own and
 * the field is an embedded raster anyway), while a 256-colour PNG at twice the CSS pixels is
 * 53-145 KB (the whole report 0.77 MB, was 2.5 MB), sharp at 192 pixels per inch in print and
 * on a dense screen. The close-up is no taller than the overview (its square window needs no
 * more), and the mesh picture, a forest of antialiased lines that compresses worst, is drawn at
 * 1.5 raster pixels per CSS pixel.
 */
import type { Scene } from '../render/scene.js';
import { renderPng, smallestText } from '../render/scene.js';
import { toPalettePng } from '../render/png-palette.js';
import type { PlotSource } from './saved.js';
import { closeupScene, contourScene, convergenceScene, deformedScene, geometryScene, lineScene, meshScene, type PictureOptions } from './pictures.js';

/** The report's column in CSS pixels: 180 mm at 96 CSS pixels per inch. */
export const COLUMN_PX = 680;
/** 8 pt in CSS pixels (1 pt = 1/72 inch, 1 CSS pixel = 1/96 inch). */
export const EIGHT_PT_PX = (8 * 96) / 72;
/**
 * The smallest text in a report picture, in CSS pixels at the column's width: 8 pt with 8%
 * to spare, so the text stays at 8 pt in a column down to 167 mm (a page with wider margins).
 */
export const MIN_TEXT_PX = 11.5;

/** A picture of the report: the PNG, and what a reader of the HTML needs to know of its text. */
export interface ReportPicture {
  png: Buffer;
  /** the scene's size in CSS pixels (the PNG is `scale` times larger) */
  width: number;
  height: number;
  scale: number;
  /** the smallest text size (em) of the picture in CSS pixels at its width */
  minTextPx: number;
  /** the base text size the picture was drawn with (PictureOptions.textSize) */
  textSize: number;
}

/** The base text size that makes the scene's smallest text MIN_TEXT_PX: built once at a trial size, then at the corrected one. */
function sized(build: (o: PictureOptions) => Scene | null, o: PictureOptions): { scene: Scene; textSize: number } | null {
  // 0.8: the smallest multiple of the base size the drawings use (the load and support labels),
  // so most pictures are built once; a smaller text (a legend heading set to fit) costs a rebuild
  const trial = MIN_TEXT_PX / 0.8;
  const s = build({ ...o, textSize: trial });
  if (!s) return null;
  const least = smallestText(s);
  if (!(least < MIN_TEXT_PX)) return { scene: s, textSize: trial };
  // text sizes are proportional to the base size, but a legend heading set smaller to fit its column
  // is not: grow until the smallest text is large enough (at most a few rounds)
  let size = (trial * MIN_TEXT_PX) / least;
  for (let round = 0; round < 4; round++) {
    const t = build({ ...o, textSize: size });
    if (!t) return null;
    const m = smallestText(t);
    if (!(m < MIN_TEXT_PX)) return { scene: t, textSize: size };
    size *= MIN_TEXT_PX / m;
  }
  throw new Error(`report picture: its smallest text stays below ${MIN_TEXT_PX} CSS pixels`);
}

function encode(s: Scene, textSize: number, scale: number): ReportPicture {
  return { png: toPalettePng(renderPng(s, scale)), width: s.width, height: s.height, scale, minTextPx: smallestText(s), textSize };
}

/** The report's pictures by name (contour, peak, mesh, deformed, geometry, section, convergence). */
export function reportPictures(src: PlotSource): Map<string, ReportPicture> {
  const W = COLUMN_PX;
  const out = new Map<string, ReportPicture>();
  const add = (name: string, build: (o: PictureOptions) => Scene | null, o: PictureOptions, scale = 2) => {
    const s = sized(build, o);
    if (s) out.set(name, encode(s.scene, s.textSize, scale));
  };
  // Heights: the overview pictures tall enough for a legend of several round values beside a long part.
  const tall = Math.round(0.62 * W);
  add('geometry', (o) => geometryScene(src, o), { width: W, window: null });
  add('mesh', (o) => meshScene(src, o), { width: W }, 1.5);
  add('contour', (o) => contourScene(src, o), { width: W, height: tall });
  add('peak', (o) => closeupScene(src, o), { width: W, height: tall, window: null });
  add('section', (o) => lineScene(src, o), { width: W, height: Math.round(0.6 * W) });
  add('deformed', (o) => deformedScene(src, o), { width: W, height: tall, range: null });
  add('convergence', (o) => convergenceScene(src, o), { width: W, height: Math.round(0.55 * W) });
  return out;
}
