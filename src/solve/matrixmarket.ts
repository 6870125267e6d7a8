/**
 * Matrix Market exchange format (R. F. Boisvert, R. Pozo and K. A. Remington,
 * "The Matrix Market exchange formats: initial design", NISTIR 5935, National
 * Institute of Standards and Technology, 1996).
 *
 * Supported here:
 *  - `matrix coordinate real|integer symmetric`: entries of the lower
 *    triangle, 1-based (an entry given in the upper triangle is folded to its
 *    mirror; a position given twice is summed);
 *  - `matrix coordinate real|integer general` of a symmetric matrix: checked
 *    to be symmetric (both triangles equal to a relative tolerance), then the
 *    lower triangle is kept;
 *  - `matrix array real general`: dense vectors (one column) or column-major
 *    blocks of several columns.
 * Other fields (complex, pattern) and symmetries (skew-symmetric, hermitian)
 * are rejected with an error that names them.
 */

import { endianness } from 'node:os';
import { type SymmetricCsc, assembleSymmetric } from './sparse.js';

interface Header {
  readonly object: string;
  readonly format: string;
  readonly field: string;
  readonly symmetry: string;
}

/**
 * Exact powers of ten 1e0 ... 1e22: every one is a double exactly (10^22 = 2^22 * 5^22 and
 * 5^22 < 2^53), so a product or quotient with one is a single correctly rounded operation.
 */
const EXACT_POWERS_OF_TEN = new Float64Array(23);
for (let k = 0, p = 1; k <= 22; k++, p *= 10) EXACT_POWERS_OF_TEN[k] = p;

/** 2^(e - 1075): the unit in the last place of a normal double whose biased exponent field is e. */
const ULP_OF_EXPONENT = new Float64Array(2048);
for (let e = 1; e < 2047; e++) ULP_OF_EXPONENT[e] = 2 ** (e - 1075);

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13;
}

/** Dekker's splitter 2^27 + 1 (T. J. Dekker, "A floating-point technique for extending the available precision", Numer. Math. 18, 1971). */
const SPLITTER = 134217729;

/**
 * Scratch of the double-double arithmetic below: a value hi + lo kept to about 106 bits, and a
 * view of one double's bits to read its exponent.
 */
const dd = { hi: 0, lo: 0 };
const bits = new Float64Array(1);
/** the 32 bits holding sign, exponent and the top of the fraction (the second word on a little-endian machine) */
const bitsHigh = new Uint32Array(bits.buffer, endianness() === 'LE' ? 4 : 0, 1);

/**
 * The rounding error of the product a * b, exactly: a * b = fl(a * b) + error (Dekker's
 * two-product by Veltkamp splitting, exact when nothing overflows; |a * b| stays below 1e64 here).
 */
function productError(a: number, b: number, ab: number): number {
  let t = SPLITTER * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLITTER * b;
  const bh = t - (t - b);
  const bl = b - bh;
  return ((ah * bh - ab) + ah * bl + al * bh) + al * bl;
}

/** dd <- (hi + lo) * p for an exact power of ten p, the rounding error of hi * p kept exactly. */
function multiplyDoubleDouble(hi: number, lo: number, p: number): void {
  const h = hi * p;
  dd.hi = h;
  dd.lo = productError(hi, p, h) + lo * p;
}

/** dd <- (hi + lo) / p for an exact power of ten p: the quotient's remainder is found exactly by the two-product. */
function divideDoubleDouble(hi: number, lo: number, p: number): void {
  const q = hi / p;
  const prod = q * p;
  const e = productError(q, p, prod);
  // hi - q p = (hi - prod) - e, and hi - prod is exact (Sterbenz: prod is within an ulp of hi)
  dd.hi = q;
  dd.lo = ((hi - prod) - e + lo) / p;
}

/**
 * The double nearest to mantissa * 10^q (mantissa = a * 10^nb + b, a < 10^15, b < 10^nb <=
 * 10^4, |q| <= 44), or NaN when the value lies too near a point halfway between two doubles
 * to be sure. The product is carried in double-double arithmetic with a relative error below
 * 2^-100; rounding hi + lo to one double then gives the correctly rounded value unless a
 * halfway point lies within that error, which is tested with a margin of 2^-30 ulp. Results
 * stay between 1e-44 and 1e64, far inside the normal range (no underflow or overflow).
 */
function scaleDecimal(a: number, nb: number, b: number, q: number): number {
  // mantissa exactly as a double-double: a * 10^nb by the two-product, then b added
  multiplyDoubleDouble(a, 0, EXACT_POWERS_OF_TEN[nb]);
  let hi = dd.hi + b;
  const bv = hi - dd.hi;
  let lo = dd.lo + ((dd.hi - (hi - bv)) + (b - bv)); // Knuth's two-sum error of dd.hi + b
  for (let r = q; r !== 0; ) {
    const step = r > 22 ? 22 : r < -22 ? -22 : r;
    if (step > 0) multiplyDoubleDouble(hi, lo, EXACT_POWERS_OF_TEN[step]);
    else divideDoubleDouble(hi, lo, EXACT_POWERS_OF_TEN[-step]);
    hi = dd.hi;
    lo = dd.lo;
    r -= step;
  }
  const c = hi + lo;
  const d = hi - c + lo; // how far hi + lo lies from c
  bits[0] = c;
  const ulp = ULP_OF_EXPONENT[(bitsHigh[0] >>> 20) & 0x7ff];
  const margin = ulp * 2 ** -30;
  const ad = Math.abs(d);
  // halfway points lie ulp/2 from c, or ulp/4 below c when c is a power of two
  if (Math.abs(ad - 0.5 * ulp) <= margin || Math.abs(ad - 0.25 * ulp) <= margin) return NaN;
  return c;
}

/**
 * The double a decimal token denotes, the same as Number() on its text for every input. The
 * token starts at byte `start` and runs to the first whitespace byte (space, tab, CR, LF) or
 * to `end`; the parse and the search for its end are one pass. Two fast paths for a token of the plain form
 * [+-]digits[.digits][(e|E)[+-]digits], value mantissa * 10^q:
 *  - at most 15 significant digits and |q| <= 22 (W. D. Clinger, "How to read floating point
 *    numbers accurately", PLDI 1990, the exact case): mantissa < 10^15 < 2^53 and 10^|q| are
 *    exact doubles, so one multiplication or division, correctly rounded, gives the nearest
 *    double to the decimal, as Number() does;
 *  - at most 19 significant digits and |q| <= 44 (what a shortest round-trip print of a
 *    computed value looks like: 16 or 17 digits): scaleDecimal, double-double arithmetic with
 *    a test that the rounding is certain.
 * Any other token (more digits, a larger exponent, a value near a halfway point, hexadecimal,
 * "Infinity", stray bytes) is decoded and handed to Number(). NaN means not a number, as
 * Number() says.
 */
export function parseDecimalBytes(buf: Uint8Array, start: number, end: number): number {
  let p = start;
  let negative = false;
  let c = buf[p];
  if (c === 45 /* - */ || c === 43 /* + */) {
    negative = c === 45;
    p++;
  }
  // the first 15 significant digits in a, the next up to 4 in b (nb of them)
  let a = 0;
  let b = 0;
  let nb = 0;
  let significant = 0;
  let digits = 0;
  let fraction = 0;
  let inFraction = false;
  for (; p < end; p++) {
    c = buf[p];
    if (c === 46 /* . */ && !inFraction) {
      inFraction = true;
      continue;
    }
    c -= 48;
    if (c < 0 || c > 9) break;
    digits++;
    if (inFraction) fraction++;
    if (significant === 0 && c === 0) continue;
    significant++;
    if (significant <= 15) a = a * 10 + c;
    else {
      b = b * 10 + c;
      nb++;
    }
  }
  let exponent = 0;
  let plain = digits > 0 && significant <= 19;
  if (plain && p < end && (buf[p] === 101 /* e */ || buf[p] === 69 /* E */)) {
    p++;
    let expNegative = false;
    if (p < end && (buf[p] === 45 || buf[p] === 43)) {
      expNegative = buf[p] === 45;
      p++;
    }
    const expStart = p;
    for (; p < end && p - expStart < 6; p++) {
      c = buf[p] - 48;
      if (c < 0 || c > 9) break;
      exponent = exponent * 10 + c;
    }
    if (p === expStart) plain = false;
    if (expNegative) exponent = -exponent;
  }
  const stop = p;
  while (p < end && !isSpace(buf[p])) p++;
  tokenEnd = p;
  if (plain && p === stop) {
    const q = exponent - fraction;
    if (a === 0) return negative ? -0 : 0; // a zero mantissa gives +-0 whatever q is, as Number() does
    if (nb === 0 && q >= -22 && q <= 22) {
      const v = q >= 0 ? a * EXACT_POWERS_OF_TEN[q] : a / EXACT_POWERS_OF_TEN[-q];
      return negative ? -v : v;
    }
    if (q >= -44 && q <= 44) {
      const v = scaleDecimal(a, nb, b, q);
      if (!Number.isNaN(v)) return negative ? -v : v;
    }
  }
  return Number(decodeBytes(buf, start, p));
}

/** Where the token parseDecimalBytes last read ends (one past its last byte). */
let tokenEnd = 0;

const utf8 = new TextDecoder();

function decodeBytes(buf: Uint8Array, start: number, end: number): string {
  return utf8.decode(buf.subarray(start, end));
}

/**
 * A cursor over whitespace-separated tokens of the file's bytes that skips % comment lines.
 * Whitespace is space, tab, CR and LF; every other byte belongs to a token.
 */
class Tokens {
  private pos: number;
  private start = 0;
  constructor(
    private readonly buf: Uint8Array,
    start: number,
  ) {
    this.pos = start;
  }

  /** Moves to the start of the next token (this.start). */
  private advance(): void {
    const s = this.buf;
    const n = s.length;
    let p = this.pos;
    for (;;) {
      while (p < n && isSpace(s[p])) p++;
      if (p < n && s[p] === 37 /* % */) {
        while (p < n && s[p] !== 10) p++;
        continue;
      }
      break;
    }
    if (p >= n) throw new SyntaxError('Matrix Market: unexpected end of file');
    this.start = p;
  }

  private text(): string {
    return decodeBytes(this.buf, this.start, this.pos);
  }

  /** A whole number as Number() reads it (plain digits read here, any other text by Number()). */
  integer(what: string): number {
    this.advance();
    const s = this.buf;
    const n = s.length;
    let v = 0;
    let p = this.start;
    for (; p < n; p++) {
      const d = s[p] - 48;
      if (d < 0 || d > 9) break;
      v = v * 10 + d;
    }
    const digits = p - this.start;
    const stop = p;
    while (p < n && !isSpace(s[p])) p++;
    this.pos = p;
    // up to 15 digits the sum above is exact; anything longer or other goes to Number()
    if (p !== stop || digits > 15) v = Number(this.text());
    if (!Number.isInteger(v)) throw new SyntaxError(`Matrix Market: ${what} "${this.text()}" is not an integer`);
    return v;
  }

  real(what: string): number {
    this.advance();
    const v = parseDecimalBytes(this.buf, this.start, this.buf.length);
    this.pos = tokenEnd;
    if (Number.isNaN(v)) throw new SyntaxError(`Matrix Market: ${what} "${this.text()}" is not a number`);
    return v;
  }
}

/** The file's bytes: text given as a string is encoded as UTF-8 (the encoding it is read in). */
function bytesOf(input: string | Uint8Array): Uint8Array {
  return typeof input === 'string' ? Buffer.from(input, 'utf8') : input;
}

function readHeader(buf: Uint8Array): { header: Header; bodyStart: number } {
  const eol = buf.indexOf(10);
  const first = decodeBytes(buf, 0, eol < 0 ? buf.length : eol).trim();
  const parts = first.split(/\s+/).map((p, i) => (i === 0 ? p : p.toLowerCase()));
  if (parts[0] !== '%%MatrixMarket' || parts.length < 5) {
    throw new SyntaxError(`Matrix Market: first line must be "%%MatrixMarket object format field symmetry", got "${first}"`);
  }
  return {
    header: { object: parts[1], format: parts[2], field: parts[3], symmetry: parts[4] },
    bodyStart: eol < 0 ? buf.length : eol + 1,
  };
}

export interface ReadMatrixOptions {
  /**
   * For `general` files: largest accepted |A(i,j) - A(j,i)| relative to the
   * largest |entry| (default 1e-14).
   */
  readonly symmetryTolerance?: number;
}

/**
 * The compressed lower triangle of entries already in its order (lower triangle, columns in
 * order, rows strictly increasing in each, so no position twice): the column pointers counted,
 * the rows and values taken as they are. The same matrix assembleSymmetric would build from
 * them, without its two bucket passes.
 */
function compressOrdered(n: number, rows: Int32Array, cols: Int32Array, vals: Float64Array): SymmetricCsc {
  const colPtr = new Int32Array(n + 1);
  for (let k = 0; k < cols.length; k++) colPtr[cols[k] + 1]++;
  for (let j = 0; j < n; j++) colPtr[j + 1] += colPtr[j];
  return { n, colPtr, rowIndex: rows, values: vals };
}

/**
 * Reads a symmetric sparse matrix from Matrix Market coordinate text: the file's bytes as read
 * (fastest), or its text.
 */
export function readMatrixMarket(input: string | Uint8Array, options: ReadMatrixOptions = {}): SymmetricCsc {
  const buf = bytesOf(input);
  const { header, bodyStart } = readHeader(buf);
  if (header.object !== 'matrix') throw new SyntaxError(`Matrix Market: object "${header.object}" is not supported`);
  if (header.format !== 'coordinate') throw new SyntaxError(`Matrix Market: format "${header.format}" is not a sparse (coordinate) matrix`);
  if (header.field !== 'real' && header.field !== 'integer' && header.field !== 'double') {
    throw new SyntaxError(`Matrix Market: field "${header.field}" is not supported (real or integer only)`);
  }
  if (header.symmetry !== 'symmetric' && header.symmetry !== 'general') {
    throw new SyntaxError(`Matrix Market: symmetry "${header.symmetry}" is not supported (symmetric or general only)`);
  }
  const tok = new Tokens(buf, bodyStart);
  const nr = tok.integer('row count');
  const nc = tok.integer('column count');
  const nz = tok.integer('entry count');
  if (nr !== nc) throw new RangeError(`Matrix Market: matrix is ${nr} x ${nc}, not square`);
  if (nr < 0 || nz < 0) throw new RangeError('Matrix Market: negative size');
  const rows = new Int32Array(nz);
  const cols = new Int32Array(nz);
  const vals = new Float64Array(nz);
  // Whether the entries come as compressed columns would hold them: lower triangle, columns in
  // order, rows strictly increasing in each (as writeMatrixMarket writes them).
  let ordered = true;
  for (let k = 0, pi = -1, pj = -1; k < nz; k++) {
    const i = tok.integer('row index') - 1;
    const j = tok.integer('column index') - 1;
    if (i < 0 || i >= nr || j < 0 || j >= nr) throw new RangeError(`Matrix Market: entry ${k + 1} index (${i + 1}, ${j + 1}) out of range`);
    rows[k] = i;
    cols[k] = j;
    vals[k] = tok.real('value');
    if (ordered && !(i >= j && (j > pj || (j === pj && i > pi)))) ordered = false;
    pi = i;
    pj = j;
  }
  if (header.symmetry === 'symmetric') return ordered ? compressOrdered(nr, rows, cols, vals) : assembleSymmetric(nr, rows, cols, vals, 'triangle');

  // general: lower part and mirrored upper part must agree
  let nLower = 0;
  for (let k = 0; k < nz; k++) if (rows[k] >= cols[k]) nLower++;
  const lo = new Int32Array(nLower);
  const up = new Int32Array(nz - nLower);
  for (let k = 0, a = 0, b = 0; k < nz; k++) {
    if (rows[k] >= cols[k]) lo[a++] = k;
    else up[b++] = k;
  }
  const pick = (ks: Int32Array, mirror: boolean): SymmetricCsc => {
    const r = new Int32Array(ks.length);
    const c = new Int32Array(ks.length);
    const v = new Float64Array(ks.length);
    for (let q = 0; q < ks.length; q++) {
      const k = ks[q];
      r[q] = mirror ? cols[k] : rows[k];
      c[q] = mirror ? rows[k] : cols[k];
      v[q] = vals[k];
    }
    return assembleSymmetric(nr, r, c, v, 'triangle');
  };
  const lower = pick(lo, false);
  const upperMirrored = pick(up, true);
  let maxAbs = 0;
  for (let k = 0; k < nz; k++) maxAbs = Math.max(maxAbs, Math.abs(vals[k]));
  const tol = (options.symmetryTolerance ?? 1e-14) * maxAbs;
  // compare column by column, treating a missing off-diagonal entry as zero
  const dense = new Float64Array(nr);
  for (let j = 0; j < nr; j++) {
    for (let p = lower.colPtr[j]; p < lower.colPtr[j + 1]; p++) dense[lower.rowIndex[p]] = lower.values[p];
    for (let p = upperMirrored.colPtr[j]; p < upperMirrored.colPtr[j + 1]; p++) {
      const i = upperMirrored.rowIndex[p];
      if (i === j) continue;
      if (Math.abs(dense[i] - upperMirrored.values[p]) > tol) {
        throw new RangeError(`Matrix Market: general matrix is not symmetric at (${i + 1}, ${j + 1}): ${dense[i]} vs ${upperMirrored.values[p]}`);
      }
      dense[i] = NaN; // seen
    }
    for (let p = lower.colPtr[j]; p < lower.colPtr[j + 1]; p++) {
      const i = lower.rowIndex[p];
      if (i !== j && !Number.isNaN(dense[i]) && Math.abs(dense[i]) > tol) {
        throw new RangeError(`Matrix Market: general matrix is not symmetric at (${i + 1}, ${j + 1}): ${dense[i]} vs 0`);
      }
      dense[i] = 0;
    }
    for (let p = upperMirrored.colPtr[j]; p < upperMirrored.colPtr[j + 1]; p++) dense[upperMirrored.rowIndex[p]] = 0;
  }
  return lower;
}

/** Writes the lower triangle as `matrix coordinate real symmetric` (values printed exactly, shortest round-trip form). */
export function writeMatrixMarket(a: SymmetricCsc, comment?: string): string {
  const parts: string[] = ['%%MatrixMarket matrix coordinate real symmetric\n'];
  if (comment !== undefined) for (const line of comment.split('\n')) parts.push(`% ${line}\n`);
  parts.push(`${a.n} ${a.n} ${a.colPtr[a.n]}\n`);
  let chunk = '';
  for (let j = 0; j < a.n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      chunk += `${a.rowIndex[p] + 1} ${j + 1} ${String(a.values[p])}\n`;
      if (chunk.length > 1 << 16) {
        parts.push(chunk);
        chunk = '';
      }
    }
  }
  parts.push(chunk);
  return parts.join('');
}

/** Reads `matrix array real general` (bytes or text): returns the values column-major with the row and column counts. */
export function readMatrixMarketArray(input: string | Uint8Array): { rows: number; cols: number; values: Float64Array } {
  const buf = bytesOf(input);
  const { header, bodyStart } = readHeader(buf);
  if (header.object !== 'matrix' || header.format !== 'array') throw new SyntaxError('Matrix Market: expected "matrix array"');
  if (header.field !== 'real' && header.field !== 'integer' && header.field !== 'double') {
    throw new SyntaxError(`Matrix Market: field "${header.field}" is not supported (real or integer only)`);
  }
  if (header.symmetry !== 'general') throw new SyntaxError(`Matrix Market: array symmetry "${header.symmetry}" is not supported (general only)`);
  const tok = new Tokens(buf, bodyStart);
  const rows = tok.integer('row count');
  const cols = tok.integer('column count');
  if (rows < 0 || cols < 0) throw new RangeError('Matrix Market: negative size');
  const values = new Float64Array(rows * cols);
  for (let k = 0; k < values.length; k++) values[k] = tok.real('value');
  return { rows, cols, values };
}

/** Writes a dense column-major block (a vector when cols = 1) as `matrix array real general`. */
export function writeMatrixMarketArray(values: Float64Array, cols = 1, comment?: string): string {
  if (cols < 1 || values.length % cols !== 0) throw new RangeError('writeMatrixMarketArray: length is not a multiple of cols');
  const rows = values.length / cols;
  const parts: string[] = ['%%MatrixMarket matrix array real general\n'];
  if (comment !== undefined) for (const line of comment.split('\n')) parts.push(`% ${line}\n`);
  parts.push(`${rows} ${cols}\n`);
  let chunk = '';
  for (let k = 0; k < values.length; k++) {
    chunk += `${String(values[k])}\n`;
    if (chunk.length > 1 << 16) {
      parts.push(chunk);
      chunk = '';
    }
  }
  parts.push(chunk);
  return parts.join('');
}
