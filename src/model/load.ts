/**
 * Reading a model file: text -> JSON -> schema -> semantic checks -> Model.
 *
 * Every problem becomes a ModelError that names the JSON path and, where it can, the line and
 * column in the file with the offending line quoted. All problems found in one pass are
 * reported together: one problem is thrown as a plain ModelError, several as a ModelErrorList
 * (a ModelError carrying the list). A file with a JSON syntax error stops at that error, since
 * nothing after it can be read reliably.
 */
import { readdirSync } from 'node:fs';
import { basename, dirname, extname } from 'node:path';
import { checkModel, type DrawingNames } from './checks.js';
import { MAX_REPORTED_PROBLEMS, ModelError, ModelErrorList, formatPath, quoteText, type PlacedProblem } from './errors.js';
import { type Problem, translateIssues } from './issues.js';
import { LineIndex, excerptAt, scanJson, type JsonScan } from './json-text.js';
import { formatBytes, readRegularFile } from './read-file.js';
import { NUMBER_RANGE, inNumberRange } from './number-range.js';
import { Model } from './schema.js';
import { closest, quoteList } from './suggest.js';
import { resolveUnits } from './units.js';
import { PRODUCT_FORMS, findGrade, gradeNames, lookupGrade, normaliseGradeName, type MaterialBasis, type ProductForm } from './materials.js';
import { substituteParameters } from './params.js';

export interface LoadedModel {
  model: Model;
  /** legal but probably unintended settings, each placed in the file like an error */
  warnings: ModelError[];
  /**
   * Places a problem found later (building the geometry, meshing, compiling loads) in this
   * file: its name, and the line and column of the field its path names (or the nearest
   * enclosing field that is written in the file). Returns the same error.
   */
  locate<E extends PlacedProblem>(e: E): E;
}

const MODEL_FIELDS = Object.keys(Model.shape);
const REQUIRED_FIELDS = MODEL_FIELDS.filter((k) => !Model.shape[k as keyof typeof Model.shape].safeParse(undefined).success);

/**
 * A model that has passed the schema, before the checks that may need its drawing's names
 * (parseModel -> the caller reads the drawing, if any -> checkParsedModel).
 */
export interface ParsedModel {
  model: Model;
  file?: string;
  /** warnings found so far (a material grade without strengths for this thickness) */
  warnings: ModelError[];
  /** places a problem in the file, as LoadedModel.locate */
  locate<E extends PlacedProblem>(e: E): E;
  /** where each field is in the text, for placing the checks' problems */
  readonly text: ModelText;
}

/** The text of a model file and where its values are (opaque outside this module). */
export interface ModelText {
  readonly scan: JsonScan;
  readonly placer: Placer;
}

/**
 * Parses and validates model text; throws ModelError (or ModelErrorList) on any problem.
 * A model with `"geometry": { "from": ... }` is loaded without its drawing: the selectors that
 * name the drawing's tags are not checked, and the geometry cannot be built. Load such a model
 * with loadModelAndDrawing (src/pipeline/load.ts), which reads the drawing too.
 */
export function parseModelText(text: string, file?: string): Model {
  return loadModelText(text, file).model;
}

/** Reads, parses and validates a model file; throws ModelError (or ModelErrorList) on any problem. */
export function readModelFile(path: string): Model {
  return loadModelFile(path).model;
}

/** How a model is loaded. */
export interface LoadOptions {
  /** values that override declared parameters (a sweep's case) */
  parameters?: Readonly<Record<string, number>>;
}

/** Largest model file read, in bytes (16 MiB): a model of one plate is a few kilobytes. */
const MAX_MODEL_BYTES = 16 * 2 ** 20;

/** Deepest nesting of objects and lists in a model file (a model nests about 8 deep). */
const MAX_MODEL_DEPTH = 32;


/** Every number in the data outside NUMBER_RANGE, with its JSON path (free text is not looked at). */
function numbersOutOfRange(data: unknown): { path: string; value: number }[] {
  const out: { path: string; value: number }[] = [];
  const todo: [unknown, (string | number)[]][] = [[data, []]];
  while (todo.length) {
    const [v, parts] = todo.pop()!;
    if (typeof v === 'number') {
      if (Number.isFinite(v) && !inNumberRange(v)) out.push({ path: formatPath(parts), value: v });
    } else if (Array.isArray(v)) v.forEach((x, i) => todo.push([x, [...parts, i]]));
    else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) todo.push([x, [...parts, k]]);
  }
  return out;
}

/** A problem found, and where in the text it is (placed only if it is reported). */
interface Found {
  e: ModelError;
  offset?: number;
}

/** Places problems in one text: line starts found once, excerpts read from a window. */
class Placer {
  private index?: LineIndex;
  constructor(readonly src: string) {}
  lines(): LineIndex {
    return (this.index ??= new LineIndex(this.src));
  }
  place<E extends PlacedProblem>(e: E, offset: number): E {
    const { line, column } = this.lines().place(offset);
    e.line = line;
    e.column = column;
    e.excerpt = excerptAt(this.src, offset);
    return e;
  }
}

/** As parseModelText, also returning the warnings. `parameters` override declared parameter values. */
export function loadModelText(text: string, file?: string, options: LoadOptions = {}): LoadedModel {
  return checkParsedModel(parseModel(text, file, options));
}

/**
 * Text -> JSON -> parameters -> schema: the model, before the semantic checks. Throws
 * ModelError (or ModelErrorList) on any problem found so far.
 */
export function parseModel(text: string, file?: string, options: LoadOptions = {}): ParsedModel {
  // A byte-order mark is not part of the JSON; editors do not count it as a column.
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const placer = new Placer(src);
  // The scan is one pass with its own stack: syntax, depth and where every value is, before
  // anything (JSON.parse, the schema, the parameter walk) recurses into the data.
  const scan = scanJson(src);
  if (scan.error) throw syntaxError(src, scan, placer, file);
  if (scan.deepest.depth > MAX_MODEL_DEPTH) {
    throw placer.place(
      new ModelError('', `objects and lists are nested ${scan.deepest.depth} deep here, more than the ${MAX_MODEL_DEPTH} levels a model file may have`, 'a model nests about 8 levels deep: check for brackets opened by mistake, or for data that is not a model', file),
      scan.deepest.offset,
    );
  }
  let data: unknown;
  try {
    data = JSON.parse(src);
  } catch (e) {
    // The scan accepts exactly what JSON.parse accepts; this is the fallback if they ever differ.
    throw new ModelError('', `not valid JSON (${e instanceof Error ? e.message : String(e)})`, undefined, file);
  }
  const problems: Found[] = [];
  for (const r of scan.reservedKeys) {
    problems.push({ e: new ModelError(r.path, `unknown field "${r.key}": no model field has this name`, 'remove it (it is a name reserved by the JavaScript language, never model data)', file), offset: r.offset });
  }
  for (const d of scan.duplicates) {
    const first = placer.lines().place(d.firstOffset);
    problems.push({ e: new ModelError(d.path, `the field "${quoteText(d.key)}" is given twice in the same object (first on line ${first.line}); only the last would count`, 'remove one of them', file), offset: d.offset });
  }
  for (const h of scan.hugeNumbers) {
    problems.push({ e: new ModelError(h.path, `the number ${quoteText(h.text)} is too large to represent`, 'check the value and its unit', file), offset: h.offset });
  }
  // Reserved names go no further: an object built from them could change its own prototype.
  if (scan.reservedKeys.length) throwAll(problems, placer, file);

  notAModel(data, placer, file);

  // Parameters: "=expression" strings become numbers before the schema sees them.
  const sub = substituteParameters(data, options.parameters);
  for (const pr of sub.problems) problems.push({ e: new ModelError(pr.path, pr.message, pr.hint, file), offset: offsetOf(pr.path, scan) });
  throwAll(problems, placer, file);
  data = sub.data;
  for (const r of numbersOutOfRange(data)) {
    problems.push({
      e: new ModelError(
        r.path,
        `the number ${r.value} is outside the range raiser computes with: every number of a model must be 0 or between ${NUMBER_RANGE[0]} and ${NUMBER_RANGE[1]} in size`,
        'write the model in units that keep its numbers moderate (lengths in mm or m, stresses in MPa or Pa); a value this small or large is most likely a typing slip',
        file,
      ),
      offset: offsetOf(r.path, scan),
    });
  }
  throwAll(problems, placer, file);
  mixedGeometry(data, placer, scan, file);
  // A named grade fills E, nu, yield and ultimate before the schema sees the material.
  const grade = resolveGrade(data, file);
  if (grade.error) problems.push({ e: grade.error, offset: offsetOf(grade.error.path, scan) });
  throwAll(problems, placer, file);

  const parsed = Model.safeParse(data);
  if (!parsed.success) {
    const units = unitsOf(data);
    const found = translateIssues(parsed.error.issues, { root: Model, data, units });
    // A number too large for a double is already reported; zod would only add "found Infinity".
    const huge = new Set(scan.hugeNumbers.map((h) => h.path));
    for (const p of found) if (!huge.has(formatPath(p.parts))) problems.push(foundProblem(p, scan, file));
    throwAll(problems, placer, file);
  }
  throwAll(problems, placer, file);
  const material = parsed.data!.material;
  for (const k of ['E', 'nu'] as const) {
    if (material[k] === undefined) {
      problems.push({
        e: new ModelError(`material.${k}`, `the material has no ${k === 'E' ? "Young's modulus E" : "Poisson's ratio nu"}`, `give "E" and "nu", or a "grade" (${quoteList(gradeNames().slice(0, 6), 'or')}, ...) that brings them`, file),
        offset: offsetOf('material', scan),
      });
    }
  }
  throwAll(problems, placer, file);
  const model = parsed.data! as Model;
  if (grade.basis) model.material.basis = grade.basis;
  // A path of two vertices is a loop only when an edge is an arc; said before the tag checks,
  // which would otherwise report the edges this loop never made.
  const g = model.geometry;
  if (!('from' in g)) {
    [g.outline, ...(g.holes ?? [])].forEach((loop, i) => {
      if (loop.shape !== 'path' || loop.path.length !== 2 || loop.path.some((v) => !Array.isArray(v) && (v as { arc?: unknown }).arc)) return;
      const at = i === 0 ? 'geometry.outline.path' : `geometry.holes[${i - 1}].path`;
      problems.push({ e: new ModelError(at, 'a path of two vertices with two straight edges encloses no area', 'make one or both of its edges an arc (two half circles make a round hole), or give three or more vertices', file), offset: offsetOf(at, scan) });
    });
    throwAll(problems, placer, file);
  }
  const locate = <E extends PlacedProblem>(e: E): E => {
    if (e.file === undefined) e.file = file;
    // Placed only where the field is written: a default (a field the file leaves out) has no
    // line of its own, and pointing at the enclosing object would show an unrelated excerpt.
    if (e.line === undefined && e.path && !e.path.startsWith('-') && (scan.valueAt.has(e.path) || scan.keyAt.has(e.path))) {
      const off = offsetOf(e.path, scan);
      if (off !== undefined) placer.place(e, off);
    }
    return e;
  };
  return { model, file, warnings: grade.warnings, locate, text: { scan, placer } };
}

/**
 * The semantic checks of a parsed model (src/model/checks.ts), their problems placed in the
 * file: errors thrown, warnings returned after `drawingWarnings` and the parse's own. `drawing`
 * gives the tags and hole names of the drawing the geometry comes from, when it has been read.
 */
export function checkParsedModel(parsed: ParsedModel, drawing?: DrawingNames, drawingWarnings: readonly ModelError[] = []): LoadedModel {
  const { model, file, locate } = parsed;
  const { scan, placer } = parsed.text;
  const { errors, warnings } = checkModel(model, drawing);
  warnings.unshift(...drawingWarnings, ...parsed.warnings);
  for (const e of warnings) {
    e.file = file;
    const off = offsetOf(e.path, scan);
    if (off !== undefined) placer.place(e, off);
  }
  throwAll(
    errors.map((e) => ({ e, offset: offsetOf(e.path, scan) })),
    placer,
    file,
  );
  return { model, warnings, locate };
}

/** As readModelFile, also returning the warnings. */
export function loadModelFile(path: string, options: LoadOptions = {}): LoadedModel {
  return loadModelText(readModelText(path), path, options);
}

/**
 * The text of a model file: a regular file (not a folder, pipe or device) of at most
 * MAX_MODEL_BYTES, in UTF-8; otherwise a ModelError saying what the file is instead.
 */
export function readModelText(path: string): string {
  const got = readRegularFile(path, MAX_MODEL_BYTES);
  if (got.ok) return decodeText(got.bytes, path);
  switch (got.kind) {
    case 'missing':
      throw missingFile(path);
    case 'folder': {
      let jsons: string[] = [];
      try {
        jsons = readdirSync(path).filter((f) => f.toLowerCase().endsWith('.json'));
      } catch {
        // The listing is only a hint.
      }
      const hint =
        jsons.length === 0
          ? 'give the path of a model file (.json), not of a folder'
          : `give the path of a model file; this folder holds ${jsons.length > 6 ? `${jsons.slice(0, 6).join(', ')} and ${jsons.length - 6} more` : jsons.join(', ')}`;
      throw new ModelError('', `"${path}" is a folder, not a model file`, hint, path);
    }
    case 'not-regular':
      throw new ModelError('', `"${path}" is ${got.what}, not a regular file`, 'give the path of a model file (.json)', path);
    case 'too-large':
      throw new ModelError('', `"${path}" is ${formatBytes(got.bytes)}, more than the ${formatBytes(MAX_MODEL_BYTES)} a model file may be`, 'a model of one plate is a few kilobytes: check that this is the model file; a long outline can come from a drawing with "geometry": { "from": ... }', path);
    case 'unreadable':
      throw new ModelError('', `"${path}" cannot be read: ${got.reason}`, got.reason === 'permission denied' ? 'check the file permissions' : undefined, path);
  }
}

// ---------------------------------------------------------------------------------------------

/**
 * `"material": { "grade": ... }`: looks the grade up and writes its E, nu, yield and ultimate
 * into the material data where the model does not give them (given fields win). A grade that
 * is not bundled is an error naming the close ones; a thickness outside the standard's bands
 * leaves yield and ultimate unset, with a warning. Data the schema will reject anyway (no
 * material object, a thickness that is not a positive number) is left for the schema to report.
 */
function resolveGrade(data: unknown, file: string | undefined): { basis?: MaterialBasis; warnings: ModelError[]; error?: ModelError } {
  const d = data as { material?: unknown; thickness?: unknown; units?: unknown };
  const m = d?.material as Record<string, unknown> | undefined;
  if (!m || typeof m !== 'object' || Array.isArray(m) || typeof m.grade !== 'string') return { warnings: [] };
  const grade = findGrade(m.grade);
  if (!grade) {
    const names = gradeNames();
    const norm = normaliseGradeName(m.grade);
    const near = names.filter((n) => {
      const k = normaliseGradeName(n);
      return closest(norm, [k]) !== undefined || k.includes(norm) || norm.includes(k);
    });
    const hint = near.length ? `did you mean ${quoteList(near, 'or')}? The bundled grades: ${names.join(', ')}` : `the bundled grades: ${names.join(', ')}; or give "E" and "nu" (and "yield", "ultimate") without a grade`;
    return { warnings: [], error: new ModelError('material.grade', `no bundled material grade is called "${quoteText(m.grade, 40)}"`, hint, file) };
  }
  const form = typeof m.form === 'string' && (PRODUCT_FORMS as readonly string[]).includes(m.form) ? (m.form as ProductForm) : undefined;
  if (typeof d.thickness !== 'number' || !(d.thickness > 0)) return { warnings: [] };
  const units = unitsOf(data);
  const r = resolveUnits(Model.shape.units.safeParse(d.units).success ? (d.units as Model['units']) : undefined);
  const thicknessMm = d.thickness * r.toSI.length * 1000;
  const basis = lookupGrade(grade, form, Number(thicknessMm.toPrecision(12)));
  const perMPa = 1e6 / r.toSI.stress;
  const fill = (k: string, v: number | null) => {
    if (v !== null && m[k] === undefined) m[k] = v * perMPa;
  };
  fill('E', grade.E);
  if (m.nu === undefined) m.nu = grade.nu; // a ratio: no unit to convert
  fill('yield', basis.yield);
  fill('ultimate', basis.ultimate);
  const warnings: ModelError[] = [];
  if (basis.unsetWhy && (m.yield === undefined || m.ultimate === undefined)) {
    warnings.push(new ModelError('material.grade', `${grade.names[0]}: yield and ultimate strength are not set: ${basis.unsetWhy}`, `give "yield" and "ultimate" from the mill certificate or the standard (in ${units.stress})`, file));
  }
  return { basis, warnings };
}

/** A geometry that gives both a drawing and loops written out: said plainly, before the schema would call "from" unknown. */
function mixedGeometry(data: unknown, placer: Placer, scan: JsonScan, file: string | undefined): void {
  const g = (data as { geometry?: unknown })?.geometry as Record<string, unknown> | undefined;
  if (!g || typeof g !== 'object' || Array.isArray(g) || !('from' in g)) return;
  const written = ['outline', 'holes'].filter((k) => k in g && (k === 'holes' || typeof g[k] === 'object'));
  if (written.length === 0) return;
  const e = new ModelError(
    'geometry.from',
    `the geometry names a drawing ("from") and also writes out ${written.map((k) => `"${k}"`).join(' and ')}`,
    'give one of them: the outline and holes come from the drawing, or from the file (with "from", "outline" is the layer, id or class of the drawing\'s outline)',
    file,
  );
  const off = offsetOf('geometry.from', scan, 'key');
  throw off !== undefined ? placer.place(e, off) : e;
}

/**
 * Throws the problems found, in the order they occur in the file: one as itself, several as a
 * ModelErrorList. Only the first MAX_REPORTED_PROBLEMS are placed and listed; the rest are
 * counted, so a file with a hundred thousand mistakes costs no more to report than one with twenty.
 */
function throwAll(found: Found[], placer: Placer, file?: string): void {
  if (found.length === 0) return;
  const sorted = found
    .map((f, i) => ({ f, i }))
    .sort((a, b) => (a.f.offset ?? Infinity) - (b.f.offset ?? Infinity) || a.i - b.i)
    .map((x) => x.f);
  const shown = sorted.slice(0, MAX_REPORTED_PROBLEMS).map(({ e, offset }) => {
    if (file !== undefined) e.file ??= file;
    return offset !== undefined ? placer.place(e, offset) : e;
  });
  if (shown.length === 1) throw shown[0];
  throw new ModelErrorList(shown, file, sorted.length - shown.length);
}

/** Offset of the value at a path, or of its nearest enclosing value that is in the file. */
function offsetOf(path: string, scan: JsonScan, prefer: 'key' | 'value' = 'value'): number | undefined {
  if (prefer === 'key' && scan.keyAt.has(path)) return scan.keyAt.get(path);
  if (scan.valueAt.has(path)) return scan.valueAt.get(path);
  if (scan.keyAt.has(path)) return scan.keyAt.get(path);
  // Walk up: drop the last ".name" or "[i]".
  let p = path;
  while (p) {
    const cut = Math.max(p.lastIndexOf('.'), p.lastIndexOf('['));
    p = cut > 0 ? p.slice(0, cut) : '';
    if (scan.valueAt.has(p)) return scan.valueAt.get(p);
  }
  return scan.valueAt.get('');
}

function foundProblem(p: Problem, scan: JsonScan, file?: string): Found {
  const path = formatPath(p.parts);
  const e = new ModelError(path, p.message, p.hint, file);
  const offset = p.at === 'parent' ? offsetOf(formatPath(p.parts.slice(0, -1)), scan) : offsetOf(path, scan, p.at);
  return { e, offset };
}

function unitsOf(data: unknown): { length: string; force: string; stress: string } {
  const u = (data as { units?: unknown })?.units;
  const parsed = Model.shape.units.safeParse(u);
  const r = resolveUnits(parsed.success ? parsed.data : undefined);
  return { length: r.length, force: r.force, stress: r.stress };
}

/** Throws when the JSON value is plainly not a model at all (rather than a model with mistakes). */
function notAModel(data: unknown, placer: Placer, file?: string): void {
  // exactly one of "loads" and "loadCases" (src/model/load-cases.ts): both optional in the schema
  const required = `${quoteList(REQUIRED_FIELDS, 'and')}, with "loads" or "loadCases"`;
  const fail = (message: string, hint: string) => {
    const e = new ModelError('', message, hint, file);
    const first = placer.src.search(/\S/);
    throw first >= 0 ? placer.place(e, first) : e;
  };
  if (Array.isArray(data)) {
    const looksLikeModels = data.length > 0 && data.every((d) => d && typeof d === 'object' && !Array.isArray(d) && 'geometry' in d);
    fail(
      `the file holds a JSON list${data.length ? ` of ${data.length} item${data.length === 1 ? '' : 's'}` : ''}, not a model`,
      looksLikeModels ? 'a file holds one model; put each model in its own file' : `a model file is one JSON object with the fields ${required}`,
    );
  }
  if (data === null || typeof data !== 'object') {
    fail(`the file holds ${data === null ? 'null' : `a single ${typeof data === 'string' ? 'text value' : typeof data}`}, not a model`, `a model file is one JSON object with the fields ${required}`);
  }
  const keys = Object.keys(data as object);
  if (keys.length === 0) fail('the file holds an empty object {}, not a model', `a model needs the fields ${required}`);
  const related = keys.filter((k) => MODEL_FIELDS.includes(k) || closest(k, MODEL_FIELDS) !== undefined);
  if (related.length === 0) {
    fail(
      `this JSON file is not a raiser model: none of its fields (${quoteList(keys.slice(0, 8).map((k) => quoteText(k, 40)), 'and')}${keys.length > 8 ? ', ...' : ''}) belongs to a model`,
      `a model file has the fields ${required}, and may have ${quoteList(
        MODEL_FIELDS.filter((k) => !REQUIRED_FIELDS.includes(k) && k !== 'loads' && k !== 'loadCases'),
        'and',
      )}`,
    );
  }
}

/** A guess at what a non-JSON file is, from how it starts. */
function guessFormat(src: string): string | undefined {
  const head = src.trimStart().slice(0, 200);
  if (/^<\?xml|^<svg|^<!DOCTYPE|^<html/i.test(head)) return /<svg/i.test(head) ? 'an SVG drawing' : 'XML or HTML';
  if (/^0\s*\r?\n\s*SECTION/.test(head)) return 'a DXF drawing';
  if (/^solid\s/.test(head)) return 'an STL mesh';
  if (/^---\s*$|^[A-Za-z_][\w-]*\s*:(\s|$)/m.test(head.split('\n')[0] ?? '')) return 'YAML or plain text';
  return undefined;
}

function syntaxError(src: string, scan: JsonScan, placer: Placer, file?: string): ModelError {
  const first = src.search(/\S/);
  if (first < 0) return new ModelError('', 'the file is empty', 'a model file is one JSON object: { "material": ..., "geometry": ..., ... }', file);
  if (!/[{["\-0-9tfn]/.test(src[first])) {
    const kind = guessFormat(src);
    if (kind) {
      return placer.place(new ModelError('', `this is not a JSON model file: it looks like ${kind}`, 'a model file is JSON text that starts with "{"', file), first);
    }
  }
  const err = scan.error!;
  return placer.place(new ModelError('', `not valid JSON: ${err.message}`, err.hint, file), err.offset);
}

function missingFile(path: string): ModelError {
  let hint = 'check the path and the current folder';
  try {
    const dir = dirname(path);
    const names = readdirSync(dir);
    const near = closest(basename(path), names) ?? closest(basename(path, extname(path)), names.map((n) => basename(n, extname(n))));
    if (near !== undefined) {
      const full = names.find((n) => n === near || basename(n, extname(n)) === near) ?? near;
      hint = `did you mean "${dir === '.' ? full : `${dir}/${full}`}"?`;
    }
  } catch {
    // The folder itself may be missing; the plain hint stands.
  }
  return new ModelError('', `no such file: "${path}"`, hint, path);
}

/** UTF-8 text of a file, or a ModelError saying what the file is instead. */
function decodeText(bytes: Buffer, path: string): string {
  const starts = (...b: number[]) => b.length <= bytes.length && b.every((x, i) => bytes[i] === x);
  const encoding = (name: string, how: string) =>
    new ModelError('', `"${path}" is saved as ${name} text${how}`, 'save it as UTF-8 (most editors offer this under "encoding")', path);
  // UTF-32 first: its little-endian mark begins with UTF-16's.
  if (starts(0xff, 0xfe, 0, 0) || starts(0, 0, 0xfe, 0xff)) throw encoding('UTF-32', '');
  if (starts(0xff, 0xfe) || starts(0xfe, 0xff)) throw encoding('UTF-16', '');
  const binary = (kind: string) => new ModelError('', `"${path}" is ${kind}, not a model file`, 'a model file is JSON text; give the path of the .json file', path);
  if (starts(0x89, 0x50, 0x4e, 0x47)) throw binary('a PNG image');
  if (starts(0x25, 0x50, 0x44, 0x46)) throw binary('a PDF document');
  if (starts(0x50, 0x4b, 0x03, 0x04)) throw binary('a ZIP archive (or an office document)');
  if (starts(0x1f, 0x8b)) throw binary('a gzip-compressed file');
  // Without a mark, JSON text in UTF-32 or UTF-16 starts with an ASCII character padded by zero bytes.
  if (bytes.length >= 4 && bytes[0] !== 0 && bytes[1] === 0 && bytes[2] === 0 && bytes[3] === 0) throw encoding('UTF-32', ' (little-endian, without a byte-order mark)');
  if (bytes.length >= 4 && bytes[0] === 0 && bytes[1] === 0 && bytes[2] === 0 && bytes[3] !== 0) throw encoding('UTF-32', ' (big-endian, without a byte-order mark)');
  if (bytes.length >= 2 && bytes[0] !== 0 && bytes[1] === 0) throw encoding('UTF-16', ' (little-endian, without a byte-order mark)');
  if (bytes.length >= 2 && bytes[0] === 0 && bytes[1] !== 0) throw encoding('UTF-16', ' (big-endian, without a byte-order mark)');
  const probe = bytes.subarray(0, 8192);
  let zeros = 0;
  for (const b of probe) if (b === 0) zeros++;
  if (zeros > probe.length / 16) throw binary('a binary file');
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new ModelError('', `"${path}" is not UTF-8 text`, 'save it as UTF-8 (most editors offer this under "encoding")', path);
  }
  const nul = text.indexOf('\u0000');
  if (nul >= 0) {
    throw new Placer(text).place(
      new ModelError('', 'a NUL character (a zero byte) in the text: JSON text cannot hold one', 'remove it; zero bytes come from a damaged copy, a file saved in another encoding, or a binary file', path),
      nul,
    );
  }
  return text;
}
