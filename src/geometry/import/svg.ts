/**
 * Reading the profile of a plate from an SVG drawing.
 *
 * The document is read as XML by saxes (a strict, well-kept streaming XML parser that reports
 * line numbers); path data is parsed and normalised by svgpath (absolute coordinates, smooth
 * curves written out in full), whose transform-list parser also gives the matrix of each
 * `transform` attribute. This file only walks the element tree, composes the transforms and
 * turns each shape into exact curves: straight segments, circular and elliptical arcs (SVG
 * arcs, circles, ellipses, rounded rectangle corners) and quadratic and cubic Bezier curves.
 *
 * Units: one user unit (a coordinate of the viewBox) is `unit` from the model when given;
 * otherwise width / viewBox width when the root element's width has an absolute unit (mm, cm,
 * in, pt, pc, Q, px), otherwise 1 px = 1/96 in, as the SVG and CSS rules say
 * (SVG 1.1 section 7.10, CSS Values and Units Level 3 section 6.2 [M]).
 * Coordinates: y is flipped to point up, with the model origin at the bottom-left corner of the
 * viewBox (of the width x height canvas without one).
 */
import { createRequire } from 'node:module';
import type { SaxesTagNS } from 'saxes';

/** The XML and path-data parsers, loaded when an SVG file is first read (not at start-up). */
const loadSaxes = (): typeof import('saxes') => createRequire(import.meta.url)('saxes') as typeof import('saxes');
const svgpath = (d: string): ReturnType<typeof import('svgpath')> => (createRequire(import.meta.url)('svgpath') as typeof import('svgpath'))(d);
import { type Curve } from '../curve.js';
import { type Affine, IDENTITY, compose, mapCurve, scaling, translation } from './affine.js';
import { ExpansionBudget, MAX_EXPANDED_ITEMS, MAX_XML_DEPTH, MAX_XML_ENTITIES, MAX_XML_ENTITY_LENGTH, MAX_XML_EXPANSION } from './limits.js';
import { DRAWING_UNIT_METRES, DrawingError, type DrawnCurve, type Piece, type ReadDrawing, type ReadOptions } from './types.js';

const SVG_NS = 'http://www.w3.org/2000/svg';
const INKSCAPE_NS = 'http://www.inkscape.org/namespaces/inkscape';
const XLINK_NS = 'http://www.w3.org/1999/xlink';

interface XmlElement {
  local: string;
  uri: string;
  attrs: Map<string, string>;
  /** attributes in the Inkscape and xlink namespaces, by local name */
  inkscapeLabel?: string;
  xlinkHref?: string;
  children: XmlElement[];
  line: number;
}

/** The elements of an SVG document as a tree (text and comments dropped). */
function parseXml(text: string): XmlElement {
  const parser = new (loadSaxes().SaxesParser)({ xmlns: true, position: true });
  const stack: XmlElement[] = [];
  let elements = 0;
  let root: XmlElement | undefined;
  let failure: Error | undefined;
  parser.on('error', (e) => {
    failure ??= e;
  });
  // Entities declared in the document's internal DTD subset (some drawing programs declare
  // their namespaces that way) are given to the parser, which does not read DTDs itself. They
  // are read by a linear scan, limited in number and length, and every use of one is charged
  // against a total, so that a few hundred bytes cannot expand into gigabytes of text.
  parser.on('doctype', (dt) => {
    const entities = (parser as unknown as { ENTITIES: Record<string, string> }).ENTITIES;
    let expanded = 0;
    for (const [name, value] of declaredEntities(dt)) {
      Object.defineProperty(entities, name, {
        enumerable: true,
        get() {
          expanded += value.length;
          if (expanded > MAX_XML_EXPANSION) {
            throw new DrawingError(
              `the entity references of the SVG file expand to more than ${MAX_XML_EXPANSION.toLocaleString('en-US')} characters (&${name}; at line ${parser.line})`,
              'a drawing needs no such expansion: export the drawing again as plain SVG without a document type',
            );
          }
          return value;
        },
      });
    }
  });
  parser.on('opentag', (tag: SaxesTagNS) => {
    const attrs = new Map<string, string>();
    let inkscapeLabel: string | undefined;
    let xlinkHref: string | undefined;
    for (const a of Object.values(tag.attributes)) {
      if (a.uri === '' || a.uri === undefined) attrs.set(a.local, a.value);
      else if (a.uri === INKSCAPE_NS && a.local === 'label') inkscapeLabel = a.value;
      else if (a.uri === XLINK_NS && a.local === 'href') xlinkHref = a.value;
    }
    const el: XmlElement = { local: tag.local, uri: tag.uri, attrs, inkscapeLabel, xlinkHref, children: [], line: parser.line };
    if (++elements > MAX_EXPANDED_ITEMS) {
      throw new DrawingError(`the SVG file holds more than ${MAX_EXPANDED_ITEMS.toLocaleString('en-US')} elements (the limit was passed at line ${parser.line})`, 'a plate profile needs far fewer: export only the part, or simplify the drawing');
    }
    if (stack.length >= MAX_XML_DEPTH) {
      throw new DrawingError(`${describe(el)}: elements nested more than ${MAX_XML_DEPTH} deep`, 'a drawing of a plate needs far fewer levels: ungroup the drawing in the drawing program and save it again');
    }
    if (stack.length) stack[stack.length - 1].children.push(el);
    else root ??= el;
    stack.push(el);
  });
  parser.on('closetag', () => {
    stack.pop();
  });
  try {
    parser.write(text).close();
  } catch (e) {
    if (e instanceof DrawingError) throw e;
    failure ??= e as Error;
  }
  if (failure) throw new DrawingError(`the SVG file is not well-formed XML: ${failure.message}`, 'open it in a drawing program and save it again as plain SVG');
  if (!root) throw new DrawingError('the SVG file has no elements', 'export the drawing again as SVG');
  return root;
}

/**
 * The general entities declared in a document type's internal subset, `<!ENTITY name "value">`
 * (parameter entities, `<!ENTITY % ...>`, and external ones are not read). One pass over the
 * text, so the cost is linear in its length whatever it holds; more than MAX_XML_ENTITIES
 * declarations or a value longer than MAX_XML_ENTITY_LENGTH is refused.
 */
function declaredEntities(dt: string): [string, string][] {
  const out: [string, string][] = [];
  const n = dt.length;
  let i = dt.indexOf('<!ENTITY');
  while (i >= 0) {
    let p = i + 8;
    const skipSpace = () => {
      while (p < n && /\s/.test(dt[p])) p++;
    };
    skipSpace();
    if (dt[p] === '%') {
      i = dt.indexOf('<!ENTITY', p);
      continue;
    }
    const nameStart = p;
    while (p < n && !/[\s"'>]/.test(dt[p])) p++;
    const name = dt.slice(nameStart, p);
    skipSpace();
    const quote = dt[p];
    if (name && (quote === '"' || quote === "'")) {
      const end = dt.indexOf(quote, p + 1);
      if (end < 0) break; // unterminated: the XML parser reports the document as malformed
      const value = dt.slice(p + 1, end);
      if (out.length >= MAX_XML_ENTITIES) {
        throw new DrawingError(`the SVG file's document type declares more than ${MAX_XML_ENTITIES} entities`, 'export the drawing again as plain SVG without a document type');
      }
      if (value.length > MAX_XML_ENTITY_LENGTH) {
        throw new DrawingError(`the entity "${name.slice(0, 40)}" declared in the SVG file's document type is ${value.length.toLocaleString('en-US')} characters long, more than ${MAX_XML_ENTITY_LENGTH.toLocaleString('en-US')}`, 'export the drawing again as plain SVG without a document type');
      }
      if (/^[A-Za-z_:][\w.:-]*$/.test(name) && !value.includes('&')) out.push([name, value]);
      p = end + 1;
    }
    i = dt.indexOf('<!ENTITY', p);
  }
  return out;
}

const ABSOLUTE_CSS: Record<string, number> = {
  px: DRAWING_UNIT_METRES.px,
  pt: DRAWING_UNIT_METRES.pt,
  pc: 0.0254 / 6,
  mm: 0.001,
  cm: 0.01,
  in: 0.0254,
  q: 0.00025,
};

/** A length attribute: its number and unit (lower case, '' for none). */
function parseLength(v: string | undefined): { value: number; unit: string } | undefined {
  if (v === undefined) return undefined;
  const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([a-zA-Z%]*)\s*$/.exec(v);
  if (!m) return { value: NaN, unit: v.trim() };
  return { value: Number(m[1]), unit: m[2].toLowerCase() };
}

function num(el: XmlElement, name: string, fallback = 0): number {
  const v = el.attrs.get(name);
  if (v === undefined || v.trim() === '') return fallback;
  const l = parseLength(v)!;
  if (!Number.isFinite(l.value) || (l.unit !== '' && l.unit !== 'px')) {
    throw new DrawingError(`${describe(el)}: ${name}="${v}" is not a plain number`, 'give coordinates in user units (plain numbers) inside the drawing');
  }
  return l.value;
}

function describe(el: XmlElement): string {
  const id = el.attrs.get('id');
  return `<${el.local}${id ? ` id="${id}"` : ''}> (line ${el.line})`;
}

/** Presentation that hides an element: display none (attribute or style) or visibility hidden. */
function hidden(el: XmlElement): boolean {
  const style = el.attrs.get('style') ?? '';
  return el.attrs.get('display') === 'none' || /(^|;)\s*display\s*:\s*none/.test(style) || el.attrs.get('visibility') === 'hidden' || /(^|;)\s*visibility\s*:\s*hidden/.test(style);
}

/** The matrix of a transform attribute, by svgpath's transform parser (it maps the points (0,0), (1,0), (0,1)). */
function transformOf(el: XmlElement): Affine {
  const t = el.attrs.get('transform');
  if (!t || !t.trim()) return IDENTITY;
  const p = svgpath('M0 0L1 0L0 1').transform(t);
  const pts: number[] = [];
  p.iterate((s) => {
    pts.push(s[1] as number, s[2] as number);
  });
  const [e, f, x1, y1, x2, y2] = pts;
  const A: Affine = [x1 - e, y1 - f, x2 - e, y2 - f, e, f];
  if (!A.every(Number.isFinite)) throw new DrawingError(`${describe(el)}: transform="${t}" cannot be read`, 'write it as matrix(), translate(), scale(), rotate(), skewX() or skewY()');
  return A;
}

/** Keys of an element itself: its id, its classes and (for an Inkscape layer or group) its label. */
function ownKeys(el: XmlElement): string[] {
  const keys: string[] = [];
  const id = el.attrs.get('id');
  if (id) keys.push(id);
  for (const c of (el.attrs.get('class') ?? '').split(/\s+/)) if (c) keys.push(c);
  if (el.inkscapeLabel) keys.push(el.inkscapeLabel);
  return keys;
}

/** Elements whose content is never drawn directly, or is not geometry. */
const SKIP = new Set(['defs', 'symbol', 'clipPath', 'mask', 'pattern', 'marker', 'linearGradient', 'radialGradient', 'filter', 'metadata', 'title', 'desc', 'style', 'script', 'foreignObject']);
const NOT_GEOMETRY = new Set(['text', 'image']);
const SHAPES = new Set(['path', 'rect', 'circle', 'ellipse', 'line', 'polyline', 'polygon']);

/** The unit map: user units (y down) -> model coordinates (y up, model length unit). */
function rootMap(root: XmlElement, opts: ReadOptions): { map: Affine; unit: string; warnings: string[] } {
  const warnings: string[] = [];
  const vb = (root.attrs.get('viewBox') ?? '').trim().split(/[\s,]+/).filter(Boolean).map(Number);
  const hasViewBox = vb.length === 4 && vb.every(Number.isFinite);
  if (root.attrs.has('viewBox') && !hasViewBox) {
    throw new DrawingError(`the viewBox "${root.attrs.get('viewBox')}" of the <svg> element is not four numbers`, 'write viewBox="min-x min-y width height"');
  }
  if (hasViewBox && !(vb[2] > 0 && vb[3] > 0)) throw new DrawingError(`the viewBox "${root.attrs.get('viewBox')}" has no area`, 'give it a positive width and height');
  const w = parseLength(root.attrs.get('width'));
  const h = parseLength(root.attrs.get('height'));
  let sx: number; // metres per user unit, in x and y
  let sy: number;
  let unit: string;
  if (opts.unit) {
    sx = sy = DRAWING_UNIT_METRES[opts.unit];
    unit = `${opts.unit} (from the model's "unit")`;
  } else {
    for (const [name, l] of [
      ['width', w],
      ['height', h],
    ] as const) {
      if (!l) continue;
      if (!Number.isFinite(l.value) || (l.unit !== '' && !(l.unit in ABSOLUTE_CSS) && l.unit !== '%' && l.unit !== 'em' && l.unit !== 'ex')) {
        throw new DrawingError(
          `the SVG ${name} "${root.attrs.get(name)}" has a unit raiser does not know`,
          `the units of an SVG length are px, pt, pc, mm, cm, in and Q; or say what one drawing unit is with "unit" in the model (for example "unit": "mm")`,
        );
      }
      if (l.unit === '%' || l.unit === 'em' || l.unit === 'ex') {
        throw new DrawingError(
          `the SVG ${name} "${root.attrs.get(name)}" is relative (${l.unit}), so the drawing has no physical size`,
          'say what one drawing unit is with "unit" in the model (for example "unit": "mm"), or give the <svg> element a width in mm or in',
        );
      }
    }
    const metres = (l: { value: number; unit: string }) => l.value * ABSOLUTE_CSS[l.unit === '' ? 'px' : l.unit];
    if (hasViewBox && (w || h)) {
      const fx = w ? metres(w) / vb[2] : undefined;
      const fy = h ? metres(h) / vb[3] : undefined;
      const par = (root.attrs.get('preserveAspectRatio') ?? '').trim();
      if (par.startsWith('none') && fx !== undefined && fy !== undefined) {
        sx = fx;
        sy = fy;
      } else {
        // "meet" (the default): the viewBox is scaled uniformly to fit inside width x height.
        sx = sy = Math.min(fx ?? Infinity, fy ?? Infinity);
      }
      const physical = (w && w.unit !== '' && w.unit !== 'px') || (h && h.unit !== '' && h.unit !== 'px');
      unit = physical ? `${fmt(sx * 1000)} mm per user unit (from the width and height over the viewBox)` : `${fmt(sx / DRAWING_UNIT_METRES.px)} px per user unit (width and height in px over the viewBox; 1 px = 1/96 in)`;
      if (!physical) warnings.push(`${opts.file} gives its size in px, not in a physical unit; 1 px is taken as 1/96 in by the SVG rules`);
    } else {
      sx = sy = DRAWING_UNIT_METRES.px;
      unit = 'px = 1/96 in (SVG rules: user units are px without a viewBox)';
      warnings.push(`${opts.file} gives no physical size, so its user units are px = 1/96 in by the SVG rules`);
    }
    if (!(sx > 0 && sy > 0 && Number.isFinite(sx) && Number.isFinite(sy))) throw new DrawingError('the SVG width or height is zero', 'give the <svg> element a positive width and height, or give "unit" in the model');
  }
  // Origin at the bottom-left of the viewBox (or canvas), y up.
  let x0 = 0;
  let yBottom = 0;
  if (hasViewBox) {
    x0 = vb[0];
    yBottom = vb[1] + vb[3];
  } else if (h && Number.isFinite(h.value) && (h.unit === '' || h.unit === 'px')) {
    yBottom = h.value;
  } else if (h && Number.isFinite(h.value) && h.unit in ABSOLUTE_CSS) {
    yBottom = (h.value * ABSOLUTE_CSS[h.unit]) / DRAWING_UNIT_METRES.px;
  }
  const k = opts.scale / opts.modelUnitMetres;
  const map = compose(scaling(sx * k, -sy * k), translation(-x0, -yBottom));
  return { map, unit, warnings };
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

/** Reads an SVG document into pieces in model coordinates. */
export function readSvg(text: string, opts: ReadOptions): ReadDrawing {
  const root = parseXml(text);
  if (root.local !== 'svg') throw new DrawingError(`the file's root element is <${root.local}>, not <svg>`, 'give an SVG drawing');
  const { map, unit, warnings } = rootMap(root, opts);
  const notes: string[] = [];
  const pieces: Piece[] = [];
  const keysSeen = new Set<string>();
  const byId = new Map<string, XmlElement>();
  // An explicit stack: the tree may be as deep as MAX_XML_DEPTH.
  for (const todo = [root]; todo.length; ) {
    const el = todo.pop()!;
    const id = el.attrs.get('id');
    if (id && !byId.has(id)) byId.set(id, el);
    for (let k = el.children.length - 1; k >= 0; k--) todo.push(el.children[k]);
  }
  const ignore = new Set(opts.ignore);
  const skipped = new Map<string, number>();
  const note = (what: string) => skipped.set(what, (skipped.get(what) ?? 0) + 1);
  const budget = new ExpansionBudget('elements', 'that a <use> makes');

  const walk = (el: XmlElement, ctm: Affine, inherited: string[], depth: number, isRoot: boolean) => {
    if (el.uri !== SVG_NS && el.uri !== '') return; // editor data (Inkscape's namedview and the like)
    budget.chargeItem(() => describe(el));
    if (depth > 64) throw new DrawingError(`${describe(el)}: elements nested more than 64 deep (a <use> that refers to itself?)`, 'remove the loop of references');
    if (SKIP.has(el.local)) return;
    if (hidden(el)) {
      note('hidden elements');
      return;
    }
    const own = isRoot ? [] : ownKeys(el);
    for (const k of own) keysSeen.add(k);
    const keys = [...inherited, ...own];
    if (keys.some((k) => ignore.has(k))) {
      note('elements left out by "ignore"');
      return;
    }
    if (NOT_GEOMETRY.has(el.local)) {
      note(`<${el.local}> elements (not geometry)`);
      return;
    }
    const m = isRoot ? ctm : compose(ctm, transformOf(el));
    if (el.local === 'svg' && !isRoot) {
      throw new DrawingError(`${describe(el)}: a nested <svg> element is not supported`, 'ungroup it in the drawing program, or put its content in a <g>');
    }
    if (el.local === 'svg' || el.local === 'g' || el.local === 'a' || el.local === 'switch') {
      for (const c of el.children) walk(c, m, keys, depth + 1, false);
      return;
    }
    if (el.local === 'use') {
      const href = el.attrs.get('href') ?? el.xlinkHref ?? '';
      const target = href.startsWith('#') ? byId.get(href.slice(1)) : undefined;
      if (!target) throw new DrawingError(`${describe(el)}: it refers to "${href}", which is not an element of this drawing`, 'point href at the id of an element in the same file');
      const placed = compose(m, translation(num(el, 'x'), num(el, 'y')));
      if (target.local === 'symbol') {
        if (target.attrs.has('viewBox')) throw new DrawingError(`${describe(el)}: a <symbol> with its own viewBox is not supported`, 'unlink the clone in the drawing program (convert it to plain shapes)');
        for (const c of target.children) walk(c, placed, keys, depth + 1, false);
      } else {
        walk(target, placed, keys, depth + 1, false);
      }
      return;
    }
    if (!SHAPES.has(el.local)) {
      throw new DrawingError(`${describe(el)}: <${el.local}> elements are not supported`, `draw the profile with path, rect, circle, ellipse, line, polyline and polygon, or leave this element out with "ignore"`);
    }
    const local = shapePieces(el);
    budget.chargeCurves(local.reduce((k, lp) => k + lp.curves.length, 0), () => describe(el));
    for (const lp of local) {
      const curves: DrawnCurve[] = [];
      for (const c of lp.curves) {
        const mc = mapCurve(c, m);
        if (!mc) throw new DrawingError(`${describe(el)}: its transform flattens an arc to a line`, 'check the transform (a scale of 0?)');
        curves.push({ curve: mc, tags: [...new Set(keys)], origin: describe(el) });
      }
      if (curves.length === 0) continue;
      const id = el.attrs.get('id');
      pieces.push({ curves, closed: lp.closed, origin: describe(el), keys: [...new Set(keys)], name: id });
    }
    if (local.length === 0) note('empty shapes (zero size)');
  };
  walk(root, map, [], 0, true);
  for (const [what, n] of skipped) notes.push(`${what} skipped: ${n}`);
  return { pieces, unit, notes, warnings, keys: [...keysSeen] };
}

interface LocalPiece {
  curves: Curve[];
  closed: boolean;
}

function line(x0: number, y0: number, x1: number, y1: number): Curve {
  return { kind: 'line', x0, y0, x1, y1 };
}

/** An axis-aligned elliptical arc in user space: centre, radii, start angle and sweep (radians). */
function conic(cx: number, cy: number, rx: number, ry: number, t0: number, sweep: number): Curve {
  return rx === ry ? { kind: 'arc', cx, cy, r: rx, a0: t0, sweep } : { kind: 'ellipse', cx, cy, a: rx, b: ry, rot: 0, t0, sweep };
}

/** The curves of one shape element, in its own user space. */
function shapePieces(el: XmlElement): LocalPiece[] {
  switch (el.local) {
    case 'line': {
      const x1 = num(el, 'x1');
      const y1 = num(el, 'y1');
      const x2 = num(el, 'x2');
      const y2 = num(el, 'y2');
      return x1 === x2 && y1 === y2 ? [] : [{ curves: [line(x1, y1, x2, y2)], closed: false }];
    }
    case 'polyline':
    case 'polygon': {
      const v = (el.attrs.get('points') ?? '').trim().split(/[\s,]+/).filter(Boolean).map(Number);
      if (v.length % 2 !== 0 || !v.every(Number.isFinite)) throw new DrawingError(`${describe(el)}: its points are not pairs of numbers`, 'write points="x1,y1 x2,y2 ..."');
      const curves: Curve[] = [];
      for (let i = 0; i + 3 < v.length; i += 2) if (v[i] !== v[i + 2] || v[i + 1] !== v[i + 3]) curves.push(line(v[i], v[i + 1], v[i + 2], v[i + 3]));
      const closed = el.local === 'polygon';
      if (closed && v.length >= 4) {
        const n = v.length;
        if (v[n - 2] !== v[0] || v[n - 1] !== v[1]) curves.push(line(v[n - 2], v[n - 1], v[0], v[1]));
      }
      return curves.length ? [{ curves, closed }] : [];
    }
    case 'circle': {
      const r = num(el, 'r');
      if (r < 0) throw new DrawingError(`${describe(el)}: a negative radius`, 'give r > 0');
      return r === 0 ? [] : [{ curves: [conic(num(el, 'cx'), num(el, 'cy'), r, r, 0, 2 * Math.PI)], closed: true }];
    }
    case 'ellipse': {
      const rx = num(el, 'rx');
      const ry = num(el, 'ry');
      if (rx < 0 || ry < 0) throw new DrawingError(`${describe(el)}: a negative radius`, 'give rx and ry > 0');
      return rx === 0 || ry === 0 ? [] : [{ curves: [conic(num(el, 'cx'), num(el, 'cy'), rx, ry, 0, 2 * Math.PI)], closed: true }];
    }
    case 'rect':
      return rectPieces(el);
    case 'path':
      return pathPieces(el);
  }
  return [];
}

/** A rectangle, its corners rounded by rx, ry as SVG 2 says (one given: the other equals it; each at most half the side). */
function rectPieces(el: XmlElement): LocalPiece[] {
  const x = num(el, 'x');
  const y = num(el, 'y');
  const w = num(el, 'width');
  const h = num(el, 'height');
  if (w < 0 || h < 0) throw new DrawingError(`${describe(el)}: a negative width or height`, 'give width and height > 0');
  if (w === 0 || h === 0) return [];
  const rxAttr = el.attrs.has('rx') && el.attrs.get('rx') !== 'auto' ? num(el, 'rx') : undefined;
  const ryAttr = el.attrs.has('ry') && el.attrs.get('ry') !== 'auto' ? num(el, 'ry') : undefined;
  let rx = Math.max(0, rxAttr ?? ryAttr ?? 0);
  let ry = Math.max(0, ryAttr ?? rxAttr ?? 0);
  rx = Math.min(rx, w / 2);
  ry = Math.min(ry, h / 2);
  const c: Curve[] = [];
  const seg = (x0: number, y0: number, x1: number, y1: number) => {
    if (x0 !== x1 || y0 !== y1) c.push(line(x0, y0, x1, y1));
  };
  const round = rx > 0 && ry > 0;
  const H = Math.PI / 2;
  // Clockwise on the screen (y down), from the top-left corner's end along the top edge.
  seg(x + (round ? rx : 0), y, x + w - (round ? rx : 0), y);
  if (round) c.push(conic(x + w - rx, y + ry, rx, ry, -H, H));
  seg(x + w, y + (round ? ry : 0), x + w, y + h - (round ? ry : 0));
  if (round) c.push(conic(x + w - rx, y + h - ry, rx, ry, 0, H));
  seg(x + w - (round ? rx : 0), y + h, x + (round ? rx : 0), y + h);
  if (round) c.push(conic(x + rx, y + h - ry, rx, ry, H, H));
  seg(x, y + h - (round ? ry : 0), x, y + (round ? ry : 0));
  if (round) c.push(conic(x + rx, y + ry, rx, ry, Math.PI, H));
  return [{ curves: c, closed: true }];
}

/**
 * The subpaths of a path element. svgpath parses the data and writes it in absolute
 * coordinates with the smooth forms (S, T) expanded; arcs are converted here from SVG's end
 * point form to centre form (SVG 1.1 Appendix F.6.5, with the radius scaling of F.6.6 [M]).
 */
function pathPieces(el: XmlElement): LocalPiece[] {
  const d = el.attrs.get('d') ?? '';
  const parsed = svgpath(d);
  const err = (parsed as unknown as { err: string }).err;
  if (err) throw new DrawingError(`${describe(el)}: its path data cannot be read (${err.replace(/^SvgPath: /, '')})`, 'check the d attribute, or save the drawing again from the drawing program');
  const out: LocalPiece[] = [];
  let cur: Curve[] = [];
  let x = 0;
  let y = 0;
  let sx = 0;
  let sy = 0;
  const flush = (closed: boolean) => {
    if (cur.length) out.push({ curves: cur, closed });
    cur = [];
  };
  const lineTo = (nx: number, ny: number) => {
    if (nx !== x || ny !== y) cur.push(line(x, y, nx, ny));
    x = nx;
    y = ny;
  };
  parsed
    .abs()
    .unshort()
    .iterate((s) => {
      const a = s as unknown as [string, ...number[]];
      switch (a[0]) {
        case 'M':
          flush(false);
          x = sx = a[1];
          y = sy = a[2];
          break;
        case 'L':
          lineTo(a[1], a[2]);
          break;
        case 'H':
          lineTo(a[1], y);
          break;
        case 'V':
          lineTo(x, a[1]);
          break;
        case 'C':
          if (!(a[5] === x && a[6] === y && a[1] === x && a[2] === y && a[3] === x && a[4] === y)) cur.push(bezier([x, y, a[1], a[2], a[3], a[4], a[5], a[6]]));
          x = a[5];
          y = a[6];
          break;
        case 'Q':
          if (!(a[3] === x && a[4] === y && a[1] === x && a[2] === y)) cur.push(bezier([x, y, a[1], a[2], a[3], a[4]]));
          x = a[3];
          y = a[4];
          break;
        case 'A': {
          const c = endpointArc(x, y, a[1], a[2], a[3], a[4] !== 0, a[5] !== 0, a[6], a[7]);
          if (c) cur.push(c);
          x = a[6];
          y = a[7];
          break;
        }
        case 'Z':
        case 'z':
          lineTo(sx, sy);
          flush(true);
          x = sx;
          y = sy;
          break;
      }
    });
  flush(false);
  return out;
}

function bezier(p: number[]): Curve {
  // A curve whose control points all lie on the chord, in order, is a straight segment.
  const n = p.length / 2 - 1;
  const ex = p[2 * n] - p[0];
  const ey = p[2 * n + 1] - p[1];
  const l2 = ex * ex + ey * ey;
  let straight = l2 > 0;
  for (let i = 1; i < n && straight; i++) {
    const dx = p[2 * i] - p[0];
    const dy = p[2 * i + 1] - p[1];
    const along = (dx * ex + dy * ey) / l2;
    straight = Math.abs(dx * ey - dy * ex) <= 1e-12 * l2 && along >= 0 && along <= 1;
  }
  return straight ? line(p[0], p[1], p[2 * n], p[2 * n + 1]) : { kind: 'bezier', p };
}

/** SVG's arc from (x1, y1) to (x2, y2); null when the ends coincide (the arc is omitted). */
function endpointArc(x1: number, y1: number, rx: number, ry: number, phiDeg: number, large: boolean, sweepFlag: boolean, x2: number, y2: number): Curve | null {
  if (x1 === x2 && y1 === y2) return null;
  rx = Math.abs(rx);
  ry = Math.abs(ry);
  if (rx === 0 || ry === 0) return line(x1, y1, x2, y2);
  const phi = (phiDeg * Math.PI) / 180;
  const cp = Math.cos(phi);
  const sp = Math.sin(phi);
  const dx = (x1 - x2) / 2;
  const dy = (y1 - y2) / 2;
  const x1p = cp * dx + sp * dy;
  const y1p = -sp * dx + cp * dy;
  const lambda = (x1p * x1p) / (rx * rx) + (y1p * y1p) / (ry * ry);
  if (lambda > 1) {
    const s = Math.sqrt(lambda);
    rx *= s;
    ry *= s;
  }
  const num2 = rx * rx * ry * ry - rx * rx * y1p * y1p - ry * ry * x1p * x1p;
  const den = rx * rx * y1p * y1p + ry * ry * x1p * x1p;
  let coef = Math.sqrt(Math.max(0, num2 / den));
  if (large === sweepFlag) coef = -coef;
  const cxp = (coef * rx * y1p) / ry;
  const cyp = (-coef * ry * x1p) / rx;
  const cx = cp * cxp - sp * cyp + (x1 + x2) / 2;
  const cy = sp * cxp + cp * cyp + (y1 + y2) / 2;
  const ang = (ux: number, uy: number, vx: number, vy: number) => Math.atan2(ux * vy - uy * vx, ux * vx + uy * vy);
  const t1 = ang(1, 0, (x1p - cxp) / rx, (y1p - cyp) / ry);
  let dt = ang((x1p - cxp) / rx, (y1p - cyp) / ry, (-x1p - cxp) / rx, (-y1p - cyp) / ry);
  if (!sweepFlag && dt > 0) dt -= 2 * Math.PI;
  else if (sweepFlag && dt < 0) dt += 2 * Math.PI;
  // p(t) = c + R(phi) (rx cos t, ry sin t): u = rx (cos phi, sin phi), v = ry (-sin phi, cos phi).
  if (rx === ry && phi === 0) return { kind: 'arc', cx, cy, r: rx, a0: t1, sweep: dt };
  return rx === ry ? { kind: 'arc', cx, cy, r: rx, a0: t1 + phi, sweep: dt } : { kind: 'ellipse', cx, cy, a: rx, b: ry, rot: phi, t0: t1, sweep: dt };
}
