/**
 * The picture of a plate before it is solved: its mesh, and its boundary coloured by the tags
 * that loads and supports select, with a legend. Written twice from the same drawing list: a
 * PNG through the raster (src/render/raster.ts, pngjs) and an SVG.
 *
 * Boundary edges of the mesh follow the true curves (their midside nodes lie on them), and the
 * elements are drawn as their four corner sub-triangles, so curved edges show curved.
 *
 * Colours: the eight-colour palette of M. Okabe and K. Ito, "Color Universal Design (CUD): how
 * to make figures and presentations that are friendly to colorblind people" (2008) [M], for tag
 * groups in order of first appearance along the boundary; edges with no tag are dark grey.
 * Text in the PNG uses a 3 x 5 pixel capital font drawn here (the SVG has real text).
 */
import type { Domain } from '../geometry/domain.js';
import type { Mesh } from '../mesh/types.js';
import { Raster } from './raster.js';

type Rgb = [number, number, number];

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
const MATERIAL: Rgb = [222, 230, 238];
const MESH_LINE: Rgb = [120, 134, 150];
const INK: Rgb = [28, 30, 38];

export interface GeometryPictureInput {
  domain: Domain;
  mesh: Mesh;
  /** first line: what the part is; further lines: details */
  title: string;
  lines: string[];
  /** picture width in pixels (default 1400) */
  width?: number;
}

export interface GeometryPicture {
  png: Buffer;
  svg: string;
  /** the legend: tags of each colour group, its colour and how many domain edges it has */
  legend: { tags: string[]; colour: Rgb; edges: number }[];
}

/** 3 x 5 glyphs, rows top to bottom, '#' set. */
const GLYPHS: Record<string, string> = {
  '0': '###,#.#,#.#,#.#,###', '1': '.#.,##.,.#.,.#.,###', '2': '##.,..#,.#.,#..,###', '3': '##.,..#,.#.,..#,##.',
  '4': '#.#,#.#,###,..#,..#', '5': '###,#..,##.,..#,##.', '6': '.##,#..,###,#.#,###', '7': '###,..#,.#.,.#.,.#.',
  '8': '###,#.#,###,#.#,###', '9': '###,#.#,###,..#,##.',
  A: '.#.,#.#,###,#.#,#.#', B: '##.,#.#,##.,#.#,##.', C: '.##,#..,#..,#..,.##', D: '##.,#.#,#.#,#.#,##.',
  E: '###,#..,##.,#..,###', F: '###,#..,##.,#..,#..', G: '.##,#..,#.#,#.#,.##', H: '#.#,#.#,###,#.#,#.#',
  I: '###,.#.,.#.,.#.,###', J: '..#,..#,..#,#.#,.#.', K: '#.#,#.#,##.,#.#,#.#', L: '#..,#..,#..,#..,###',
  M: '#.#,###,###,#.#,#.#', N: '##.,#.#,#.#,#.#,#.#', O: '.#.,#.#,#.#,#.#,.#.', P: '##.,#.#,##.,#..,#..',
  Q: '.#.,#.#,#.#,##.,.##', R: '##.,#.#,##.,#.#,#.#', S: '.##,#..,.#.,..#,##.', T: '###,.#.,.#.,.#.,.#.',
  U: '#.#,#.#,#.#,#.#,###', V: '#.#,#.#,#.#,#.#,.#.', W: '#.#,#.#,###,###,#.#', X: '#.#,#.#,.#.,#.#,#.#',
  Y: '#.#,#.#,.#.,.#.,.#.', Z: '###,..#,.#.,#..,###',
  ' ': '...,...,...,...,...', '-': '...,...,###,...,...', _: '...,...,...,...,###', '.': '...,...,...,...,.#.',
  ',': '...,...,...,.#.,#..', ':': '...,.#.,...,.#.,...', '(': '.#.,#..,#..,#..,.#.', ')': '.#.,..#,..#,..#,.#.',
  '/': '..#,..#,.#.,#..,#..', '"': '#.#,#.#,...,...,...', "'": '.#.,.#.,...,...,...', '=': '...,###,...,###,...',
  '+': '...,.#.,###,.#.,...', '#': '#.#,###,#.#,###,#.#', '%': '#.#,..#,.#.,#..,#.#', '[': '##.,#..,#..,#..,##.',
  ']': '.##,..#,..#,..#,.##', '<': '..#,.#.,#..,.#.,..#', '>': '#..,.#.,..#,.#.,#..', '^': '.#.,#.#,...,...,...',
  '*': '...,#.#,.#.,#.#,...', ';': '...,.#.,...,.#.,#..', '?': '##.,..#,.#.,...,.#.', '!': '.#.,.#.,.#.,...,.#.', '&': '.#.,#.#,.#.,#.#,.##',
};

/** Draws text in the 3 x 5 font, `scale` pixels per font pixel; returns the width drawn. */
function drawPixelText(r: Raster, text: string, x: number, y: number, scale: number, c: Rgb): number {
  let cx = Math.round(x);
  const top = Math.round(y);
  for (const ch of text.toUpperCase()) {
    const g = GLYPHS[ch] ?? '###,#.#,#.#,#.#,###';
    const rows = g.split(',');
    for (let j = 0; j < 5; j++) {
      for (let i = 0; i < 3; i++) {
        if (rows[j][i] !== '#') continue;
        for (let a = 0; a < scale; a++) for (let b = 0; b < scale; b++) r.set(cx + i * scale + a, top + j * scale + b, c);
      }
    }
    cx += 4 * scale;
  }
  return cx - x;
}

/** An antialiased line of the given width (coverage from the distance to the segment). */
function drawLine(r: Raster, x0: number, y0: number, x1: number, y1: number, width: number, c: Rgb): void {
  const h = width / 2;
  const minX = Math.max(0, Math.floor(Math.min(x0, x1) - h - 1));
  const maxX = Math.min(r.width - 1, Math.ceil(Math.max(x0, x1) + h + 1));
  const minY = Math.max(0, Math.floor(Math.min(y0, y1) - h - 1));
  const maxY = Math.min(r.height - 1, Math.ceil(Math.max(y0, y1) + h + 1));
  const dx = x1 - x0;
  const dy = y1 - y0;
  const l2 = dx * dx + dy * dy;
  for (let py = minY; py <= maxY; py++) {
    for (let px = minX; px <= maxX; px++) {
      const cx = px + 0.5;
      const cy = py + 0.5;
      const t = l2 > 0 ? Math.max(0, Math.min(1, ((cx - x0) * dx + (cy - y0) * dy) / l2)) : 0;
      const d = Math.hypot(cx - (x0 + t * dx), cy - (y0 + t * dy));
      const cover = Math.min(1, Math.max(0, h + 0.5 - d));
      if (cover > 0) r.blend(px, py, c, cover);
    }
  }
}

function hex(c: Rgb): string {
  return `#${c.map((v) => v.toString(16).padStart(2, '0')).join('')}`;
}

function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Draws the mesh and the tagged boundary; returns the PNG, the SVG and the legend. */
export function drawGeometryPicture(input: GeometryPictureInput): GeometryPicture {
  const { domain, mesh } = input;
  const W = input.width ?? 1400;
  const legendW = 340;
  const margin = 30;
  const header = 30 + 18 * (2 + input.lines.length);
  const [bx0, by0, bx1, by1] = domain.bbox;
  const spanX = Math.max(bx1 - bx0, 1e-300);
  const spanY = Math.max(by1 - by0, 1e-300);
  const drawW = W - legendW - 2 * margin;
  let k = drawW / spanX;
  const maxDrawH = 1000;
  if (spanY * k > maxDrawH) k = maxDrawH / spanY;
  const drawH = Math.max(200, Math.ceil(spanY * k));
  // Tags on every edge (an SVG layer, say) tell edges apart no more than none: said once, above.
  const common = (domain.edges[0]?.tags ?? []).filter((t) => domain.edges.every((e) => e.tags.includes(t)));
  const lines = common.length ? [...input.lines, `tags on every edge: ${common.join(', ')}`] : input.lines;
  // Legend groups: one colour per distinct list of the other tags, in boundary order.
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
  const H = Math.max(header + drawH + 2 * margin, header + 40 + 22 * groups.length + 2 * margin);
  const ox = margin + (drawW - spanX * k) / 2;
  const oy = header + margin + (drawH - spanY * k) / 2;
  const X = (x: number) => ox + (x - bx0) * k;
  const Y = (y: number) => oy + (by1 - y) * k;
  const nodes = mesh.nodes;
  const per = mesh.order === 2 ? 6 : 3;

  // Drawing list in pixels, shared by both back ends.
  const tris: number[] = []; // x0 y0 x1 y1 x2 y2 per sub-triangle
  const meshLines: number[] = []; // x0 y0 x1 y1 per segment
  const px = (i: number) => X(nodes[2 * i]);
  const py = (i: number) => Y(nodes[2 * i + 1]);
  for (let e = 0; e < mesh.nElements; e++) {
    const v = mesh.elements.subarray(per * e, per * e + per);
    if (per === 6) {
      const sub = [
        [v[0], v[3], v[5]],
        [v[3], v[1], v[4]],
        [v[5], v[4], v[2]],
        [v[3], v[4], v[5]],
      ];
      for (const [a, b, c] of sub) tris.push(px(a), py(a), px(b), py(b), px(c), py(c));
      for (const [a, m, b] of [
        [v[0], v[3], v[1]],
        [v[1], v[4], v[2]],
        [v[2], v[5], v[0]],
      ]) {
        if (a < b) meshLines.push(px(a), py(a), px(m), py(m), px(m), py(m), px(b), py(b));
      }
    } else {
      tris.push(px(v[0]), py(v[0]), px(v[1]), py(v[1]), px(v[2]), py(v[2]));
      for (const [a, b] of [
        [v[0], v[1]],
        [v[1], v[2]],
        [v[2], v[0]],
      ]) {
        if (a < b) meshLines.push(px(a), py(a), px(b), py(b));
      }
    }
  }
  // Interior edges are each seen twice (a < b keeps one); boundary edges once, drawn again below.
  const boundary: { pts: number[]; colour: Rgb }[] = [];
  for (let s = 0; s < mesh.nBEdges; s++) {
    const a = mesh.bEdges[3 * s];
    const b = mesh.bEdges[3 * s + 1];
    const m = mesh.bEdges[3 * s + 2];
    const pts = m >= 0 ? [px(a), py(a), px(m), py(m), px(b), py(b)] : [px(a), py(a), px(b), py(b)];
    boundary.push({ pts, colour: groups[groupOf[mesh.bEdgeDomain[s]]].colour });
  }
  const holeLabels = domain.loops.slice(1).map((l) => {
    let sx = 0;
    let sy = 0;
    let n = 0;
    for (let s = 0; s < mesh.nBEdges; s++) {
      if (domain.edges[mesh.bEdgeDomain[s]].loop !== l.index) continue;
      sx += px(mesh.bEdges[3 * s]);
      sy += py(mesh.bEdges[3 * s]);
      n++;
    }
    return { text: String(l.hole), x: n ? sx / n : 0, y: n ? sy / n : 0 };
  });
  const lx = W - legendW + 10;
  const ly = header + margin;

  // PNG.
  const r = new Raster(W, H, [255, 255, 255]);
  const fill = (_b0: number, _b1: number, _b2: number, out: number[]) => {
    out[0] = MATERIAL[0];
    out[1] = MATERIAL[1];
    out[2] = MATERIAL[2];
    out[3] = 1;
  };
  for (let i = 0; i < tris.length; i += 6) r.fillTriangle(tris[i], tris[i + 1], tris[i + 2], tris[i + 3], tris[i + 4], tris[i + 5], fill);
  for (let i = 0; i < meshLines.length; i += 4) drawLine(r, meshLines[i], meshLines[i + 1], meshLines[i + 2], meshLines[i + 3], 0.8, MESH_LINE);
  for (const b of boundary) for (let i = 0; i + 3 < b.pts.length; i += 2) drawLine(r, b.pts[i], b.pts[i + 1], b.pts[i + 2], b.pts[i + 3], 3.2, b.colour);
  for (const h of holeLabels) drawPixelText(r, h.text, h.x - 6 * h.text.length + 3, h.y - 5, 2, INK);
  drawPixelText(r, input.title, margin, 14, 3, INK);
  lines.forEach((l, i) => drawPixelText(r, l, margin, 38 + 18 * i, 2, INK));
  drawPixelText(r, 'EDGE TAGS', lx, ly, 2, INK);
  groups.forEach((g, i) => {
    const y = ly + 24 + 22 * i;
    drawLine(r, lx, y + 5, lx + 28, y + 5, 4, g.colour);
    drawPixelText(r, `${g.tags.length ? g.tags.join(', ') : '(no tag)'} (${g.edges})`, lx + 36, y, 2, INK);
  });

  // SVG.
  const f = (v: number) => Number(v.toFixed(2));
  const svg: string[] = [];
  svg.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif">`);
  svg.push(`<title>${escapeXml(input.title)}</title>`);
  svg.push(`<rect width="${W}" height="${H}" fill="#ffffff"/>`);
  let d = '';
  for (let i = 0; i < tris.length; i += 6) d += `M${f(tris[i])} ${f(tris[i + 1])}L${f(tris[i + 2])} ${f(tris[i + 3])}L${f(tris[i + 4])} ${f(tris[i + 5])}Z`;
  svg.push(`<path d="${d}" fill="${hex(MATERIAL)}" stroke="${hex(MATERIAL)}" stroke-width="0.3"/>`);
  d = '';
  for (let i = 0; i < meshLines.length; i += 4) d += `M${f(meshLines[i])} ${f(meshLines[i + 1])}L${f(meshLines[i + 2])} ${f(meshLines[i + 3])}`;
  svg.push(`<path d="${d}" fill="none" stroke="${hex(MESH_LINE)}" stroke-width="0.8"/>`);
  for (const [gi, g] of groups.entries()) {
    d = '';
    boundary.forEach((b, s) => {
      if (groupOf[mesh.bEdgeDomain[s]] !== gi) return;
      d += `M${f(b.pts[0])} ${f(b.pts[1])}`;
      for (let i = 2; i < b.pts.length; i += 2) d += `L${f(b.pts[i])} ${f(b.pts[i + 1])}`;
    });
    svg.push(`<path class="tags" data-tags="${escapeXml(g.tags.join(' '))}" d="${d}" fill="none" stroke="${hex(g.colour)}" stroke-width="3.2" stroke-linecap="round"/>`);
  }
  for (const h of holeLabels) svg.push(`<text x="${f(h.x)}" y="${f(h.y + 5)}" font-size="14" text-anchor="middle" fill="${hex(INK)}">${h.text}</text>`);
  svg.push(`<text x="${margin}" y="26" font-size="18" font-weight="bold" fill="${hex(INK)}">${escapeXml(input.title)}</text>`);
  lines.forEach((l, i) => svg.push(`<text x="${margin}" y="${48 + 18 * i}" font-size="13" fill="${hex(INK)}">${escapeXml(l)}</text>`));
  svg.push(`<text x="${lx}" y="${ly + 10}" font-size="14" font-weight="bold" fill="${hex(INK)}">Edge tags</text>`);
  groups.forEach((g, i) => {
    const y = ly + 24 + 22 * i;
    svg.push(`<line x1="${lx}" y1="${y + 5}" x2="${lx + 28}" y2="${y + 5}" stroke="${hex(g.colour)}" stroke-width="4"/>`);
    svg.push(`<text x="${lx + 36}" y="${y + 10}" font-size="13" fill="${hex(INK)}">${escapeXml(`${g.tags.length ? g.tags.join(', ') : '(no tag)'} (${g.edges} edge${g.edges === 1 ? '' : 's'})`)}</text>`);
  });
  svg.push('</svg>');
  return { png: r.toPng(), svg: svg.join('\n') + '\n', legend: groups.map((g) => ({ tags: g.tags, colour: g.colour, edges: g.edges })) };
}
