/**
 * A scan of JSON text that knows where things are. JSON.parse gives the values; this scan
 * gives what JSON.parse does not: the line and column of every value and field name (so a
 * problem found later can point into the file), a plain-words explanation of a syntax error
 * with its exact position (Node's own messages name a position only for some errors), and
 * two faults JSON.parse lets through silently: a field given twice in one object (the last
 * one wins) and a number too large for a double (it becomes Infinity).
 *
 * The grammar is RFC 8259 exactly. The scan is a loop over an explicit stack of open objects
 * and lists, so deep nesting cannot overflow the call stack.
 */
import { formatPath } from './errors.js';

/**
 * Values nested deeper than this are not placed one by one (a problem there points at the
 * nearest placed ancestor). Model files nest about eight deep; without a limit, recording a
 * path for every value of a pathologically deep file would take memory quadratic in its depth.
 * Syntax is still checked at every depth.
 */
const PLACED_DEPTH = 64;

/** The path of a field of the object at path, written as formatPath writes it. */
function memberPath(path: string, key: string): string {
  return formatPath(path ? [path, key] : [key]);
}

export interface JsonSyntaxProblem {
  /** 0-based offset into the text where the problem is */
  offset: number;
  message: string;
  hint?: string;
}

export interface JsonDuplicate {
  path: string;
  key: string;
  firstOffset: number;
  offset: number;
}

/**
 * Field names that name the machinery of JavaScript objects rather than data. No model field
 * has one of these names; a file that uses one is refused (as an unknown field) before any
 * object is built from it, so it can never reach an object's prototype.
 */
const RESERVED_KEYS: ReadonlySet<string> = new Set(['__proto__', 'constructor', 'prototype']);

export interface JsonScan {
  /** the first syntax error, if the text is not JSON */
  error?: JsonSyntaxProblem;
  /** offset of the value at each JSON path ('' is the whole document) */
  valueAt: Map<string, number>;
  /** offset of the field name for each object member's path */
  keyAt: Map<string, number>;
  duplicates: JsonDuplicate[];
  /** numbers that overflow to Infinity */
  hugeNumbers: { path: string; offset: number; text: string }[];
  /** field names in RESERVED_KEYS, where they are */
  reservedKeys: { path: string; key: string; offset: number }[];
  /** the deepest nesting of objects and lists, and where it is first reached */
  deepest: { depth: number; offset: number };
}

interface Frame {
  kind: 'object' | 'array';
  open: number;
  /** JSON path of this object or list (its nearest recorded ancestor's when deeper than PLACED_DEPTH) */
  path: string;
  keys: Map<string, number>;
  index: number;
  /** the field name waiting for its value */
  key?: string;
  /** offset of the last comma, for the trailing-comma message */
  comma: number;
}

const enum Expect {
  Value,
  KeyOrEnd,
  Key,
  Colon,
  CommaOrEndObject,
  ValueOrEnd,
  CommaOrEndArray,
  Nothing,
}

class Stop {
  constructor(readonly problem: JsonSyntaxProblem) {}
}

function isSpace(c: number): boolean {
  return c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09;
}

function isWordChar(c: string | undefined): boolean {
  return c !== undefined && /[A-Za-z0-9_$]/.test(c);
}

/** Scans text as JSON; never throws. */
export function scanJson(text: string): JsonScan {
  const scan: JsonScan = { valueAt: new Map(), keyAt: new Map(), duplicates: [], hugeNumbers: [], reservedKeys: [], deepest: { depth: 0, offset: 0 } };
  const stack: Frame[] = [];
  let pos = 0;
  let expect: Expect = Expect.Value as Expect;
  const n = text.length;
  const fail: (offset: number, message: string, hint?: string) => never = (offset, message, hint) => {
    throw new Stop({ offset, message, hint });
  };
  const where = (offset: number) => {
    const { line, column } = lineColumn(text, offset);
    return `line ${line}, column ${column}`;
  };
  const top = () => stack[stack.length - 1];
  /** JSON path of the value about to be read */
  const pathHere = (): string => {
    const f = top();
    if (!f) return '';
    if (stack.length > PLACED_DEPTH) return f.path;
    return f.kind === 'object' ? memberPath(f.path, f.key!) : `${f.path}[${f.index}]`;
  };
  /** what may follow a complete value */
  const afterValue = (): Expect => {
    const f = top();
    if (!f) return Expect.Nothing;
    return f.kind === 'object' ? Expect.CommaOrEndObject : Expect.CommaOrEndArray;
  };
  const skipSpace = () => {
    while (pos < n && isSpace(text.charCodeAt(pos))) pos++;
  };
  const word = (at: number) => {
    let e = at;
    while (e < n && isWordChar(text[e])) e++;
    return text.slice(at, e);
  };

  const readString = (): string => {
    const start = pos;
    pos++; // opening quote
    let out = '';
    while (true) {
      if (pos >= n) fail(start, `the text value starting at ${where(start)} is never closed`, 'add the closing double quote (")');
      const ch = text[pos];
      const code = text.charCodeAt(pos);
      if (ch === '"') {
        pos++;
        return out;
      }
      if (ch === '\\') {
        const e = text[pos + 1];
        const simple: Record<string, string> = { '"': '"', '\\': '\\', '/': '/', b: '\b', f: '\f', n: '\n', r: '\r', t: '\t' };
        if (e !== undefined && e in simple) {
          out += simple[e];
          pos += 2;
          continue;
        }
        if (e === 'u') {
          const hex = text.slice(pos + 2, pos + 6);
          if (!/^[0-9A-Fa-f]{4}$/.test(hex)) fail(pos, `"\\u" must be followed by four hexadecimal digits`, 'write the character itself, or \\u followed by its four-digit code');
          out += String.fromCharCode(parseInt(hex, 16));
          pos += 6;
          continue;
        }
        fail(pos, `"\\${e ?? ''}" is not a valid escape in a JSON text value`, 'write "\\\\" for a backslash (as in a Windows file path), or use forward slashes');
      }
      if (code < 0x20) {
        if (ch === '\n' || ch === '\r') fail(start, `the text value starting at ${where(start)} runs past the end of its line`, 'close it with a double quote (") on the same line; write \\n for a line break inside text');
        fail(pos, 'a control character (such as a tab) inside a text value', 'write it as an escape: \\t for a tab');
      }
      out += ch;
      pos++;
    }
  };

  const readNumber = (): void => {
    const start = pos;
    let p = pos;
    if (text[p] === '-') p++;
    if (text[p] === '0') {
      p++;
      if (text[p] === 'x' || text[p] === 'X') fail(start, 'hexadecimal numbers are not allowed in JSON', 'write the number in decimal');
      if (text[p] !== undefined && /[0-9]/.test(text[p])) fail(start, `"${word(start)}": a number must not start with 0 followed by more digits`, 'remove the leading zero');
    } else if (text[p] !== undefined && /[1-9]/.test(text[p])) {
      while (text[p] !== undefined && /[0-9]/.test(text[p])) p++;
    } else if (text[p] === '.') {
      fail(start, `a number must have a digit before its decimal point`, `write 0${text.slice(p, p + 8).match(/^\.[0-9]*/)?.[0] ?? '.5'}`);
    } else {
      const w = word(p);
      if (w === 'Infinity') fail(start, 'Infinity is not a JSON number', 'every number must be finite');
      fail(start, 'a "-" must be followed by digits', 'write the number, for example -5');
    }
    if (text[p] === '.') {
      p++;
      if (!(text[p] !== undefined && /[0-9]/.test(text[p]))) fail(start, 'a decimal point must be followed by a digit', `write ${text.slice(start, p)}0`);
      while (text[p] !== undefined && /[0-9]/.test(text[p])) p++;
    }
    if (text[p] === 'e' || text[p] === 'E') {
      p++;
      if (text[p] === '+' || text[p] === '-') p++;
      if (!(text[p] !== undefined && /[0-9]/.test(text[p]))) fail(start, 'the exponent of a number must have digits', 'for example 2.5e-3');
      while (text[p] !== undefined && /[0-9]/.test(text[p])) p++;
    }
    if (isWordChar(text[p]) || text[p] === '.') fail(start, `"${text.slice(start, p) + word(p)}" is not a number`, 'write a plain decimal number such as 12.5 or 1e-3, without units');
    const lexeme = text.slice(start, p);
    if (!Number.isFinite(Number(lexeme))) scan.hugeNumbers.push({ path: pathHere(), offset: start, text: lexeme });
    pos = p;
  };

  const badValueStart: (at: number) => never = (at) => {
    const ch = text[at];
    if (ch === "'") fail(at, 'text values and field names need double quotes ("), not single quotes', 'replace the single quotes with double quotes');
    if (ch === '/' && (text[at + 1] === '/' || text[at + 1] === '*')) fail(at, 'JSON does not allow comments', 'remove the comment; put free text in a "note" field');
    if (ch === '+') fail(at, 'a JSON number has no plus sign', 'remove the "+"');
    if (ch === '.') fail(at, 'a number must have a digit before its decimal point', 'write 0.5, not .5');
    const w = word(at);
    if (w === 'NaN' || w === 'Infinity') fail(at, `${w} is not allowed in JSON: every number must be finite`);
    if (w === 'undefined') fail(at, 'undefined is not a JSON value', 'leave the field out instead');
    if (['True', 'False', 'TRUE', 'FALSE', 'Null', 'NULL', 'None'].includes(w)) fail(at, `"${w}" is not a JSON value`, 'JSON writes true, false and null in lower case');
    if (w) fail(at, `unexpected word "${w}"`, `a text value needs double quotes: "${w}"`);
    fail(at, `unexpected character "${ch}"`, 'expected a value: a number, "text", true, false, null, an object {...} or a list [...]');
  };

  /** pops the open object or list that closer ends; returns what may follow */
  const closeFrame = (closer: string): Expect => {
    const f = stack.pop()!;
    const want = f.kind === 'object' ? '}' : ']';
    if (closer !== want) {
      fail(
        pos,
        `"${closer}" closes ${closer === '}' ? 'an object' : 'a list'}, but the ${f.kind === 'object' ? 'object' : 'list'} opened at ${where(f.open)} is still open`,
        `check the brackets: this one should be "${want}", or a "${closer === '}' ? '{' : '['}" is missing earlier`,
      );
    }
    pos++;
    return afterValue();
  };

  try {
    while (true) {
      skipSpace();
      const ch = text[pos];
      if (ch === undefined) {
        if (expect === Expect.Nothing) break;
        if (stack.length === 0) fail(pos, text.trim() === '' ? 'the file is empty' : 'the JSON text ends before a value', 'a model file is one JSON object: { "material": ..., "geometry": ... }');
        const f = top();
        fail(
          pos,
          `the file ends inside the ${f.kind === 'object' ? 'object' : 'list'} opened at ${where(f.open)}`,
          `add the missing "${f.kind === 'object' ? '}' : ']'}" (an earlier bracket or quote may be the one missing)`,
        );
      }
      if (ch === '/' && (text[pos + 1] === '/' || text[pos + 1] === '*')) fail(pos, 'JSON does not allow comments', 'remove the comment; put free text in a "note" field');
      const code = text.charCodeAt(pos);
      if (code < 0x20 || code === 0x7f) {
        fail(
          pos,
          code === 0 ? 'a NUL character (a zero byte) in the text: JSON text cannot hold one' : `a control character (code ${code}) in the text, where JSON allows only spaces, tabs and line breaks`,
          'remove it; such characters come from a damaged copy, a file saved in another encoding, or a binary file',
        );
      }
      switch (expect) {
        case Expect.Nothing:
          fail(pos, 'there is more text after the end of the JSON value', 'a model file holds one object; check for a "}" that closes the model too early, or for a second object');
          break;
        case Expect.Value:
        case Expect.ValueOrEnd: {
          if (expect === Expect.ValueOrEnd && ch === ']') {
            const f = top();
            if (f.index > 0) fail(f.comma, 'a comma after the last item of a list', 'remove this comma: JSON allows no comma before "]"');
            expect = closeFrame(']');
            break;
          }
          const path = pathHere();
          if (stack.length <= PLACED_DEPTH) scan.valueAt.set(path, pos);
          if (ch === '{' || ch === '[') {
            stack.push({ kind: ch === '{' ? 'object' : 'array', open: pos, path, keys: new Map(), index: 0, comma: -1 });
            if (stack.length > scan.deepest.depth) scan.deepest = { depth: stack.length, offset: pos };
            pos++;
            expect = ch === '{' ? Expect.KeyOrEnd : Expect.ValueOrEnd;
          } else if (ch === '"') {
            readString();
            expect = afterValue();
          } else if (ch === '-' || (ch >= '0' && ch <= '9')) {
            readNumber();
            expect = afterValue();
          } else if (text.startsWith('true', pos) && !isWordChar(text[pos + 4])) {
            pos += 4;
            expect = afterValue();
          } else if (text.startsWith('false', pos) && !isWordChar(text[pos + 5])) {
            pos += 5;
            expect = afterValue();
          } else if (text.startsWith('null', pos) && !isWordChar(text[pos + 4])) {
            pos += 4;
            expect = afterValue();
          } else if (ch === '}' || ch === ']' || ch === ',') {
            const f = top();
            if (ch === '}' && f?.kind === 'object') fail(pos, `the field "${f.key}" has no value`, 'give it a value after the ":"');
            if (ch === ',' && f?.kind === 'array') fail(pos, 'two commas in a row, or a comma at the start of a list', 'remove the extra comma');
            if (ch === ',' && f?.kind === 'object') fail(pos, `the field "${f.key}" has no value`, 'give it a value after the ":"');
            fail(pos, `unexpected "${ch}"`, 'expected a value');
          } else {
            badValueStart(pos);
          }
          break;
        }
        case Expect.KeyOrEnd:
        case Expect.Key: {
          const f = top();
          if (ch === '}') {
            if (expect === Expect.Key) fail(f.comma, 'a comma after the last field of an object', 'remove this comma: JSON allows no comma before "}"');
            expect = closeFrame('}');
            break;
          }
          if (ch === '"') {
            const at = pos;
            const key = readString();
            const first = f.keys.get(key);
            const placed = stack.length <= PLACED_DEPTH;
            const member = placed ? memberPath(f.path, key) : f.path;
            if (RESERVED_KEYS.has(key)) scan.reservedKeys.push({ path: member, key, offset: at });
            if (first !== undefined) scan.duplicates.push({ path: member, key, firstOffset: first, offset: at });
            else f.keys.set(key, at);
            f.key = key;
            if (placed) scan.keyAt.set(member, at);
            expect = Expect.Colon;
            break;
          }
          if (ch === "'") fail(pos, 'field names need double quotes ("), not single quotes', 'replace the single quotes with double quotes');
          if (ch === ']') fail(pos, `"]" closes a list, but the object opened at ${where(f.open)} is still open`, 'check the brackets');
          if (ch === ',') fail(pos, 'two commas in a row, or a comma at the start of an object', 'remove the extra comma');
          const w = word(pos);
          if (w) fail(pos, `field names need double quotes: "${w}"`, `write "${w}": instead of ${w}:`);
          fail(pos, `unexpected "${ch}" where a field name in double quotes should be`);
          break;
        }
        case Expect.Colon:
          if (ch !== ':') fail(pos, `a ":" must follow the field name "${top().key}"`, `write "${top().key}": value`);
          pos++;
          expect = Expect.Value;
          break;
        case Expect.CommaOrEndObject:
        case Expect.CommaOrEndArray: {
          const f = top();
          if (ch === ',') {
            f.comma = pos;
            pos++;
            if (f.kind === 'array') {
              f.index++;
              expect = Expect.ValueOrEnd;
            } else expect = Expect.Key;
            break;
          }
          if (ch === '}' || ch === ']') {
            expect = closeFrame(ch);
            break;
          }
          if (f.kind === 'object') fail(pos, `a comma is missing after the value of "${f.key}"`, 'separate the fields of an object with commas');
          fail(pos, 'a comma is missing between two items of a list', 'separate the items of a list with commas');
        }
      }
    }
  } catch (e) {
    if (e instanceof Stop) scan.error = e.problem;
    else throw e;
  }
  return scan;
}

/**
 * Line and column of many offsets into one text: the line starts are found in one pass, then
 * each offset is placed by binary search, so placing k problems in a text of n characters
 * costs n + k log n rather than k n.
 */
export class LineIndex {
  private readonly starts: number[] = [0];
  constructor(private readonly text: string) {
    for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) this.starts.push(i + 1);
  }

  /** 1-based line and column of a 0-based offset, as lineColumn gives them. */
  place(offset: number): { line: number; column: number } {
    const end = Math.max(0, Math.min(offset, this.text.length));
    let lo = 0;
    let hi = this.starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.starts[mid] <= end) lo = mid;
      else hi = mid - 1;
    }
    return { line: lo + 1, column: end - this.starts[lo] + 1 };
  }
}

/** 1-based line and column of a 0-based offset; a line ends at \n (a \r before it is part of the break). */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  const end = Math.min(offset, text.length);
  for (let i = 0; i < end; i++) {
    if (text.charCodeAt(i) === 0x0a) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: end - lineStart + 1 };
}

/**
 * The line holding offset with a caret under it, for example
 *
 *     "radius": 5,,
 *                 ^
 *
 * Tabs print as single spaces so the caret lines up; long lines are cut around the column.
 */
export function excerptAt(text: string, offset: number, width = 76): string {
  // Only a window of the line around the offset is read, so quoting many places of a file
  // written on one very long line stays linear in the number of places.
  const n = text.length;
  offset = Math.max(0, Math.min(offset, n));
  let s = offset;
  const sMin = Math.max(0, offset - width);
  while (s > sMin && text.charCodeAt(s - 1) !== 0x0a) s--;
  const moreLeft = s > 0 && text.charCodeAt(s - 1) !== 0x0a;
  let e = offset;
  const eMax = Math.min(n, offset + width);
  while (e < eMax && text.charCodeAt(e) !== 0x0a) e++;
  const moreRight = e < n && text.charCodeAt(e) !== 0x0a;
  // Other control characters (a NUL, say) are shown by their control pictures (U+2400 + code).
  let line = text
    .slice(s, e)
    .replace(/\r$/, '')
    .replace(/\t/g, ' ')
    .replace(/[\u0000-\u001f\u007f]/g, (c) => String.fromCharCode(c === '\u007f' ? 0x2421 : 0x2400 + c.charCodeAt(0)));
  let col = offset - s;
  if (line.length > width || moreLeft || moreRight) {
    const from = Math.max(0, Math.min(col - Math.floor(width / 2), line.length - width));
    const cut = line.slice(from, from + width);
    const left = from > 0 || moreLeft;
    line = (left ? '...' : '') + cut + (from + width < line.length || moreRight ? '...' : '');
    col = col - from + (left ? 3 : 0);
  }
  return `${line}\n${' '.repeat(Math.max(0, col))}^`;
}
