/**
 * Turns zod's validation issues into problems a person can act on: where (a JSON path), what
 * was found, what is wrong in plain words, and how to fix it. zod's own wording ("Invalid
 * input") is never shown.
 *
 * Unions are the hard part: when a value matches no option, zod reports every option's
 * complaints. Here the option the writer most likely meant is chosen (by the kind of value,
 * then by which of its field names the object uses) and only that option's complaints are
 * reported; when no option fits, the union is described as a whole with its forms.
 *
 * The schema is walked through zod's definition objects (`_zod.def`), which zod 4 documents
 * as its introspection surface; the few fields used are typed in `Def` below.
 */
import type { z } from 'zod';
import { ArcSpec, Load, Loop, Selector, Support, Target, Vertex } from './schema.js';
import { closest, didYouMean, quoteList } from './suggest.js';
import { quoteText } from './errors.js';

type Part = string | number;

/** A problem before it is placed in the file. */
export interface Problem {
  parts: Part[];
  message: string;
  hint?: string;
  /** what to point at: the field name, the value, or (for a missing field) the enclosing object */
  at: 'key' | 'value' | 'parent';
  /** set on "missing field" problems, so a misspelt name can absorb them */
  missingKey?: string;
  /** set on "unknown field" problems that have a suggestion */
  suggested?: string;
}

interface Check {
  _zod: { def: { check: string; value?: number; inclusive?: boolean; minimum?: number; maximum?: number; format?: string } };
}
interface Def {
  type: string;
  innerType?: Schema;
  shape?: Record<string, Schema>;
  element?: Schema;
  items?: Schema[];
  options?: Schema[];
  discriminator?: string;
  entries?: Record<string, string | number>;
  values?: unknown[];
  valueType?: Schema;
  checks?: Check[];
}
type Schema = z.ZodType;

const def = (s: Schema): Def => (s as unknown as { _zod: { def: Def } })._zod.def;

const WRAPPERS = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'nonoptional', 'catch']);

function unwrap(s: Schema): Schema {
  let cur = s;
  while (WRAPPERS.has(def(cur).type) && def(cur).innerType) cur = def(cur).innerType!;
  return cur;
}

function isOptional(s: Schema): boolean {
  let cur = s;
  while (WRAPPERS.has(def(cur).type)) {
    if (def(cur).type === 'optional' || def(cur).type === 'default' || def(cur).type === 'prefault') return true;
    cur = def(cur).innerType!;
  }
  return false;
}

/** The first description found on the wrappers or the schema inside them. */
function descriptionOf(s: Schema): string | undefined {
  let cur: Schema | undefined = s;
  while (cur) {
    if (cur.description) return cur.description;
    cur = WRAPPERS.has(def(cur).type) ? def(cur).innerType : undefined;
  }
  return undefined;
}

// ---------------------------------------------------------------------------------------------
// What the unions are called, and their forms, for messages.

interface UnionWords {
  noun: string;
  forms: string;
}
const UNION_WORDS = new Map<Schema, UnionWords>([
  [
    Selector,
    {
      noun: 'a selector',
      forms:
        'a selector is a tag name such as "load", or one of {"x": value}, {"y": value}, {"line": [[x1, y1], [x2, y2]]}, {"hole": number or name}, {"outline": true}, {"box": [[xmin, ymin], [xmax, ymax]]}',
    },
  ],
  [Target, { noun: 'a selector or a list of selectors', forms: 'write one selector (a tag name such as "load", or {"x": value}, {"hole": 1}, ...) or a list of them' }],
  [
    ArcSpec,
    {
      noun: 'an arc',
      forms: 'an arc is {"radius": r, "turn": "ccw" or "cw"}, {"center": [x, y], "turn": "ccw" or "cw"}, or {"through": [x, y]}',
    },
  ],
  [Vertex, { noun: 'a vertex', forms: 'a vertex is [x, y], or {"at": [x, y]} with any of "round", "edge" and "arc"' }],
  [Loop, { noun: 'a loop', forms: 'a loop is an object with a "shape", for example {"shape": "circle", "center": [0, 0], "diameter": 10}' }],
  [Support, { noun: 'a support', forms: 'a support is an object with a "type", for example {"type": "symmetry", "on": "sym-x"} or {"type": "pin", "at": [0, 0], "fix": "y"}' }],
  [Load, { noun: 'a load', forms: 'a load is an object with a "type", for example {"type": "traction", "on": "load", "normal": 100}' }],
]);

function unionWords(u: Schema): UnionWords {
  const known = UNION_WORDS.get(u);
  if (known) return known;
  const disc = def(u).discriminator;
  if (disc) {
    const tags = (def(u).options ?? []).flatMap((o) => (def(unwrap(def(unwrap(o)).shape![disc])).values ?? []).map(String));
    return { noun: `an object with "${disc}": ${quoteList(tags)}`, forms: `give an object whose "${disc}" is ${quoteList(tags)}` };
  }
  const forms = (def(u).options ?? []).map((o) => expectedPhrase(o));
  return { noun: forms.join(' or '), forms: `write ${forms.join(', or ')}` };
}

// ---------------------------------------------------------------------------------------------
// Kinds of values and which options accept them.

type Kind = 'string' | 'number' | 'boolean' | 'object' | 'array' | 'null' | 'undefined';

function kindOfValue(v: unknown): Kind {
  if (v === undefined) return 'undefined';
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'array';
  const t = typeof v;
  return t === 'string' || t === 'number' || t === 'boolean' ? t : 'object';
}

function accepts(s: Schema, k: Kind): boolean {
  const d = def(unwrap(s));
  switch (d.type) {
    case 'string':
    case 'enum':
      return k === 'string';
    case 'number':
      return k === 'number';
    case 'boolean':
      return k === 'boolean';
    case 'literal':
      return (d.values ?? []).some((v) => kindOfValue(v) === k);
    case 'object':
    case 'record':
      return k === 'object';
    case 'array':
    case 'tuple':
      return k === 'array';
    case 'union':
      return (d.options ?? []).some((o) => accepts(o, k));
    default:
      return true;
  }
}

interface Fit {
  known: number;
  missing: number;
}

/** How well an object value fits an object schema (or the best option of a union of them). */
function objectFit(s: Schema, v: Record<string, unknown>): Fit {
  const d = def(unwrap(s));
  if (d.type === 'union') {
    let best: Fit = { known: 0, missing: Infinity };
    for (const o of d.options ?? []) {
      if (!accepts(o, 'object')) continue;
      const f = objectFit(o, v);
      if (f.known > best.known || (f.known === best.known && f.missing < best.missing)) best = f;
    }
    return best;
  }
  const shape = d.shape ?? {};
  let known = 0;
  for (const k of Object.keys(v)) if (k in shape) known++;
  let missing = 0;
  for (const [k, f] of Object.entries(shape)) if (!isOptional(f) && !(k in v)) missing++;
  return { known, missing };
}

function objectKeys(s: Schema): string[] {
  const d = def(unwrap(s));
  if (d.type === 'union') return [...new Set((d.options ?? []).flatMap((o) => (accepts(o, 'object') ? objectKeys(o) : [])))];
  return Object.keys(d.shape ?? {});
}

type Choice = { index: number } | { none: true } | { tie: number[] };

/** The option of a plain (not discriminated) union that the value was most likely meant to be. */
function chooseOption(options: readonly Schema[], v: unknown): Choice {
  const k = kindOfValue(v);
  const fits = options.map((o, i) => (accepts(o, k) ? i : -1)).filter((i) => i >= 0);
  if (fits.length === 0) return { none: true };
  if (fits.length === 1) return { index: fits[0] };
  if (k === 'object') {
    const o = v as Record<string, unknown>;
    const scored = fits.map((i) => ({ i, f: objectFit(options[i], o) }));
    scored.sort((a, b) => b.f.known - a.f.known || a.f.missing - b.f.missing);
    const best = scored[0];
    if (best.f.known === 0) return { tie: fits };
    const tied = scored.filter((s) => s.f.known === best.f.known && s.f.missing === best.f.missing);
    return tied.length === 1 ? { index: best.i } : { tie: tied.map((s) => s.i) };
  }
  if (k === 'array') {
    const n = (v as unknown[]).length;
    const exact = fits.find((i) => def(unwrap(options[i])).type === 'tuple' && def(unwrap(options[i])).items!.length === n);
    return { index: exact ?? fits[0] };
  }
  return { index: fits[0] };
}

/** The option of a discriminated union chosen by the discriminator's value, if any. */
function discriminatedOption(u: Schema, v: unknown): Schema | undefined {
  const d = def(u);
  if (!d.discriminator || kindOfValue(v) !== 'object') return undefined;
  const tag = (v as Record<string, unknown>)[d.discriminator];
  return (d.options ?? []).find((o) => (def(unwrap(def(unwrap(o)).shape![d.discriminator!])).values ?? []).includes(tag));
}

function childOf(v: unknown, key: Part): unknown {
  if (v === null || typeof v !== 'object') return undefined;
  return (v as Record<string, unknown>)[key as string];
}

function valueAtPath(root: unknown, parts: readonly Part[]): unknown {
  let v = root;
  for (const p of parts) v = childOf(v, p);
  return v;
}

/**
 * The schema that governs the value at parts, following the data through unions on the way.
 * A union at the end of the path is returned as the union, unless resolveLast asks for the
 * option the value there was meant to be.
 */
function schemaAtPath(root: Schema, data: unknown, parts: readonly Part[], resolveLast = false): Schema | undefined {
  let s: Schema | undefined = root;
  let v = data;
  for (let i = 0; i <= parts.length && s; i++) {
    // The schema at the end keeps its wrappers: a description may sit on an optional().
    if (i === parts.length && !resolveLast) return s;
    s = unwrap(s);
    let d = def(s);
    while (d.type === 'union') {
      let next: Schema | undefined;
      if (d.discriminator) next = discriminatedOption(s, v);
      else {
        const c = chooseOption(d.options ?? [], v);
        next = 'index' in c ? d.options![c.index] : undefined;
      }
      if (!next) return i === parts.length ? s : undefined;
      s = unwrap(next);
      d = def(s);
    }
    if (i === parts.length) return s;
    const p = parts[i];
    if (d.type === 'object') s = d.shape?.[p as string];
    else if (d.type === 'array') s = d.element;
    else if (d.type === 'tuple') s = d.items?.[p as number];
    else if (d.type === 'record') s = d.valueType;
    else return undefined;
    v = childOf(v, p);
  }
  return s;
}

// ---------------------------------------------------------------------------------------------
// Words for values and expectations.

/** A short picture of a value: 12, the text "abc", a list [1, 2], an object {"a": 1}. */
function showValue(v: unknown): string {
  if (v === undefined) return 'nothing';
  if (typeof v === 'number' && !Number.isFinite(v)) return String(v);
  let j: string;
  try {
    j = JSON.stringify(v);
  } catch {
    j = String(v);
  }
  if (j.length > 44) j = j.slice(0, 40) + ' ...' + (Array.isArray(v) ? ']' : typeof v === 'object' && v ? '}' : typeof v === 'string' ? '"' : '');
  switch (kindOfValue(v)) {
    case 'string':
      return `the text ${j}`;
    case 'array':
      return (v as unknown[]).length === 0 ? 'an empty list []' : `the list ${j}`;
    case 'object':
      return Object.keys(v as object).length === 0 ? 'an empty object {}' : `the object ${j}`;
    default:
      return j;
  }
}

interface Bounds {
  min?: number;
  minInclusive: boolean;
  max?: number;
  maxInclusive: boolean;
  int: boolean;
}

function numberBounds(s: Schema): Bounds {
  const b: Bounds = { minInclusive: true, maxInclusive: true, int: false };
  for (const c of def(unwrap(s)).checks ?? []) {
    const cd = c._zod.def;
    if (cd.check === 'greater_than' && cd.value !== undefined && (b.min === undefined || cd.value >= b.min)) {
      b.min = cd.value;
      b.minInclusive = cd.inclusive ?? true;
    } else if (cd.check === 'less_than' && cd.value !== undefined && (b.max === undefined || cd.value <= b.max)) {
      b.max = cd.value;
      b.maxInclusive = cd.inclusive ?? true;
    } else if (cd.check === 'number_format' && cd.format && /int/.test(cd.format)) b.int = true;
  }
  return b;
}

/** What a number must be, to follow "must be": "a positive number (greater than 0)", "at least 0 and less than 0.5". */
function numberPhrase(b: Bounds): string {
  if (b.min === 0 && !b.minInclusive && b.max === undefined) return b.int ? 'a whole number, 1 or more' : 'a positive number (greater than 0)';
  const lo = b.min === undefined ? '' : b.int && !b.minInclusive ? `at least ${b.min + 1}` : b.minInclusive ? `at least ${b.min}` : `greater than ${b.min}`;
  const hi = b.max === undefined ? '' : b.maxInclusive ? `at most ${b.max}` : `less than ${b.max}`;
  const range = [lo, hi].filter(Boolean).join(' and ');
  if (!range) return b.int ? 'a whole number' : 'a number';
  return b.int ? `a whole number ${range}` : range;
}

function isPoint(s: Schema): boolean {
  const d = def(unwrap(s));
  return d.type === 'tuple' && d.items?.length === 2 && d.items.every((i) => def(unwrap(i)).type === 'number');
}

/** What a schema wants, as a noun phrase: "a positive number", "a point [x, y]", ... */
function expectedPhrase(s: Schema): string {
  const u = unwrap(s);
  const d = def(u);
  switch (d.type) {
    case 'number':
      return numberPhrase(numberBounds(u));
    case 'string':
      return 'text in double quotes';
    case 'boolean':
      return 'true or false';
    case 'enum':
      return `one of ${quoteList(Object.values(d.entries ?? {}).map(String))}`;
    case 'literal': {
      const vals = d.values ?? [];
      return vals.map((v) => JSON.stringify(v)).join(' or ');
    }
    case 'tuple':
      if (isPoint(u)) return 'a point [x, y]';
      if (d.items?.length === 2 && d.items.every(isPoint)) return 'two points [[x1, y1], [x2, y2]]';
      return `a list of ${d.items?.length} items`;
    case 'array':
      return 'a list [...]';
    case 'object': {
      const req = Object.entries(d.shape ?? {})
        .filter(([, f]) => !isOptional(f))
        .map(([k]) => `"${k}": ...`);
      return req.length ? `an object {${req.join(', ')}}` : 'an object {...}';
    }
    case 'record':
      return 'an object of named values';
    case 'union':
      return unionWords(u).noun;
    default:
      return 'a value of another kind';
  }
}

// ---------------------------------------------------------------------------------------------

export interface TranslateContext {
  root: Schema;
  data: unknown;
  /** replaces "length units", "stress units", "force units" in descriptions with the file's */
  units: { length: string; force: string; stress: string };
}

function withUnits(text: string, ctx: TranslateContext): string {
  return text
    .replace(/\b(model )?length units\b/g, `length units (${ctx.units.length})`)
    .replace(/\bstress units\b/g, `stress units (${ctx.units.stress})`)
    .replace(/\bforce units\b/g, `force units (${ctx.units.force})`)
    .replace(/\bforce x length\b/g, `force x length (${ctx.units.force}*${ctx.units.length})`);
}

/** Special words for a few fields, keyed by the path with list indices replaced by []. */
function specialHint(pattern: string, v: unknown, ctx: TranslateContext): string | undefined {
  switch (pattern) {
    case 'material.nu':
      return typeof v === 'number' && v >= 0.5
        ? "Poisson's ratio must stay below 0.5: 0.5 is an incompressible solid, which these displacement elements cannot represent (they lock); structural metals are about 0.27 to 0.34"
        : "Poisson's ratio of an isotropic solid used here lies in 0 <= nu < 0.5; structural metals are about 0.27 to 0.34";
    case 'material.E':
      return `Young's modulus in stress units (${ctx.units.stress}); for steel about 210 GPa${ctx.units.stress === 'MPa' ? ', written 210000' : ''}`;
    case 'thickness':
      return `the plate thickness in length units (${ctx.units.length}), greater than 0`;
    case 'loads':
      return 'add a load, for example {"type": "traction", "on": "load", "normal": 100}';
    default:
      return undefined;
  }
}

function patternOf(parts: readonly Part[]): string {
  return parts.map((p) => (typeof p === 'number' ? '[]' : p)).join('.').replace(/\.\[\]/g, '[]');
}

/**
 * Problems for one zod issue. The issue's path is relative to base, and baseSchema is the
 * schema that governs the value at base (the root, or the chosen option of a union there).
 */
function translateIssue(issue: z.core.$ZodIssue, base: readonly Part[], baseSchema: Schema, ctx: TranslateContext): Problem[] {
  const rel = issue.path as Part[];
  const parts: Part[] = [...base, ...rel];
  const v = valueAtPath(ctx.data, parts);
  const pattern = patternOf(parts);
  const baseValue = valueAtPath(ctx.data, base);
  const here = (resolveLast = false) => schemaAtPath(baseSchema, baseValue, rel, resolveLast);
  const hintFor = () => {
    const special = specialHint(pattern, v, ctx);
    if (special) return special;
    const s = here();
    const desc = s && descriptionOf(s);
    const key = parts[parts.length - 1];
    return desc ? (typeof key === 'string' ? `"${key}": ${withUnits(desc, ctx)}` : withUnits(desc, ctx)) : undefined;
  };
  // A required field that is absent, whatever kind of value it wanted.
  if (v === undefined && parts.length > 0 && issue.code !== 'unrecognized_keys' && !(issue.code === 'invalid_union' && issue.discriminator !== undefined)) {
    const s = here();
    const key = parts[parts.length - 1];
    const desc = hintFor();
    return [
      {
        parts,
        at: 'parent',
        message: `the required field "${key}" is missing`,
        hint: `add "${key}": ${s ? expectedPhrase(s) : 'a value'}${desc ? ` (${desc})` : ''}`,
        missingKey: String(key),
      },
    ];
  }
  switch (issue.code) {
    case 'invalid_type': {
      const s = here();
      const want = s ? expectedPhrase(s) : issue.expected === 'int' ? 'a whole number' : `a ${issue.expected}`;
      let hint = s && def(unwrap(s)).type === 'union' ? unionWords(unwrap(s)).forms : hintFor();
      if (typeof v === 'string' && (issue.expected === 'number' || issue.expected === 'int')) {
        const m = /^\s*(-?[0-9.]+(?:e[-+]?[0-9]+)?)\s*([A-Za-z/^0-9]*)\s*$/i.exec(v);
        if (m && m[2]) hint = `write the number alone, without the unit "${m[2]}": all values are in the file's units (${ctx.units.length}, ${ctx.units.force}, ${ctx.units.stress}); set "units" to change them`;
        else if (m) hint = `remove the quotes: ${m[1]}`;
      } else if (typeof v === 'number' && issue.expected === 'string') {
        hint = `put it in double quotes: "${v}"`;
      }
      return [{ parts, at: 'value', message: `must be ${want}; found ${showValue(v)}`, hint }];
    }
    case 'too_small':
    case 'too_big': {
      const s = here();
      if (issue.origin === 'number') {
        const b = s ? numberBounds(s) : { minInclusive: true, maxInclusive: true, int: false };
        if (!s) {
          if (issue.code === 'too_small') Object.assign(b, { min: Number(issue.minimum), minInclusive: issue.inclusive ?? true });
          else Object.assign(b, { max: Number(issue.maximum), maxInclusive: issue.inclusive ?? true });
        }
        return [{ parts, at: 'value', message: `must be ${numberPhrase(b)}; found ${showValue(v)}`, hint: hintFor() }];
      }
      if (issue.origin === 'array') {
        const n = Array.isArray(v) ? v.length : 0;
        if (s && def(unwrap(s)).type === 'tuple') {
          return [{ parts, at: 'value', message: `must be ${expectedPhrase(s)}, with exactly ${def(unwrap(s)).items!.length} items; found ${showValue(v)}`, hint: hintFor() }];
        }
        if (pattern === 'loads') return [{ parts, at: 'value', message: 'the model has no loads: it needs at least one', hint: hintFor() }];
        if (pattern === 'supports') return [{ parts, at: 'value', message: 'the model has no supports: the plate would be free to move', hint: SUPPORT_HINT }];
        const limit = issue.code === 'too_small' ? Number(issue.minimum) : Number(issue.maximum);
        const what = issue.code === 'too_small' ? `at least ${limit}` : `at most ${limit}`;
        const noun = pattern.endsWith('path') ? 'vertices' : 'items';
        return [{ parts, at: 'value', message: `needs ${what} ${noun}; found ${n}`, hint: hintFor() }];
      }
      if (issue.origin === 'string') return [{ parts, at: 'value', message: 'must not be empty', hint: hintFor() }];
      return [{ parts, at: 'value', message: `is out of range; found ${showValue(v)}`, hint: hintFor() }];
    }
    case 'invalid_value': {
      const vals = issue.values.map(String);
      if (issue.values.length === 1 && typeof issue.values[0] !== 'string') {
        return [{ parts, at: 'value', message: `must be ${JSON.stringify(issue.values[0])}; found ${showValue(v)}`, hint: hintFor() }];
      }
      if (typeof v === 'string') {
        return [{ parts, at: 'value', message: `"${quoteText(v)}" is not one of ${quoteList(vals)}${didYouMean(v, vals)}`, hint: hintFor() }];
      }
      return [{ parts, at: 'value', message: `must be one of ${quoteList(vals)}; found ${showValue(v)}`, hint: hintFor() }];
    }
    case 'unrecognized_keys': {
      const s = here(true);
      const allowed = s ? objectKeys(s) : [];
      return issue.keys.map((key) => {
        const c = closest(key, allowed);
        return {
          parts: [...parts, key],
          at: 'key' as const,
          message: `unknown field "${quoteText(key)}"${c ? `: did you mean "${c}"?` : ''}`,
          hint: c ? undefined : allowed.length ? `the fields allowed here are ${quoteList(allowed, 'and')}` : 'remove it',
          suggested: c,
        };
      });
    }
    case 'invalid_union':
      return translateUnion(issue, base, baseSchema, ctx);
    case 'invalid_format':
    case 'not_multiple_of':
    case 'invalid_key':
    case 'invalid_element':
    case 'custom':
      return [{ parts, at: 'value', message: `is not valid here; found ${showValue(v)}`, hint: hintFor() }];
  }
}

const SUPPORT_HINT =
  'add supports that stop rigid motion: "symmetry" on mirror edges, a "fixed" or "roller" edge, or "pin" supports at two points';

function translateUnion(issue: z.core.$ZodIssueInvalidUnion, base: readonly Part[], baseSchema: Schema, ctx: TranslateContext): Problem[] {
  const rel = issue.path as Part[];
  const baseValue = valueAtPath(ctx.data, base);
  if (issue.discriminator !== undefined) {
    // zod puts the discriminator on the path; the object is one level up.
    const disc = issue.discriminator;
    const objRel = rel[rel.length - 1] === disc ? rel.slice(0, -1) : rel;
    const objParts = [...base, ...objRel];
    const u = schemaAtPath(baseSchema, baseValue, objRel);
    const obj = valueAtPath(ctx.data, objParts);
    const options = (issue as { options?: unknown[] }).options?.map(String) ?? [];
    if (kindOfValue(obj) !== 'object') {
      return [{ parts: objParts, at: 'value', message: `must be ${u ? unionWords(u).noun : 'an object'}; found ${showValue(obj)}`, hint: u ? unionWords(u).forms : undefined }];
    }
    const tag = (obj as Record<string, unknown>)[disc];
    if (tag === undefined) {
      const guess = guessOption(u, disc, obj as Record<string, unknown>);
      return [
        {
          parts: [...objParts, disc],
          at: 'parent',
          message: `the required field "${disc}" is missing`,
          hint: `add "${disc}": one of ${quoteList(options)}${guess ? `; from its other fields this looks like "${disc}": "${guess}"` : ''}`,
          missingKey: disc,
        },
      ];
    }
    if (typeof tag === 'string') {
      return [{ parts: [...objParts, disc], at: 'value', message: `"${quoteText(tag)}" is not one of ${quoteList(options)}${didYouMean(tag, options)}`, hint: `"${disc}" chooses the kind; use one of ${quoteList(options)}` }];
    }
    return [{ parts: [...objParts, disc], at: 'value', message: `must be one of ${quoteList(options)}; found ${showValue(tag)}` }];
  }
  const parts = [...base, ...rel];
  const v = valueAtPath(ctx.data, parts);
  const u = schemaAtPath(baseSchema, baseValue, rel);
  const options = u ? def(unwrap(u)).options : undefined;
  if (!u || !options || def(unwrap(u)).type !== 'union') {
    return [{ parts, at: 'value', message: `is not valid here; found ${showValue(v)}` }];
  }
  const words = unionWords(unwrap(u));
  const choice = chooseOption(options, v);
  if ('index' in choice) {
    // A union of a plain value and other forms ("auto" or a cut; a hole number or a name):
    // a wrong plain value is best described by all the forms, not by the one it resembles.
    const chosen = def(unwrap(options[choice.index])).type;
    const leaf = !['object', 'array', 'tuple', 'union', 'record'].includes(chosen);
    if (leaf && options.length > 1 && !UNION_WORDS.has(unwrap(u))) {
      return [{ parts, at: 'value', message: `must be ${words.noun}; found ${showValue(v)}`, hint: descriptionOf(u) ?? words.forms }];
    }
    const sub = issue.errors[choice.index] ?? [];
    const out = sub.flatMap((i) => translateIssue(i, parts, options[choice.index], ctx));
    if (out.length) return out;
    return [{ parts, at: 'value', message: `is not ${words.noun}; found ${showValue(v)}`, hint: words.forms }];
  }
  if ('none' in choice) {
    return [{ parts, at: 'value', message: `must be ${words.noun}; found ${showValue(v)}`, hint: words.forms }];
  }
  // An object that fits no option clearly.
  const o = v as Record<string, unknown>;
  const allKeys = [...new Set(choice.tie.flatMap((i) => objectKeys(options[i])))];
  const unknown = Object.keys(o).filter((k) => !allKeys.includes(k));
  const knownHere = Object.keys(o).filter((k) => allKeys.includes(k));
  if (unknown.length > 0 && knownHere.length === 0) {
    return unknown.map((k) => ({
      parts: [...parts, k],
      at: 'key' as const,
      message: `is not ${words.noun}: unknown field "${quoteText(k)}"${didYouMean(k, allKeys)}`,
      hint: words.forms,
    }));
  }
  if (knownHere.length === 0) return [{ parts, at: 'value', message: `is not ${words.noun}; found ${showValue(v)}`, hint: words.forms }];
  return [{ parts, at: 'value', message: `mixes fields of different forms of ${words.noun.replace(/^an? /, '')} (${quoteList(knownHere, 'and')})`, hint: words.forms }];
}

/** For a discriminated union with the discriminator left out, the option whose fields cover the others. */
function guessOption(u: Schema | undefined, disc: string, obj: Record<string, unknown>): string | undefined {
  if (!u) return undefined;
  const d = def(unwrap(u));
  const keys = Object.keys(obj).filter((k) => k !== disc);
  if (keys.length === 0) return undefined;
  const matches: string[] = [];
  for (const o of d.options ?? []) {
    const shape = def(unwrap(o)).shape ?? {};
    if (keys.every((k) => k in shape)) {
      const vals = def(unwrap(shape[disc])).values ?? [];
      matches.push(...vals.map(String));
    }
  }
  return matches.length === 1 ? matches[0] : undefined;
}

/** All problems for a failed parse, with a misspelt field absorbing its "missing" twin. */
export function translateIssues(issues: readonly z.core.$ZodIssue[], ctx: TranslateContext): Problem[] {
  const all = issues.flatMap((i) => translateIssue(i, [], ctx.root, ctx));
  const key = (p: readonly Part[]) => JSON.stringify(p);
  const suggested = new Set<string>();
  for (const p of all) if (p.suggested) suggested.add(key([...p.parts.slice(0, -1), p.suggested]));
  const out: Problem[] = [];
  const seen = new Set<string>();
  for (const p of all) {
    if (p.missingKey !== undefined && suggested.has(key(p.parts))) continue;
    const id = key(p.parts) + '\u0000' + p.message;
    if (seen.has(id)) continue;
    seen.add(id);
    out.push(p);
  }
  return out;
}
