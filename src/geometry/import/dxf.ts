/**
 * Reading the profile of a plate from a DXF drawing (the ASCII form of the common 2D CAD
 * exchange format).
 *
 * dxf-parser reads the file: header, layer table, blocks and the entities LINE, ARC,
 * LWPOLYLINE, POLYLINE and INSERT. Three entities are read here instead, through the library's
 * own entity-handler interface, because the library drops fields that change the shape: SPLINE
 * (its weights, group code 41), CIRCLE and ELLIPSE (their extrusion direction, which mirrors a
 * circle drawn in a flipped coordinate system). Every other entity type in the file also gets a
 * handler that only records it, so that nothing is dropped unseen: annotation (text, dimensions,
 * hatching, points) is skipped and counted, anything else is named in an error.
 *
 * Geometry: ARC, CIRCLE and polyline bulges become circular arcs, ELLIPSE elliptical arcs,
 * SPLINE exact (rational) Bezier pieces by knot insertion (W. Boehm, "Inserting new knots
 * into B-spline curves", Computer-Aided Design 12(4), 1980 [M]), INSERT the entities of its
 * block, mapped by the insert's position, scale, rotation and column/row array. ARC, CIRCLE and
 * polylines are given in their object coordinate system; for the extrusion direction (0, 0, -1)
 * that is the drawing plane seen from below, x mirrored (the "arbitrary axis algorithm" of the
 * DXF reference [M]). Entities that do not lie in the drawing plane are refused.
 */
import { createRequire } from 'node:module';
import type { DxfParser as DxfParserClass } from 'dxf-parser';
import type { Curve } from '../curve.js';
import { type Affine, IDENTITY, compose, mapCurve, rotation, scaling, translation } from './affine.js';
import { ExpansionBudget, MAX_ARRAY_COPIES, MAX_EXPANDED_ITEMS, MAX_SPLINE_DEGREE, MAX_SPLINE_POINTS, MAX_SPLINE_WORK, ccwSweep, usableAngle } from './limits.js';
import { DRAWING_UNIT_METRES, DrawingError, type DrawnCurve, type Piece, type ReadDrawing, type ReadOptions } from './types.js';

/**
 * The parser class, loaded when a DXF file is first read (not at start-up). The package's main
 * file is a CommonJS bundle whose export is the parser class itself, while its type declarations
 * describe an ES module with the class as its default export.
 */
const loadDxfParser = (): typeof DxfParserClass => createRequire(import.meta.url)('dxf-parser') as typeof DxfParserClass;

/** $INSUNITS codes that are lengths a plate is drawn in, as metres (DXF reference, HEADER section [M]). */
const INSUNITS: Record<number, [string, number]> = {
  1: ['in', 0.0254],
  2: ['ft', 0.3048],
  4: ['mm', 0.001],
  5: ['cm', 0.01],
  6: ['m', 1],
  8: ['microinch', 0.0254e-6],
  9: ['mil', 0.0254e-3],
  10: ['yd', 0.9144],
  13: ['um', 1e-6],
  14: ['dm', 0.1],
  21: ['US survey ft', 1200 / 3937],
};
const INSUNITS_OTHER: Record<number, string> = {
  3: 'miles',
  7: 'kilometres',
  11: 'angstroms',
  12: 'nanometres',
  15: 'decametres',
  16: 'hectometres',
  17: 'gigametres',
  18: 'astronomical units',
  19: 'light years',
  20: 'parsecs',
};

/** Entities that are not part of a profile: skipped and counted. */
const ANNOTATION = new Set(['TEXT', 'MTEXT', 'DIMENSION', 'LEADER', 'MLEADER', 'MULTILEADER', 'HATCH', 'POINT', 'ATTDEF', 'ATTRIB', 'VIEWPORT', 'IMAGE', 'WIPEOUT', 'TOLERANCE', 'ACAD_TABLE', 'OLE2FRAME', 'OLEFRAME']);
/** dxf-parser's own handlers that are used as they are. */
const LIBRARY = new Set(['LINE', 'ARC', 'LWPOLYLINE', 'POLYLINE', 'INSERT', 'TEXT', 'MTEXT', 'DIMENSION', 'POINT', 'ATTDEF', 'SOLID', '3DFACE']);
/** Names after group code 0 that are not entities. */
const STRUCTURE = new Set(['SECTION', 'ENDSEC', 'TABLE', 'ENDTAB', 'BLOCK', 'ENDBLK', 'EOF', 'SEQEND', 'VERTEX']);

interface RawEntity {
  type: string;
  handle?: string;
  layer?: string;
  groups: [number, unknown][];
  inPaperSpace?: boolean;
}

/** A handler in dxf-parser's interface that keeps every group of the entity. */
function rawHandler(name: string) {
  return class {
    ForEntityName = name;
    parseEntity(scanner: { next(): { code: number; value: unknown }; isEOF(): boolean }, curr: { code: number; value: unknown }): RawEntity {
      const e: RawEntity = { type: String(curr.value), groups: [] };
      curr = scanner.next();
      while (!scanner.isEOF()) {
        if (curr.code === 0) break;
        e.groups.push([curr.code, curr.value]);
        if (curr.code === 5) e.handle = String(curr.value);
        if (curr.code === 8) e.layer = String(curr.value);
        if (curr.code === 67) e.inPaperSpace = curr.value !== 0;
        curr = scanner.next();
      }
      return e;
    }
  };
}

/**
 * The names that follow group code 0 anywhere in the file (entity types among them), and how
 * many records there are: one pass over the text without splitting it, so a large file is
 * counted, and refused when it holds too many records, before the parser builds an object for
 * each (60 MB of LINEs took 2.3 GB there).
 */
function zeroNames(text: string): { names: Set<string>; records: number } {
  const names = new Set<string>();
  let records = 0;
  const n = text.length;
  let pos = 0;
  let even = true; // group code lines and value lines alternate
  let code = '';
  while (pos < n) {
    let end = text.indexOf('\n', pos);
    if (end < 0) end = n;
    let line = text.slice(pos, end);
    if (line.endsWith('\r')) line = line.slice(0, -1);
    if (even) code = line.trim();
    else if (code === '0') {
      records++;
      if (names.size < 10_000) names.add(line.trim());
    }
    even = !even;
    pos = end + 1;
  }
  return { names, records };
}

interface Entity {
  type: string;
  handle?: string;
  layer?: string;
  inPaperSpace?: boolean;
  [k: string]: unknown;
}

interface Point {
  x: number;
  y: number;
  z?: number;
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

/** Reads a DXF document into pieces in model coordinates. */
export function readDxf(text: string, opts: ReadOptions): ReadDrawing {
  if (text.startsWith('AutoCAD Binary DXF')) throw new DrawingError('this is a binary DXF file', 'save the drawing as ASCII DXF');
  const { names, records } = zeroNames(text);
  if (records > MAX_EXPANDED_ITEMS) {
    throw new DrawingError(
      `the drawing holds ${records.toLocaleString('en-US')} records (entities and table entries), more than the ${MAX_EXPANDED_ITEMS.toLocaleString('en-US')} raiser reads`,
      'a plate profile needs far fewer: export only the part (without title block, hatching and other parts), or simplify it',
    );
  }
  const parser = new (loadDxfParser())();
  for (const name of names) {
    if (STRUCTURE.has(name) || LIBRARY.has(name) || !/^[A-Z0-9_]+$/i.test(name)) continue;
    parser.registerEntityHandler(rawHandler(name) as never);
  }
  let dxf;
  try {
    dxf = parser.parseSync(text);
  } catch (e) {
    throw new DrawingError(`the DXF file cannot be read: ${(e as Error).message}`, 'save the drawing again as ASCII DXF from the CAD program');
  }
  if (!dxf) throw new DrawingError('the DXF file cannot be read', 'save the drawing again as ASCII DXF from the CAD program');

  const warnings: string[] = [];
  const notes: string[] = [];
  // Units.
  let unitMetres: number;
  let unit: string;
  const code = Number((dxf.header as Record<string, unknown> | undefined)?.['$INSUNITS'] ?? 0);
  if (opts.unit) {
    unitMetres = DRAWING_UNIT_METRES[opts.unit];
    unit = `${opts.unit} (from the model's "unit")`;
  } else if (code === 0) {
    unitMetres = opts.modelUnitMetres;
    unit = `${opts.modelUnitName}, the model's length unit (the drawing declares no unit)`;
    warnings.push(`${opts.file} declares no unit ($INSUNITS is 0 or missing), so its coordinates are taken in ${opts.modelUnitName}, the model's length unit; give "unit" to say otherwise`);
  } else if (INSUNITS[code]) {
    [unit, unitMetres] = INSUNITS[code];
    unit = `${unit} (from $INSUNITS ${code})`;
  } else {
    const what = INSUNITS_OTHER[code];
    throw new DrawingError(
      `the drawing's unit ($INSUNITS ${code}${what ? `, ${what}` : ''}) is ${what ? 'not a unit raiser reads plates in' : 'not a known unit code'}`,
      'say what one drawing unit is with "unit" in the model (for example "unit": "mm")',
    );
  }
  const k = (unitMetres * opts.scale) / opts.modelUnitMetres;
  const toModel: Affine = scaling(k, k);

  const layers = ((dxf.tables as { layer?: { layers?: Record<string, { visible?: boolean; frozen?: boolean }> } } | undefined)?.layer?.layers ?? {}) as Record<string, { visible?: boolean; frozen?: boolean }>;
  const ignore = new Set(opts.ignore);
  const keysSeen = new Set<string>(Object.keys(layers).filter((l) => l !== 'undefined'));
  const pieces: Piece[] = [];
  const skipped = new Map<string, number>();
  const count = (what: string) => skipped.set(what, (skipped.get(what) ?? 0) + 1);
  const unsupported: string[] = [];
  const blocks = (dxf.blocks ?? {}) as unknown as Record<string, { entities?: Entity[]; position?: Point }>;

  const describe = (e: Entity, layer: string, via: string) => `${e.type} on layer "${layer}"${e.handle !== undefined ? `, handle ${e.handle}` : ''}${via}`;
  const budget = new ExpansionBudget('entities', 'that a block INSERT makes');

  const visit = (e: Entity, map: Affine, parentLayer: string | undefined, via: string, depth: number) => {
    budget.chargeItem(() => describe(e, e.layer ?? '0', via));
    if (e.inPaperSpace) {
      count('paper-space entities');
      return;
    }
    // Entities of a block on layer 0 take the layer of the insert.
    const layer = e.layer === undefined || (e.layer === '0' && parentLayer !== undefined) ? (parentLayer ?? '0') : e.layer;
    keysSeen.add(layer);
    if (ignore.has(layer)) {
      count(`entities on layers left out by "ignore"`);
      return;
    }
    const info = layers[layer];
    if (info && (info.visible === false || info.frozen)) {
      count(`entities on layers that are off or frozen`);
      return;
    }
    if (ANNOTATION.has(e.type)) {
      count(`${e.type} (annotation)`);
      return;
    }
    const origin = describe(e, layer, via);
    if (e.type === 'INSERT') {
      if (depth > 16) throw new DrawingError(`${origin}: blocks nested more than 16 deep (a block that inserts itself?)`, 'explode the block in the CAD program');
      const name = String(e.name ?? '');
      const block = blocks[name];
      if (!block) throw new DrawingError(`${origin}: it inserts the block "${name}", which the file does not define`, 'explode the block in the CAD program, or save the drawing again');
      const ext = e.extrusionDirection as Point | undefined;
      const ocs = ocsMap(ext?.x, ext?.y, ext?.z, origin);
      const pos = (e.position as Point | undefined) ?? { x: 0, y: 0 };
      const base = block.position ?? { x: 0, y: 0 };
      const sx = Number(e.xScale ?? 1);
      const sy = Number(e.yScale ?? 1);
      const rotDeg = Number(e.rotation ?? 0);
      const rot = (rotDeg * Math.PI) / 180;
      const cols = Math.max(1, Number(e.columnCount ?? 1));
      const rows = Math.max(1, Number(e.rowCount ?? 1));
      const numbers = { 'position x': pos.x, 'position y': pos.y, 'x scale': sx, 'y scale': sy, 'column spacing': Number(e.columnSpacing ?? 0), 'row spacing': Number(e.rowSpacing ?? 0) };
      for (const [what, v] of Object.entries(numbers)) {
        if (!Number.isFinite(v)) throw new DrawingError(`${origin}: its ${what} is ${String(v)}, not a finite number`, 'correct or explode the insert in the CAD program, and save the drawing again');
      }
      if (!usableAngle(rotDeg)) throw new DrawingError(`${origin}: its rotation ${String(rotDeg)} is not a usable angle`, 'give the rotation in degrees, between -360 and 360');
      if (!Number.isInteger(cols) || !Number.isInteger(rows) || cols * rows > MAX_ARRAY_COPIES) {
        throw new DrawingError(
          `${origin}: an array of ${String(cols)} columns x ${String(rows)} rows, ${cols * rows > MAX_ARRAY_COPIES ? `more than the ${MAX_ARRAY_COPIES.toLocaleString('en-US')} copies one insert may make` : 'not whole numbers'}`,
          'a plate profile needs far fewer copies: explode the array in the CAD program, or correct its counts',
        );
      }
      // Only the innermost insert is named (a chain of names would grow with the depth for every copy).
      const inner = ` in block "${name}" inserted by ${describe(e, layer, '')}${depth > 0 ? ` (${depth} insert${depth === 1 ? '' : 's'} deep)` : ''}`;
      for (let i = 0; i < cols; i++) {
        for (let j = 0; j < rows; j++) {
          // Array copies are spaced along the insert's rotated axes.
          const offset = compose(rotation(rot), translation(i * Number(e.columnSpacing ?? 0), j * Number(e.rowSpacing ?? 0)));
          const place = compose(ocs, compose(translation(pos.x, pos.y), compose(offset, compose(scaling(sx, sy), translation(-base.x, -base.y)))));
          for (const sub of block.entities ?? []) visit(sub, compose(map, place), layer, inner, depth + 1);
        }
      }
      return;
    }
    const local = entityCurves(e, origin);
    if (local === 'unsupported') {
      unsupported.push(origin);
      return;
    }
    if (local.curves.length === 0) {
      count('entities of zero size');
      return;
    }
    budget.chargeCurves(local.curves.length, () => origin);
    const curves: DrawnCurve[] = [];
    for (const c of local.curves) {
      const mc = mapCurve(c, compose(map, local.ocs));
      if (!mc) throw new DrawingError(`${origin}: an arc is flattened to a line by its insert's scale`, 'check the scale of the block insert');
      curves.push({ curve: mc, tags: [layer], origin });
    }
    pieces.push({ curves, closed: local.closed, origin, keys: [layer] });
  };
  for (const e of (dxf.entities ?? []) as unknown as Entity[]) visit(e, toModel, undefined, '', 0);
  if (unsupported.length) {
    const byType = new Map<string, string[]>();
    for (const u of unsupported) {
      const t = u.split(' ')[0];
      byType.set(t, [...(byType.get(t) ?? []), u]);
    }
    const list = [...byType.entries()].map(([t, us]) => `${us.length} ${t} (${us.slice(0, 3).map((u) => u.slice(t.length + 1)).join('; ')}${us.length > 3 ? '; ...' : ''})`);
    throw new DrawingError(
      `the drawing has entities raiser cannot import: ${list.join(', ')}`,
      'raiser reads LINE, ARC, CIRCLE, ELLIPSE, LWPOLYLINE, POLYLINE, SPLINE and block INSERTs: explode the others into those in the CAD program, or leave their layers out with "ignore"',
    );
  }
  for (const [what, n] of skipped) notes.push(`${what} skipped: ${n}`);
  return { pieces, unit, notes, warnings, keys: [...keysSeen] };
}

/** The map from an entity's object coordinate system to the drawing plane. */
function ocsMap(nx: number | undefined, ny: number | undefined, nz: number | undefined, origin: string): Affine {
  if (nx === undefined && ny === undefined && nz === undefined) return IDENTITY;
  const x = nx ?? 0;
  const y = ny ?? 0;
  const z = nz ?? 1;
  const l = Math.hypot(x, y, z);
  if (Math.abs(x) > 1e-9 * l || Math.abs(y) > 1e-9 * l) {
    throw new DrawingError(`${origin} does not lie in the drawing plane (its extrusion direction is (${fmt(x)}, ${fmt(y)}, ${fmt(z)}))`, 'a plate profile is drawn in the XY plane; flatten the drawing in the CAD program');
  }
  return z > 0 ? IDENTITY : [-1, 0, 0, 1, 0, 0];
}

function badAngle(origin: string, what: string, a: number, b: number): DrawingError {
  return new DrawingError(`${origin}: its ${what} (${fmt(a)}, ${fmt(b)}) are not usable: an angle must be a finite number within a few turns`, 'correct the entity in the CAD program (angles between -360 and 360 degrees) and save the drawing again');
}

function groupNumbers(e: RawEntity, code: number): number[] {
  return e.groups.filter((g) => g[0] === code).map((g) => Number(g[1]));
}

function groupNumber(e: RawEntity, code: number, fallback?: number): number | undefined {
  const g = e.groups.find((x) => x[0] === code);
  return g ? Number(g[1]) : fallback;
}

/** The arc of a polyline segment from p to q with the given bulge (tan of a quarter of the included angle, positive counter-clockwise). */
function bulgeSegment(px: number, py: number, qx: number, qy: number, bulge: number): Curve {
  if (!bulge) return { kind: 'line', x0: px, y0: py, x1: qx, y1: qy };
  const dx = qx - px;
  const dy = qy - py;
  const f = (1 - bulge * bulge) / (4 * bulge);
  const cx = (px + qx) / 2 - f * dy;
  const cy = (py + qy) / 2 + f * dx;
  const r = Math.hypot(px - cx, py - cy);
  return { kind: 'arc', cx, cy, r, a0: Math.atan2(py - cy, px - cx), sweep: 4 * Math.atan(bulge) };
}

function entityCurves(e: Entity, origin: string): { curves: Curve[]; closed: boolean; ocs: Affine } | 'unsupported' {
  switch (e.type) {
    case 'LINE': {
      const v = e.vertices as Point[];
      if (!v || v.length < 2) return { curves: [], closed: false, ocs: IDENTITY };
      if (v[0].x === v[1].x && v[0].y === v[1].y) return { curves: [], closed: false, ocs: IDENTITY };
      return { curves: [{ kind: 'line', x0: v[0].x, y0: v[0].y, x1: v[1].x, y1: v[1].y }], closed: false, ocs: IDENTITY };
    }
    case 'ARC': {
      const c = e.center as Point;
      const r = Number(e.radius);
      const ocs = ocsMap(e.extrusionDirectionX as number | undefined, e.extrusionDirectionY as number | undefined, e.extrusionDirectionZ as number | undefined, origin);
      if (!(r > 0)) return { curves: [], closed: false, ocs };
      const a0 = Number(e.startAngle);
      const a1 = Number(e.endAngle);
      if (!usableAngle(a0) || !usableAngle(a1)) throw badAngle(origin, 'start and end angles in degrees', (a0 * 180) / Math.PI, (a1 * 180) / Math.PI);
      const sweep = ccwSweep(a0, a1);
      return { curves: [{ kind: 'arc', cx: c.x, cy: c.y, r, a0, sweep }], closed: false, ocs };
    }
    case 'CIRCLE': {
      const raw = e as unknown as RawEntity;
      const r = groupNumber(raw, 40, 0)!;
      const ocs = ocsMap(groupNumber(raw, 210), groupNumber(raw, 220), groupNumber(raw, 230), origin);
      if (!(r > 0)) return { curves: [], closed: true, ocs };
      return { curves: [{ kind: 'arc', cx: groupNumber(raw, 10, 0)!, cy: groupNumber(raw, 20, 0)!, r, a0: 0, sweep: 2 * Math.PI }], closed: true, ocs };
    }
    case 'ELLIPSE': {
      const raw = e as unknown as RawEntity;
      const cx = groupNumber(raw, 10, 0)!;
      const cy = groupNumber(raw, 20, 0)!;
      const mx = groupNumber(raw, 11, 0)!;
      const my = groupNumber(raw, 21, 0)!;
      const ratio = groupNumber(raw, 40, 1)!;
      const t0 = groupNumber(raw, 41, 0)!;
      const t1 = groupNumber(raw, 42, 2 * Math.PI)!;
      const nz = groupNumber(raw, 230, 1)!;
      ocsMap(groupNumber(raw, 210), groupNumber(raw, 220), nz, origin);
      if (!usableAngle(t0) || !usableAngle(t1)) throw badAngle(origin, 'start and end parameters', t0, t1);
      const a = Math.hypot(mx, my);
      if (!(a > 0 && ratio > 0)) return { curves: [], closed: false, ocs: IDENTITY };
      // p(t) = c + cos t * major + sin t * minor, minor = ratio * (N x major): N = -z turns the other way.
      const sweep = Math.abs(t1 - t0 - 2 * Math.PI) < 1e-12 || (t0 === 0 && t1 === 0) ? 2 * Math.PI : ccwSweep(t0, t1);
      const whole = Math.abs(sweep - 2 * Math.PI) < 1e-12;
      const rot = Math.atan2(my, mx);
      const curve: Curve = { kind: 'ellipse', cx, cy, a, b: a * ratio, rot, t0, sweep };
      // With N = -z the minor axis is -(z x major): the same ellipse traced with t -> -t about the major axis.
      const mirrored: Curve = { kind: 'ellipse', cx, cy, a, b: a * ratio, rot, t0: -t0, sweep: -sweep };
      return { curves: [nz < 0 ? mirrored : curve], closed: whole, ocs: IDENTITY };
    }
    case 'LWPOLYLINE':
    case 'POLYLINE': {
      if (e.is3dPolyline || e.is3dPolygonMesh || e.isPolyfaceMesh) return 'unsupported';
      if (e.includesSplineFitVertices || e.includesCurveFitVertices) return 'unsupported';
      const ext = e.type === 'POLYLINE' ? (e.extrusionDirection as Point | undefined) : { x: e.extrusionDirectionX as number, y: e.extrusionDirectionY as number, z: e.extrusionDirectionZ as number };
      const ocs = ocsMap(ext?.x, ext?.y, ext?.z, origin);
      const v = (e.vertices as (Point & { bulge?: number })[]) ?? [];
      v.forEach((p, i) => {
        if (!Number.isFinite(p.x) || !Number.isFinite(p.y) || !Number.isFinite(Number(p.bulge ?? 0))) {
          throw new DrawingError(`${origin}: its vertex ${i + 1} is (${String(p.x)}, ${String(p.y)})${p.bulge !== undefined ? ` with bulge ${String(p.bulge)}` : ''}, not finite numbers`, 'correct the polyline in the CAD program and save the drawing again');
        }
      });
      const closed = !!e.shape;
      const curves: Curve[] = [];
      const n = v.length;
      for (let i = 0; i < (closed ? n : n - 1); i++) {
        const p = v[i];
        const q = v[(i + 1) % n];
        if (p.x === q.x && p.y === q.y) continue;
        curves.push(bulgeSegment(p.x, p.y, q.x, q.y, Number(p.bulge ?? 0)));
      }
      return { curves, closed, ocs };
    }
    case 'SPLINE': {
      const raw = e as unknown as RawEntity;
      return { curves: splineCurves(raw, origin), closed: false, ocs: IDENTITY };
    }
    default:
      return 'unsupported';
  }
}

/** A SPLINE entity as exact Bezier pieces (lines for degree 1). */
function splineCurves(e: RawEntity, origin: string): Curve[] {
  const p = groupNumber(e, 71, 3)!;
  const knots = groupNumbers(e, 40);
  const xs = groupNumbers(e, 10);
  const ys = groupNumbers(e, 20);
  const weights = groupNumbers(e, 41);
  if (xs.length === 0) {
    throw new DrawingError(`${origin}: a spline given by fit points only (no control points) cannot be imported`, 'in the CAD program, convert the spline to control vertices (or to a polyline of arcs) and save again');
  }
  const n = xs.length;
  // Each Bezier piece costs about degree^2 operations per control point: limits checked before the work.
  if (!Number.isInteger(p) || p < 1 || p > MAX_SPLINE_DEGREE) {
    throw new DrawingError(`${origin}: its degree ${String(p)} is ${p > MAX_SPLINE_DEGREE ? `above the highest raiser reads, ${MAX_SPLINE_DEGREE}` : 'not a whole number from 1 up'}`, 'in the CAD program, rebuild the spline at degree 3 (or convert it to a polyline of arcs) and save again');
  }
  if (n > MAX_SPLINE_POINTS || n * p * p > MAX_SPLINE_WORK) {
    throw new DrawingError(
      `${origin}: ${n} control points of degree ${p} are more than raiser reads in one spline (at most ${MAX_SPLINE_POINTS.toLocaleString('en-US')} points, and points x degree^2 at most ${MAX_SPLINE_WORK.toExponential(0)})`,
      'in the CAD program, rebuild the spline with fewer control points or a lower degree, or split it, and save again',
    );
  }
  if (ys.length !== n || knots.length !== n + p + 1) {
    throw new DrawingError(`${origin}: its degree ${p}, ${knots.length} knots and ${n} control points do not fit together (knots = control points + degree + 1)`, 'save the drawing again from the CAD program');
  }
  for (const [what, list] of [['knot', knots], ['control point x', xs], ['control point y', ys], ['weight', weights]] as const) {
    const bad = list.findIndex((v) => !Number.isFinite(v));
    if (bad >= 0) throw new DrawingError(`${origin}: its ${what} ${bad + 1} is ${String(list[bad])}, not a finite number`, 'correct the spline in the CAD program and save the drawing again');
  }
  if (weights.length && weights.length !== n) throw new DrawingError(`${origin}: ${weights.length} weights for ${n} control points`, 'save the drawing again from the CAD program');
  const rational = weights.length === n && weights.some((w) => w !== weights[0]);
  if (weights.some((w) => !(w > 0))) throw new DrawingError(`${origin}: a weight is not positive`, 'save the drawing again from the CAD program');
  const P: number[][] = [];
  for (let i = 0; i < n; i++) {
    const w = rational ? weights[i] : 1;
    P.push([xs[i] * w, ys[i] * w, w]);
  }
  const U = knots.slice();
  const span = U[U.length - 1] - U[0];
  // Knots closer than this are one knot (CAD programs write them rounded).
  for (let i = 1; i < U.length; i++) if (U[i] - U[i - 1] <= 1e-10 * span) U[i] = U[i - 1];
  for (let i = 1; i < U.length; i++) {
    if (U[i] < U[i - 1]) throw new DrawingError(`${origin}: its knots decrease`, 'save the drawing again from the CAD program');
  }
  const lo = U[p];
  const hi = U[n];
  if (!(hi > lo)) return [];
  // Each knot span [U[k], U[k+1]] of the domain is one Bezier piece. It depends only on the
  // control points k-p..k and the knots k-p..k+p+1: that local spline has its ends raised to
  // multiplicity p by knot insertion, so the work is degree^2 per span, not per whole curve.
  const out: Curve[] = [];
  for (let k = p; k < n; k++) {
    const a = U[k];
    const b = U[k + 1];
    if (!(b > a)) continue;
    let Pw = P.slice(k - p, k + 1);
    let UU = U.slice(k - p, k + p + 2);
    for (const u of [a, b]) {
      let mult = 0;
      for (const x of UU) if (x === u) mult++;
      while (mult < p) {
        [Pw, UU] = insertKnot(Pw, UU, p, u);
        mult++;
      }
    }
    // The piece is the control points of the span [a, b] of the refined local spline.
    let i = -1;
    for (let j = p; j < Pw.length; j++) if (UU[j] === a && UU[j + 1] === b) i = j;
    if (i < 0) continue;
    const pts = Pw.slice(i - p, i + 1);
    if (p === 1) {
      out.push({ kind: 'line', x0: pts[0][0] / pts[0][2], y0: pts[0][1] / pts[0][2], x1: pts[1][0] / pts[1][2], y1: pts[1][1] / pts[1][2] });
      continue;
    }
    const cp: number[] = [];
    const w: number[] = [];
    for (const q of pts) {
      cp.push(q[0] / q[2], q[1] / q[2]);
      w.push(q[2]);
    }
    out.push(rational ? { kind: 'bezier', p: cp, w } : { kind: 'bezier', p: cp });
  }
  return out.filter((c) => c.kind !== 'line' || c.x0 !== c.x1 || c.y0 !== c.y1);
}

/** One knot insertion (Boehm) of u into homogeneous control points Pw with knots U, degree p. */
function insertKnot(Pw: number[][], U: number[], p: number, u: number): [number[][], number[]] {
  const n = Pw.length - 1;
  // The span k with U[k] <= u < U[k+1] (u < U[n+1]), or U[k] < u <= U[k+1] at the right end of the domain.
  let k = -1;
  if (u < U[n + 1]) {
    for (let i = p; i <= n; i++) if (U[i] <= u) k = i;
  } else {
    for (let i = p; i <= n; i++) if (U[i] < u) k = i;
  }
  if (k < 0) return [Pw, U];
  const Q: number[][] = [];
  for (let i = 0; i <= n + 1; i++) {
    if (i <= k - p) Q.push(Pw[i].slice());
    else if (i >= k + 1) Q.push(Pw[i - 1].slice());
    else {
      const a = (u - U[i]) / (U[i + p] - U[i]);
      Q.push([0, 1, 2].map((c) => a * Pw[i][c] + (1 - a) * Pw[i - 1][c]));
    }
  }
  const V = [...U.slice(0, k + 1), u, ...U.slice(k + 1)];
  return [Q, V];
}
