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

import { type SymmetricCsc, assembleSymmetric } from './sparse.js';

interface Header {
  readonly object: string;
  readonly format: string;
  readonly field: string;
  readonly symmetry: string;
}

/** A cursor over whitespace-separated tokens that skips % comment lines. */
class Tokens {
  private pos: number;
  constructor(
    private readonly text: string,
    start: number,
  ) {
    this.pos = start;
  }

  next(): string {
    const s = this.text;
    const n = s.length;
    let p = this.pos;
    for (;;) {
      while (p < n) {
        const c = s.charCodeAt(p);
        if (c === 32 || c === 9 || c === 10 || c === 13) p++;
        else break;
      }
      if (p < n && s.charCodeAt(p) === 37 /* % */) {
        while (p < n && s.charCodeAt(p) !== 10) p++;
        continue;
      }
      break;
    }
    if (p >= n) throw new SyntaxError('Matrix Market: unexpected end of file');
    const q0 = p;
    while (p < n) {
      const c = s.charCodeAt(p);
      if (c === 32 || c === 9 || c === 10 || c === 13) break;
      p++;
    }
    this.pos = p;
    return s.slice(q0, p);
  }

  integer(what: string): number {
    const t = this.next();
    const v = Number(t);
    if (!Number.isInteger(v)) throw new SyntaxError(`Matrix Market: ${what} "${t}" is not an integer`);
    return v;
  }

  real(what: string): number {
    const t = this.next();
    const v = Number(t);
    if (t.length === 0 || Number.isNaN(v)) throw new SyntaxError(`Matrix Market: ${what} "${t}" is not a number`);
    return v;
  }
}

function readHeader(text: string): { header: Header; bodyStart: number } {
  const eol = text.indexOf('\n');
  const first = (eol < 0 ? text : text.slice(0, eol)).trim();
  const parts = first.split(/\s+/).map((p, i) => (i === 0 ? p : p.toLowerCase()));
  if (parts[0] !== '%%MatrixMarket' || parts.length < 5) {
    throw new SyntaxError(`Matrix Market: first line must be "%%MatrixMarket object format field symmetry", got "${first}"`);
  }
  return {
    header: { object: parts[1], format: parts[2], field: parts[3], symmetry: parts[4] },
    bodyStart: eol < 0 ? text.length : eol + 1,
  };
}

export interface ReadMatrixOptions {
  /**
   * For `general` files: largest accepted |A(i,j) - A(j,i)| relative to the
   * largest |entry| (default 1e-14).
   */
  readonly symmetryTolerance?: number;
}

/** Reads a symmetric sparse matrix from Matrix Market coordinate text. */
export function readMatrixMarket(text: string, options: ReadMatrixOptions = {}): SymmetricCsc {
  const { header, bodyStart } = readHeader(text);
  if (header.object !== 'matrix') throw new SyntaxError(`Matrix Market: object "${header.object}" is not supported`);
  if (header.format !== 'coordinate') throw new SyntaxError(`Matrix Market: format "${header.format}" is not a sparse (coordinate) matrix`);
  if (header.field !== 'real' && header.field !== 'integer' && header.field !== 'double') {
    throw new SyntaxError(`Matrix Market: field "${header.field}" is not supported (real or integer only)`);
  }
  if (header.symmetry !== 'symmetric' && header.symmetry !== 'general') {
    throw new SyntaxError(`Matrix Market: symmetry "${header.symmetry}" is not supported (symmetric or general only)`);
  }
  const tok = new Tokens(text, bodyStart);
  const nr = tok.integer('row count');
  const nc = tok.integer('column count');
  const nz = tok.integer('entry count');
  if (nr !== nc) throw new RangeError(`Matrix Market: matrix is ${nr} x ${nc}, not square`);
  if (nr < 0 || nz < 0) throw new RangeError('Matrix Market: negative size');
  const rows = new Int32Array(nz);
  const cols = new Int32Array(nz);
  const vals = new Float64Array(nz);
  for (let k = 0; k < nz; k++) {
    const i = tok.integer('row index') - 1;
    const j = tok.integer('column index') - 1;
    if (i < 0 || i >= nr || j < 0 || j >= nr) throw new RangeError(`Matrix Market: entry ${k + 1} index (${i + 1}, ${j + 1}) out of range`);
    rows[k] = i;
    cols[k] = j;
    vals[k] = tok.real('value');
  }
  if (header.symmetry === 'symmetric') return assembleSymmetric(nr, rows, cols, vals, 'triangle');

  // general: lower part and mirrored upper part must agree
  const lo: number[] = [];
  const up: number[] = [];
  for (let k = 0; k < nz; k++) (rows[k] >= cols[k] ? lo : up).push(k);
  const pick = (ks: number[], mirror: boolean): SymmetricCsc => {
    const r = new Int32Array(ks.length);
    const c = new Int32Array(ks.length);
    const v = new Float64Array(ks.length);
    ks.forEach((k, q) => {
      r[q] = mirror ? cols[k] : rows[k];
      c[q] = mirror ? rows[k] : cols[k];
      v[q] = vals[k];
    });
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

/** Reads `matrix array real general` text: returns the values column-major with the row and column counts. */
export function readMatrixMarketArray(text: string): { rows: number; cols: number; values: Float64Array } {
  const { header, bodyStart } = readHeader(text);
  if (header.object !== 'matrix' || header.format !== 'array') throw new SyntaxError('Matrix Market: expected "matrix array"');
  if (header.field !== 'real' && header.field !== 'integer' && header.field !== 'double') {
    throw new SyntaxError(`Matrix Market: field "${header.field}" is not supported (real or integer only)`);
  }
  if (header.symmetry !== 'general') throw new SyntaxError(`Matrix Market: array symmetry "${header.symmetry}" is not supported (general only)`);
  const tok = new Tokens(text, bodyStart);
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
