/**
 * Plate geometry from a drawing: `"geometry": { "from": "part.svg" }` or `"part.dxf"`.
 *
 * The reader of the format (svg.ts, dxf.ts) turns the drawing into pieces of exact curves in
 * model coordinates; join.ts closes loose pieces into loops; here the loops are checked and
 * sorted: the outline is the largest closed loop (or the largest of those with the layer, id or
 * class named by `outline`), the loops inside it are the holes, loops outside it are left out
 * (and said so), a loop inside a hole, loops that cross and loops that cross themselves are
 * errors. Bezier curves are split where they change their direction of bending, so each piece
 * is convex or concave throughout, as the mesher's size field assumes.
 *
 * The result is plain data (ImportedDrawing), handed on explicitly: readModelDrawing reads the
 * drawing a loaded model names, the loader (src/pipeline/load.ts) returns it beside the model,
 * and buildDomain takes it as an argument to turn it into an ordinary Domain. Nothing is
 * attached to the model, so the model stays the plain data of its file.
 */
import { realpathSync } from 'node:fs';
import { dirname, extname, isAbsolute, relative, resolve, sep } from 'node:path';
import { ModelError } from '../../model/errors.js';
import { formatBytes, readRegularFile } from '../../model/read-file.js';
import { NUMBER_RANGE, inNumberRange } from '../../model/number-range.js';
import type { DrawingGeometry, Model } from '../../model/schema.js';
import { resolveUnits } from '../../model/units.js';
import { type Curve, curveAreaTerm, curveLength, curveTangent, evaluateCurve, splitBezier } from '../curve.js';
import { findContacts, indexLoops, pointInLoop, type Polylines } from '../intersect.js';
import { readDxf } from './dxf.js';
import { joinPieces, type DrawnLoop, type OpenEnd } from './join.js';
import { MAX_DRAWING_BYTES } from './limits.js';
import { MAX_LOOPS } from '../limits.js';
import { readSvg } from './svg.js';
import { DrawingError, type DrawnCurve, type ReadDrawing, type ReadOptions } from './types.js';


export interface ImportedLoop {
  edges: DrawnCurve[];
  /** the name of a hole, when the drawing gives one (an SVG id) */
  name?: string;
  /** where in the drawing the loop comes from, for messages */
  origin: string;
  /** enclosed area, model length unit squared */
  area: number;
}

export interface ImportedDrawing {
  /** the file as written in the model, and as found */
  file: string;
  path: string;
  format: 'svg' | 'dxf';
  /** the drawing unit, in words */
  unit: string;
  outline: ImportedLoop;
  holes: ImportedLoop[];
  /** every tag carried by an edge of the outline or a hole */
  tags: string[];
  /** closed loops outside the outline, left out */
  leftOut: ImportedLoop[];
  /** what was skipped or assumed */
  notes: string[];
  /** the part of the notes a person should see as a warning */
  warnings: string[];
  /** the end-point matching tolerance used, model length unit */
  joinTolerance: number;
}

/** Default end-point matching tolerance, relative to the drawing size (the diagonal of its bounding box). */
const JOIN_TOLERANCE = 1e-6;

export interface ImportContext {
  /** the folder `from` is relative to (the model file's folder) */
  baseDir: string;
  /** metres per model length unit, and its name */
  modelUnitMetres: number;
  modelUnitName: string;
  /**
   * Allow a drawing outside baseDir (an absolute path, a path through "..", or a link that
   * leads out). Off by default: a model file from someone else must not make raiser read any
   * file on the machine. The command line turns it on with --allow-drawing-outside.
   */
  allowOutside?: boolean;
}

/** The option of the command line that allows a drawing outside the model's folder. */
const ALLOW_OUTSIDE_FLAG = '--allow-drawing-outside';

/** True when path lies inside folder (both absolute and free of links). */
function isInside(folder: string, path: string): boolean {
  const rel = relative(folder, path);
  return rel !== '' && !rel.startsWith('..' + sep) && rel !== '..' && !isAbsolute(rel);
}

function realOrSelf(path: string): string {
  try {
    return realpathSync(path);
  } catch {
    return path;
  }
}

function fmt(v: number): string {
  if (Math.abs(v) < 1e-12) return '0';
  return Number(v.toPrecision(5)).toString();
}

/**
 * The drawing a loaded model names with `"geometry": { "from": ... }`, read relative to the
 * folder of the model file (the current folder for a model without a file); undefined for a
 * model whose loops are written out. A drawing that cannot be read or does not make a plate is
 * a ModelError at geometry.from, in the model file.
 */
export function readModelDrawing(model: Model, file: string | undefined, allowOutside = false): ImportedDrawing | undefined {
  const g = model.geometry;
  if (!('from' in g)) return undefined;
  const units = resolveUnits(model.units);
  try {
    return importDrawing(g, { baseDir: file ? dirname(file) : process.cwd(), modelUnitMetres: units.toSI.length, modelUnitName: units.length, allowOutside });
  } catch (e) {
    if (e instanceof DrawingError) throw new ModelError('geometry.from', `${g.from}: ${e.message}`, e.hint, file);
    throw e;
  }
}

/** Reads and sorts the drawing; throws DrawingError for a drawing that does not make a plate. */
function importDrawing(g: DrawingGeometry, ctx: ImportContext): ImportedDrawing {
  const path = resolve(ctx.baseDir, g.from);
  const ext = extname(g.from).toLowerCase();
  if (ext !== '.svg' && ext !== '.dxf') {
    throw new DrawingError(`"${g.from}" is neither an SVG nor a DXF drawing (by its name)`, 'give a file ending in .svg or .dxf');
  }
  // Where the file really is, links followed: it must stay inside the model's folder unless allowed.
  const base = realOrSelf(resolve(ctx.baseDir));
  const real = realOrSelf(path);
  const outsideWarnings: string[] = [];
  const leaves = isAbsolute(g.from) ? 'is an absolute path' : !isInside(resolve(ctx.baseDir), path) ? 'leaves the folder of the model file' : !isInside(base, real) ? `is a link to ${real}, outside the folder of the model file` : undefined;
  if (leaves) {
    if (!ctx.allowOutside) {
      throw new DrawingError(
        `"${g.from}" ${leaves}; raiser reads only drawings inside the model file's folder (${base}) unless told otherwise`,
        `copy the drawing next to the model file and name it relative to it, or, if you trust this model file, run with ${ALLOW_OUTSIDE_FLAG}`,
      );
    }
    outsideWarnings.push(`the drawing ${g.from} (${real}) lies outside the folder of the model file; it was read because of ${ALLOW_OUTSIDE_FLAG}`);
  }
  const got = readRegularFile(real, MAX_DRAWING_BYTES);
  if (!got.ok) {
    const hint = '"from" names a drawing file relative to the folder of the model file';
    switch (got.kind) {
      case 'missing':
        throw new DrawingError(`no such drawing: "${g.from}" (looked for ${path})`, hint);
      case 'folder':
        throw new DrawingError(`"${g.from}" is a folder, not a drawing`, hint);
      case 'not-regular':
        throw new DrawingError(`"${g.from}" is ${got.what}, not a drawing file`, 'give a regular .svg or .dxf file');
      case 'too-large':
        throw new DrawingError(
          `the drawing "${g.from}" is ${formatBytes(got.bytes)}, more than the ${formatBytes(MAX_DRAWING_BYTES)} raiser reads`,
          'a drawing of one plate is far smaller: export only the part (without title block, hatching and other parts), or simplify it',
        );
      case 'unreadable':
        throw new DrawingError(`the drawing "${g.from}" cannot be read (${got.reason})`, hint);
    }
  }
  let text = got.bytes.toString('utf8');
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const opts: ReadOptions = {
    unit: g.unit,
    modelUnitMetres: ctx.modelUnitMetres,
    modelUnitName: ctx.modelUnitName,
    scale: g.scale ?? 1,
    ignore: g.ignore ?? [],
    file: g.from,
  };
  const format = ext === '.svg' ? 'svg' : 'dxf';
  const read = format === 'svg' ? readSvg(text, opts) : readDxf(text, opts);
  read.warnings.unshift(...outsideWarnings);
  checkFinite(read);
  return sortLoops(read, g, path, format);
}

/** Numbers of a curve that must be finite. */
function curveNumbers(c: Curve): number[] {
  switch (c.kind) {
    case 'line':
      return [c.x0, c.y0, c.x1, c.y1];
    case 'arc':
      return [c.cx, c.cy, c.r, c.a0, c.sweep];
    case 'ellipse':
      return [c.cx, c.cy, c.a, c.b, c.rot, c.t0, c.sweep];
    case 'bezier':
      return c.w ? [...c.p, ...c.w] : c.p;
  }
}

/** Refuses a drawing with a coordinate that is not a finite number (nan, inf, or one that overflows on the way to model units). */
function checkFinite(read: ReadDrawing): void {
  for (const piece of read.pieces) {
    for (const dc of piece.curves) {
      if (!curveNumbers(dc.curve).every(Number.isFinite)) {
        throw new DrawingError(
          `${dc.origin}: a coordinate or size is not a finite number (it reads as nan or inf, or overflows when converted to the model's unit)`,
          'correct the entity in the drawing program and save the drawing again',
        );
      }
      const out = curveNumbers(dc.curve).find((v) => !inNumberRange(v));
      if (out !== undefined) {
        throw new DrawingError(
          `${dc.origin}: the number ${out} (in the model's unit) is outside the range raiser computes with, 0 or between ${NUMBER_RANGE[0]} and ${NUMBER_RANGE[1]} in size`,
          'check the drawing\'s unit and "scale"; a coordinate this small or large is most likely a slip',
        );
      }
    }
  }
}

function bbox(curves: Iterable<Curve>): [number, number, number, number] {
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  const p = [0, 0];
  for (const c of curves) {
    for (let k = 0; k <= 16; k++) {
      evaluateCurve(c, k / 16, p);
      x0 = Math.min(x0, p[0]);
      y0 = Math.min(y0, p[1]);
      x1 = Math.max(x1, p[0]);
      y1 = Math.max(y1, p[1]);
    }
  }
  return [x0, y0, x1, y1];
}

function sortLoops(read: ReadDrawing, g: DrawingGeometry, path: string, format: 'svg' | 'dxf'): ImportedDrawing {
  const all = read.pieces.flatMap((p) => p.curves.map((c) => c.curve));
  const skippedNote = read.notes.length ? ` (${read.notes.join('; ')})` : '';
  if (all.length === 0) {
    throw new DrawingError(`the drawing has no closed loop: it has no lines, arcs or curves at all${skippedNote}`, g.ignore?.length ? 'check "ignore": it may leave out the profile' : 'draw the profile with lines, arcs, circles and curves');
  }
  const [bx0, by0, bx1, by1] = bbox(all);
  const size = Math.hypot(bx1 - bx0, by1 - by0);
  const tol = g.join ?? JOIN_TOLERANCE * size;
  const joined = joinPieces(read.pieces, tol);
  if (joined.openEnds.length || joined.branches.length) throw joinError(joined.openEnds, joined.branches, tol, size, g);
  const notes = [...read.notes];
  if (joined.duplicates.length) notes.push(`${joined.duplicates.length} duplicate entit${joined.duplicates.length === 1 ? 'y' : 'ies'} (the same curve drawn twice) left out: ${joined.duplicates.slice(0, 3).map((d) => d.origin).join('; ')}`);
  if (joined.loops.length > MAX_LOOPS) {
    throw new DrawingError(`the drawing has ${joined.loops.length} closed loops, more than the ${MAX_LOOPS} (an outline and its holes) raiser analyses in one model`, 'model a representative piece of the part (a strip of holes with symmetry supports), or leave out what is not the plate with "ignore"');
  }
  const loops = joined.loops.map((l) => ({ ...l, curves: splitInflections(l.curves, size) }));
  if (loops.length === 0) throw new DrawingError('the drawing has no closed loop', 'a plate needs a closed outline');

  // Polylines of every loop, for crossings and containment.
  const pl = tracePolylines(loops.map((l) => l.curves.map((c) => c.curve)));
  const areas = loops.map((l) => Math.abs(l.curves.reduce((s, c) => s + curveAreaTerm(c.curve), 0)));
  const names = loops.map((l) => loopName(l));
  const contacts = findContacts(pl, 1e-9 * size, 4);
  for (const c of contacts) {
    if (c.loop1 === c.loop2) {
      throw new DrawingError(`${names[c.loop1]} ${c.kind === 'cross' ? 'crosses' : 'touches'} itself near (${fmt(c.x)}, ${fmt(c.y)})`, 'a loop of the profile must not cross or touch itself; correct the drawing there');
    }
    throw new DrawingError(
      `${names[c.loop1]} and ${names[c.loop2]} ${c.kind === 'cross' ? 'cross' : 'touch'} near (${fmt(c.x)}, ${fmt(c.y)}): overlapping outlines`,
      'a plate has one outline and holes that lie apart inside it: unite overlapping shapes into one outline in the drawing, or leave one out with "ignore"',
    );
  }
  // The outline.
  let candidates = loops.map((_, i) => i);
  if (g.outline !== undefined) {
    candidates = candidates.filter((i) => loops[i].pieces.some((p) => p.keys.includes(g.outline!)));
    if (candidates.length === 0) {
      const known = read.keys.filter((k) => k.trim());
      throw new DrawingError(
        `no closed loop of the drawing has the ${format === 'dxf' ? 'layer' : 'id, class or layer label'} "${g.outline}"`,
        known.length ? `the drawing has ${format === 'dxf' ? 'the layers' : 'the ids, classes and labels'} ${known.slice(0, 12).map((k) => `"${k}"`).join(', ')}${known.length > 12 ? ', ...' : ''}` : 'leave "outline" out to take the largest closed loop',
      );
    }
  }
  let outline = candidates[0];
  for (const i of candidates) if (areas[i] > areas[outline]) outline = i;
  const index = indexLoops(pl);
  const holes: number[] = [];
  const outside: number[] = [];
  const firstPoint = (i: number) => {
    const p = [0, 0];
    evaluateCurve(loops[i].curves[0].curve, 0, p);
    return p;
  };
  for (let i = 0; i < loops.length; i++) {
    if (i === outline) continue;
    const [x, y] = firstPoint(i);
    if (pointInLoop(pl, outline, x, y, index)) holes.push(i);
    else outside.push(i);
  }
  for (const h of holes) {
    const [x, y] = firstPoint(h);
    for (const o of holes) {
      if (o !== h && pointInLoop(pl, o, x, y, index)) {
        throw new DrawingError(
          `${names[h]} lies inside ${names[o]}, which lies inside the outline (${names[outline]}, the largest closed loop${g.outline !== undefined ? ` with "${g.outline}"` : ''}) and so is a hole: a loop inside a hole is not a plate`,
          'if the outline is a frame or a title block, leave it out with "ignore" or name the real outline with "outline"; otherwise remove the loop inside the hole',
        );
      }
    }
  }
  const asLoop = (i: number): ImportedLoop => {
    const l = loops[i];
    const single = l.pieces.length === 1 ? l.pieces[0] : undefined;
    return { edges: l.curves, name: single?.name, origin: names[i], area: areas[i] };
  };
  const leftOut = outside.map(asLoop);
  if (leftOut.length) notes.push(`${leftOut.length} closed loop${leftOut.length === 1 ? '' : 's'} outside the outline left out: ${leftOut.slice(0, 3).map((l) => l.origin).join('; ')}${leftOut.length > 3 ? '; ...' : ''}`);
  const warnings = [...read.warnings];
  if (leftOut.length) warnings.push(`${g.from}: ${notes[notes.length - 1]}`);
  const holeLoops = holes.map(asLoop);
  const tags = new Set<string>();
  for (const l of [asLoop(outline), ...holeLoops]) for (const e of l.edges) for (const t of e.tags) tags.add(t);
  return {
    file: g.from,
    path,
    format,
    unit: read.unit,
    outline: asLoop(outline),
    holes: holeLoops,
    tags: [...tags],
    leftOut,
    notes,
    warnings,
    joinTolerance: tol,
  };
}

function loopName(l: DrawnLoop): string {
  const origins = [...new Set(l.pieces.map((p) => p.origin))];
  return origins.length === 1 ? `the loop of ${origins[0]}` : `the loop made of ${origins.slice(0, 2).join(', ')}${origins.length > 2 ? ` and ${origins.length - 2} more` : ''}`;
}

function joinError(openEnds: OpenEnd[], branches: { x: number; y: number; pieces: { origin: string }[] }[], tol: number, size: number, g: DrawingGeometry): DrawingError {
  const lines: string[] = [];
  let widest = 0;
  // Two open ends that are each other's nearest make one gap, reported once.
  const done = new Set<OpenEnd>();
  const at = (x: number, y: number) => `(${fmt(x)}, ${fmt(y)})`;
  for (const o of openEnds) {
    if (done.has(o)) continue;
    done.add(o);
    const n = o.nearest;
    const mate = n ? openEnds.find((q) => !done.has(q) && q.x === n.x && q.y === n.y && q.nearest && q.nearest.x === o.x && q.nearest.y === o.y) : undefined;
    const pieceLength = o.piece.curves.reduce((s, c) => s + curveLength(c.curve), 0);
    if (n && mate && n.piece === o.piece && n.gap > 0.1 * pieceLength) {
      // Not a loop left open but a loose piece, a centre line say.
      done.add(mate);
      lines.push(`${o.piece.origin}, from ${at(o.x, o.y)} to ${at(n.x, n.y)}, meets no other piece at either end`);
    } else if (n && mate) {
      done.add(mate);
      widest = Math.max(widest, n.gap);
      lines.push(
        n.piece === o.piece
          ? `a gap of ${fmt(n.gap)} between the ends of ${o.piece.origin}, at ${at(o.x, o.y)} and ${at(n.x, n.y)}`
          : `a gap of ${fmt(n.gap)} between ${at(o.x, o.y)}, the end of ${o.piece.origin}, and ${at(n.x, n.y)}, the end of ${n.piece.origin}`,
      );
    } else {
      lines.push(`an open end at ${at(o.x, o.y)} of ${o.piece.origin}${n ? `; the nearest end, ${fmt(n.gap)} away, is at ${at(n.x, n.y)} of ${n.piece.origin}` : ''}`);
      if (n) widest = Math.max(widest, n.gap);
    }
  }
  const shown = lines.slice(0, 8);
  if (lines.length > 8) shown.push(`and ${lines.length - 8} more`);
  for (const b of branches.slice(0, 4)) shown.push(`${b.pieces.length} pieces meet at ${at(b.x, b.y)}, where only two may: ${b.pieces.map((p) => p.origin).join('; ')}`);
  const contours = Math.ceil(openEnds.length / 2);
  const head = openEnds.length
    ? `the drawing has ${contours === 1 ? 'an open contour' : `${contours} open contours`} (ends that meet no other end within ${fmt(tol)})`
    : 'the drawing branches: a plate boundary is made of separate closed loops';
  const canJoin = widest > 0 && widest <= 0.01 * size;
  const hint = openEnds.length
    ? `close the gap${lines.length === 1 ? '' : 's'} in the drawing${canJoin ? `, or join ends up to ${fmt(widest * 1.01)} apart with "join": ${fmt(widest * 1.01)}` : ''}; a line that is not part of the plate (a centre line, a dimension) can be left out with "ignore" and its ${g.from.toLowerCase().endsWith('.dxf') ? 'layer' : 'id or class'}`
    : 'remove the duplicate or overlapping entity, or leave it out with "ignore"';
  return new DrawingError(`${head}:\n  ${shown.join('\n  ')}`, hint);
}

/** Splits Bezier curves where the sign of p' x p'' changes (their inflections). */
function splitInflections(curves: DrawnCurve[], size: number): DrawnCurve[] {
  const out: DrawnCurve[] = [];
  for (const dc of curves) {
    const c = dc.curve;
    if (c.kind !== 'bezier' || c.p.length <= 4) {
      out.push(dc);
      continue;
    }
    const f = (t: number) => bendSign(c, t);
    const N = 128;
    const vals: number[] = [];
    let fmax = 0;
    for (let k = 0; k <= N; k++) {
      const v = f(k / N);
      vals.push(v);
      fmax = Math.max(fmax, Math.abs(v));
    }
    const cuts: number[] = [];
    const floor = 1e-9 * fmax;
    let lastSign = 0;
    let lastK = 0;
    for (let k = 0; k <= N; k++) {
      const s = Math.abs(vals[k]) <= floor ? 0 : Math.sign(vals[k]);
      if (s === 0) continue;
      if (lastSign !== 0 && s !== lastSign) {
        let a = lastK / N;
        let b = k / N;
        for (let it = 0; it < 60; it++) {
          const m = 0.5 * (a + b);
          if (Math.sign(f(m)) === lastSign) a = m;
          else b = m;
        }
        cuts.push(0.5 * (a + b));
      }
      lastSign = s;
      lastK = k;
    }
    if (cuts.length === 0) {
      out.push(dc);
      continue;
    }
    let rest: Curve = c;
    let done = 0;
    for (const t of cuts) {
      const local = (t - done) / (1 - done);
      if (local <= 1e-9 || local >= 1 - 1e-9) continue;
      const [l, r] = splitBezier(rest as Extract<Curve, { kind: 'bezier' }>, local);
      if (curveLength(l) > 1e-9 * size) out.push({ ...dc, curve: l });
      rest = r;
      done = t;
    }
    out.push({ ...dc, curve: rest });
  }
  return out;
}

/** p'(t) x p''(t) by finite differences of the tangent, scale-free sign of bending. */
function bendSign(c: Curve, t: number): number {
  const h = 1e-5;
  const a = [0, 0];
  const b = [0, 0];
  curveTangent(c, Math.max(0, t - h), a);
  curveTangent(c, Math.min(1, t + h), b);
  return a[0] * b[1] - a[1] * b[0];
}

/** Fine polylines of loops of curves (no chord turns more than 2 degrees), with the chord error as slack. */
function tracePolylines(loops: Curve[][]): Polylines {
  const xy: number[] = [];
  const segs: number[] = [];
  const segLoop: number[] = [];
  const slack: number[] = [];
  const curved: boolean[] = [];
  const p = [0, 0];
  const d = [0, 0];
  const step = (2 * Math.PI) / 180;
  loops.forEach((curves, li) => {
    const first = xy.length / 2;
    curves.forEach((c, k) => {
      let n = 1;
      if (c.kind !== 'line') {
        // Turning by sampled tangents.
        let turn = 0;
        let px = 0;
        let py = 0;
        for (let j = 0; j <= 64; j++) {
          curveTangent(c, j / 64, d);
          if (j > 0) turn += Math.abs(Math.atan2(px * d[1] - py * d[0], px * d[0] + py * d[1]));
          px = d[0];
          py = d[1];
        }
        n = Math.max(4, Math.ceil(turn / step));
      }
      for (let j = 0; j < n; j++) {
        evaluateCurve(c, j / n, p);
        const idx = xy.length / 2;
        xy.push(p[0], p[1]);
        const last = k === curves.length - 1 && j === n - 1;
        segs.push(idx, last ? first : idx + 1);
        segLoop.push(li);
        curved.push(c.kind !== 'line');
        slack.push(0);
      }
    });
  });
  // Slack: the sagitta of a chord turning by at most `step`, below chord * step / 8 (2e-4 of its length).
  for (let s = 0; s < segLoop.length; s++) {
    if (!curved[s]) continue;
    const a = segs[2 * s];
    const b = segs[2 * s + 1];
    slack[s] = (Math.hypot(xy[2 * b] - xy[2 * a], xy[2 * b + 1] - xy[2 * a + 1]) * step) / 8;
  }
  return { xy: Float64Array.from(xy), segs: Int32Array.from(segs), segLoop: Int32Array.from(segLoop), segSlack: Float64Array.from(slack) };
}
