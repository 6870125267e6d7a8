/**
 * The picture of a plate before it is solved (`raiser mesh`): the mesh on the plate, and the
 * boundary coloured by the tags that loads and supports select, with a legend of the tags and
 * the hole numbers. Built as a scene (src/render/scene.ts) and so written by the same PNG and
 * SVG back ends, glyph text and mesh-line drawing (src/render/field.ts) as the pictures of a
 * solution; the boundary follows the curved sides of 6-node elements.
 *
 * Colours: the eight-colour palette of M. Okabe and K. Ito, "Color Universal Design (CUD): how
 * to make figures and presentations that are friendly to colorblind people" (2008) [M], for tag
 * groups in order of first appearance along the boundary; untagged edges are dark grey. Tags
 * that every edge carries (an SVG layer, say) tell no edges apart: they are named once, above.
 */
import type { Domain } from '../geometry/domain.js';
import type { Mesh } from '../mesh/types.js';
import { drawScaleBar, INK, SOFT } from './annotate.js';
import { textWidth } from './font.js';
import { edgePolyline, fitView, meshEdgeLines, type View } from './field.js';
import type { Rgb } from './raster.js';
import { addText, newScene, renderPng, renderSvg, type Box, type Scene } from './scene.js';

const PALETTE: Rgb[] = [
  [230, 159, 0],
  [86, 180, 233],
  [0, 158, 115],
  [213, 94, 0],
  [0, 114, 178],
  [204, 121, 167],
  [240, 228, 66],
  [0, 0, 0],
];
const UNTAGGED: Rgb = [70, 70, 70];
/** The plate, as the solution pictures fill it. */
export const MATERIAL: Rgb = [222, 230, 238];
const MESH_LINE: Rgb = [90, 100, 116];

export interface GeometryPictureInput {
  domain: Domain;
  mesh: Mesh;
  /** what the part is */
  title: string;
  /** lines of detail under the title */
  lines: string[];
  /** picture width in pixels (default 1600) */
  width?: number;
  /** the footer every picture carries: the model, tool and date line, and the caution line */
  footer?: { line: string; caution: string };
  /** the length unit's name, for the scale bar (default "mm") */
  lengthUnit?: string;
}

export interface GeometryPicture {
  scene: Scene;
  png: Buffer;
  svg: string;
  /** the legend: the tags of each colour group (less those on every edge), its colour and its number of domain edges */
  legend: { tags: string[]; colour: Rgb; edges: number }[];
  /** tags carried by every edge */
  common: string[];
}

/** The caution line's colour, as on the pictures of a solution. */
const CAUTION: Rgb = [150, 40, 30];

/** The text cut with an ellipsis to fit the width. */
function fitText(text: string, size: number, width: number): string {
  if (textWidth(text, size) <= width) return text;
  let t = text;
  while (t.length > 4 && textWidth(t + '...', size) > width) t = t.slice(0, -1);
  return t + '...';
}

/** Scene, PNG and SVG of the tagged geometry and its mesh. */
export function drawGeometryPicture(input: GeometryPictureInput): GeometryPicture {
  const { domain, mesh } = input;
  const W = input.width ?? 1600;
  const size = Math.max(12, Math.round(W / 100));
  const common = (domain.edges[0]?.tags ?? []).filter((t) => domain.edges.every((e) => e.tags.includes(t)));
  const lines = common.length ? [...input.lines, `tags on every edge: ${common.join(', ')}`] : input.lines;
  const groups: { key: string; tags: string[]; colour: Rgb; edges: number }[] = [];
  const groupOf = new Int32Array(domain.edges.length);
  for (const e of domain.edges) {
    const own = e.tags.filter((t) => !common.includes(t));
    const key = own.join('\u0000');
    let g = groups.findIndex((x) => x.key === key);
    if (g < 0) {
      const tagged = groups.filter((x) => x.tags.length > 0).length;
      groups.push({ key, tags: own, colour: own.length === 0 ? UNTAGGED : PALETTE[tagged % PALETTE.length], edges: 0 });
      g = groups.length - 1;
    }
    groups[g].edges++;
    groupOf[e.id] = g;
  }
  // Layout: title and detail lines on top, the drawing on the left, the legend column on the right.
  const margin = 2 * size;
  const legendW = Math.round(0.24 * W);
  const top = margin + Math.round(1.6 * size) + Math.round(1.5 * size * lines.length) + size;
  const [bx0, by0, bx1, by1] = domain.bbox;
  const aspect = Math.max(by1 - by0, 1e-300) / Math.max(bx1 - bx0, 1e-300);
  const drawW = W - legendW - 2 * margin;
  const drawH = Math.max(8 * size, Math.min(1.2 * W, aspect * drawW), (groups.length + 2) * 1.6 * size);
  // below the drawing: a strip for the scale bar, then the footer's two lines
  const barStrip = 2.6 * size;
  const footH = input.footer ? 2 * 1.45 * 0.82 * size + 0.6 * size : 0;
  const H = Math.round(top + drawH + barStrip + footH + margin);
  const draw: Box = [margin, top, margin + drawW, top + drawH];
  const view: View = fitView(domain.bbox, draw);
  const s = newScene(W, H, `mesh before solving: ${input.title}`);

  // The plate: closed loops of boundary edges, filled (holes cut out by their orientation).
  const next = new Map<number, number>();
  for (let k = 0; k < mesh.nBEdges; k++) next.set(mesh.bEdges[3 * k], k);
  const used = new Uint8Array(mesh.nBEdges);
  const loops: number[][] = [];
  for (let k0 = 0; k0 < mesh.nBEdges; k0++) {
    if (used[k0]) continue;
    const loop: number[] = [];
    let k: number | undefined = k0;
    while (k !== undefined && !used[k]) {
      used[k] = 1;
      const pl = edgePolyline(mesh.nodes, mesh.bEdges[3 * k], mesh.bEdges[3 * k + 1], mesh.bEdges[3 * k + 2], view);
      loop.push(...pl.slice(0, pl.length - 2));
      k = next.get(mesh.bEdges[3 * k + 1]);
    }
    loops.push(loop);
  }
  s.items.push({ kind: 'fill', paths: loops, colour: MATERIAL });
  s.items.push({ kind: 'stroke', lines: meshEdgeLines(mesh, view), width: 0.7, colour: MESH_LINE, alpha: 0.8 });
  // The boundary by tag group.
  const byGroup: number[][][] = groups.map(() => []);
  for (let k = 0; k < mesh.nBEdges; k++) {
    byGroup[groupOf[mesh.bEdgeDomain[k]]].push(edgePolyline(mesh.nodes, mesh.bEdges[3 * k], mesh.bEdges[3 * k + 1], mesh.bEdges[3 * k + 2], view));
  }
  groups.forEach((g, i) => s.items.push({ kind: 'stroke', lines: byGroup[i], width: 0.28 * size, colour: g.colour }));
  // Hole numbers at the middle of each hole.
  for (const l of domain.loops.slice(1)) {
    let sx = 0;
    let sy = 0;
    let n = 0;
    for (let k = 0; k < mesh.nBEdges; k++) {
      if (domain.edges[mesh.bEdgeDomain[k]].loop !== l.index) continue;
      sx += view.ox + view.s * mesh.nodes[2 * mesh.bEdges[3 * k]];
      sy += view.oy - view.s * mesh.nodes[2 * mesh.bEdges[3 * k] + 1];
      n++;
    }
    if (n) addText(s, String(l.hole), sx / n, sy / n + 0.35 * size, size, INK, { anchor: 'middle', what: `hole ${l.hole}` });
  }
  // Title, details, legend.
  addText(s, input.title, margin, margin + size, Math.round(1.4 * size), INK, { weight: 'bold', what: 'title' });
  lines.forEach((l, i) => addText(s, l, margin, margin + Math.round(1.6 * size) + Math.round(1.5 * size * (i + 1)), size, SOFT, { what: 'subtitle' }));
  const lx = W - legendW + size;
  addText(s, 'edge tags', lx, top + size, size, INK, { weight: 'bold', what: 'legend' });
  groups.forEach((g, i) => {
    const y = top + 2.6 * size + 1.6 * size * i;
    s.items.push({ kind: 'stroke', lines: [[lx, y - 0.35 * size, lx + 2 * size, y - 0.35 * size]], width: 0.32 * size, colour: g.colour });
    addText(s, `${g.tags.length ? g.tags.join(', ') : '(no tag)'} (${g.edges} edge${g.edges === 1 ? '' : 's'})`, lx + 2.6 * size, y, 0.9 * size, INK, { what: 'legend' });
  });
  const barY = top + drawH + 1.9 * size;
  drawScaleBar(s, margin + 0.4 * size, barY, view.s, 0.22 * drawW, input.lengthUnit ?? 'mm', 0.9 * size);
  if (input.footer) {
    const fs = 0.82 * size;
    const y2 = H - 0.9 * margin;
    addText(s, fitText(input.footer.line, fs, W - 2 * margin), margin, y2 - 1.45 * fs, fs, SOFT, { what: 'footer' });
    addText(s, fitText(input.footer.caution, fs, W - 2 * margin), margin, y2, fs, CAUTION, { what: 'caution' });
  }
  return {
    scene: s,
    png: renderPng(s).toPng(),
    svg: renderSvg(s),
    legend: groups.map((g) => ({ tags: g.tags, colour: g.colour, edges: g.edges })),
    common,
  };
}
