import fc from 'fast-check';
import { describe, it, expect } from 'vitest';
import { readMatrixMarket, readMatrixMarketArray, writeMatrixMarket, writeMatrixMarketArray } from '../src/solve/index.js';
import { parseDecimalBytes } from '../src/solve/matrixmarket.js';
import { cantileverProblem } from '../src/bench/fixtures/cantilever.js';
import { randomVector } from '../src/bench/fixtures/random.js';

describe('Matrix Market', () => {
  it('a symmetric coordinate matrix round-trips exactly', () => {
    const a = cantileverProblem(6, 3, 2).matrix;
    const text = writeMatrixMarket(a, 'plane-stress cantilever\nsecond comment line');
    expect(text.startsWith('%%MatrixMarket matrix coordinate real symmetric\n% plane-stress cantilever\n')).toBe(true);
    const b = readMatrixMarket(text);
    expect(b.n).toBe(a.n);
    expect(Array.from(b.colPtr)).toEqual(Array.from(a.colPtr));
    expect(Array.from(b.rowIndex)).toEqual(Array.from(a.rowIndex));
    expect(Array.from(b.values)).toEqual(Array.from(a.values));
  });

  it('a general file of a symmetric matrix is read as its lower triangle', () => {
    const text = [
      '%%MatrixMarket matrix coordinate real general',
      '% a 3 x 3 symmetric matrix given in full',
      '3 3 7',
      '1 1 4',
      '2 1 -1',
      '1 2 -1',
      '2 2 4.5e0',
      '3 2 -2',
      '2 3 -2',
      '3 3 1E1',
      '',
    ].join('\n');
    const a = readMatrixMarket(text);
    expect(Array.from(a.colPtr)).toEqual([0, 2, 4, 5]);
    expect(Array.from(a.rowIndex)).toEqual([0, 1, 1, 2, 2]);
    expect(Array.from(a.values)).toEqual([4, -1, 4.5, -2, 10]);
  });

  it('a general file of a non-symmetric matrix is rejected', () => {
    const asym = '%%MatrixMarket matrix coordinate real general\n2 2 3\n1 1 1\n2 1 3\n1 2 2\n2 2 1\n';
    expect(() => readMatrixMarket(asym.replace('2 2 3', '2 2 4'))).toThrow(/not symmetric/);
    const missing = '%%MatrixMarket matrix coordinate real general\n2 2 2\n1 1 1\n2 1 3\n';
    expect(() => readMatrixMarket(missing)).toThrow(/not symmetric/);
  });

  it('unsupported fields, symmetries, and bad sizes or indices are rejected with a message', () => {
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate complex symmetric\n1 1 1\n1 1 1 0\n')).toThrow(/complex/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real skew-symmetric\n1 1 0\n')).toThrow(/skew/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 3 0\n')).toThrow(/square/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n3 1 1\n')).toThrow(/out of range/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 2 2\n1 1 1\n')).toThrow(/end of file/);
    expect(() => readMatrixMarket('not a matrix market file')).toThrow(/MatrixMarket/);
  });

  it('a dense vector round-trips exactly, including extreme values', () => {
    const v = randomVector(50, 3);
    v[0] = 1e-300;
    v[1] = -1.7976931348623157e308;
    v[2] = 0.1 + 0.2;
    const text = writeMatrixMarketArray(v);
    const r = readMatrixMarketArray(text);
    expect(r.rows).toBe(50);
    expect(r.cols).toBe(1);
    expect(Array.from(r.values)).toEqual(Array.from(v));
  });

  it('an array block with several columns is read column-major', () => {
    const r = readMatrixMarketArray('%%MatrixMarket matrix array real general\n% comment\n2 2\n1\n2\n3\n4\n');
    expect(r.rows).toBe(2);
    expect(r.cols).toBe(2);
    expect(Array.from(r.values)).toEqual([1, 2, 3, 4]);
  });
});

/**
 * The hand parser of decimals must give the very double Number() gives, for every token: the
 * reference is ECMAScript's own StringToNumber (ECMA-262, section 7.1.4.1.1), correctly rounded
 * to nearest. The fast path is exact only inside Clinger's bounds (W. D. Clinger, "How to read
 * floating point numbers accurately", PLDI 1990: at most 15 significant digits, |exponent| <= 22);
 * the strings below straddle those bounds on purpose so both the fast path and the fallback run.
 */
describe('parseDecimalBytes gives the same double as Number()', () => {
  const same = (text: string): boolean => {
    const bytes = Buffer.from(text, 'utf8');
    return Object.is(parseDecimalBytes(bytes, 0, bytes.length), Number(text));
  };
  const digitString = (max: number) => fc.string({ unit: fc.constantFrom('0', '1', '2', '3', '4', '5', '6', '7', '8', '9'), minLength: 0, maxLength: max });
  const decimal = fc
    .record({
      sign: fc.constantFrom('', '-', '+'),
      whole: digitString(20),
      point: fc.boolean(),
      fraction: digitString(20),
      e: fc.constantFrom('', 'e', 'E'),
      expSign: fc.constantFrom('', '-', '+'),
      exp: digitString(4),
    })
    .map((r) => `${r.sign}${r.whole}${r.point ? '.' : ''}${r.point ? r.fraction : ''}${r.e}${r.e ? r.expSign + r.exp : ''}`)
    .filter((t) => t.length > 0);

  it('on random decimal strings of up to 40 digits, with signs, points and exponents', () => {
    fc.assert(fc.property(decimal, same), { numRuns: 20000 });
  });

  it('on the shortest text of random doubles (what raiser writes) and its exponent form', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true }), (x) => same(String(x)) && same(x.toExponential()) && same(x.toPrecision(15)) && same(x.toPrecision(17))),
      { numRuns: 20000 },
    );
  });

  it('on 16 to 19 significant digits with exponents from -60 to 60 (the double-double path and its edges)', () => {
    const long = fc
      .record({ sign: fc.constantFrom('', '-'), digits: fc.string({ unit: fc.constantFrom('0', '1', '2', '3', '4', '5', '6', '7', '8', '9'), minLength: 16, maxLength: 19 }), point: fc.nat(19), exp: fc.integer({ min: -60, max: 60 }) })
      .map((r) => `${r.sign}${r.digits.slice(0, r.point)}.${r.digits.slice(r.point)}e${r.exp}`);
    fc.assert(fc.property(long, same), { numRuns: 50000 });
    fc.assert(fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 16, max: 19 }), (x, k) => same(x.toPrecision(k)) && same(x.toExponential(k - 1))), { numRuns: 20000 });
  });

  it('on integers exactly halfway between two doubles, and one either side (ties go to even)', () => {
    // between 2^53 and 2^63 the doubles are integers 2^(e-52) apart: x + ulp/2 is an exact
    // halfway integer of at most 19 digits, the hardest input for a rounding decision
    const halfway = fc.bigInt({ min: 1n << 53n, max: (1n << 63n) - 1n }).map((k) => {
      const x = BigInt(Number(k));
      const ulp = 1n << BigInt(Math.max(0, x.toString(2).length - 53));
      return x + ulp / 2n;
    });
    fc.assert(fc.property(halfway, fc.constantFrom(-1n, 0n, 1n), (m, off) => same(String(m + off)) && same(`${String(m + off)}e-3`)), { numRuns: 20000 });
  });

  it('on decimals with a fraction exactly halfway between two doubles, and one last digit either side', () => {
    // from 2^50 to 2^56 the doubles are 2^-2 ... 2^4 apart: x + ulp/2 has at most 3 decimals and
    // 19 digits, and dividing by 10^3 is inexact, so only the halfway test keeps the rounding right
    const halfway = fc.double({ min: 2 ** 50, max: 2 ** 56, noNaN: true }).map((x) => {
      const x8 = BigInt(x * 8); // exact: x is a multiple of 2^-2
      const ulp8 = 8n * (1n << BigInt(Math.max(0, Math.floor(Math.log2(x)) - 52 + 2))) / 4n;
      return x8 + ulp8 / 2n; // eight times the halfway point
    });
    const text = (m8: bigint, off: bigint) => {
      const milli = m8 * 125n + off; // the halfway point in thousandths
      return `${milli / 1000n}.${String(milli % 1000n).padStart(3, '0')}`;
    };
    fc.assert(fc.property(halfway, fc.constantFrom(-1n, 0n, 1n), (m8, off) => same(text(m8, off)) && same(`-${text(m8, off)}`)), { numRuns: 20000 });
  });

  it('on random bytes: anything that is not a plain decimal goes to Number() (hex, Infinity, junk)', () => {
    const junk = fc.string({ unit: fc.constantFrom('0', '1', '9', '.', 'e', 'E', '-', '+', 'x', 'I', 'n', 'f', 'a', '_', '\u00a0'), minLength: 1, maxLength: 12 });
    fc.assert(fc.property(junk, same), { numRuns: 20000 });
  });

  it('at the edges of the exact fast path and of the double range', () => {
    for (const t of [
      '0', '-0', '+0', '-0.0e5', '0e-400', '.5', '5.', '-.5e-3', '1e22', '1e23', '1e-22', '1e-23',
      '123456789012345', '1234567890123456', '9007199254740993', '0.000000000000000000001', '000000000000000000001.5',
      '1.7976931348623157e308', '1.7976931348623159e308', '4.9e-324', '2.4703282292062327e-324', '1e-400', '1e400',
      '1e', '1e+', '-', '+', '.', 'e5', '1e0000005', '0x10', 'Infinity', '-Infinity', '1\u00a0', '\u00a01',
    ]) {
      expect(same(t), t).toBe(true);
    }
  });
});

describe('Matrix Market read from bytes', () => {
  it('bytes and text of the same file give the same matrix, comments and CRLF line ends included', () => {
    const a = cantileverProblem(5, 3, 2).matrix;
    const text = writeMatrixMarket(a, 'bytes and text').replace(/\n/g, '\r\n');
    const fromText = readMatrixMarket(text);
    const fromBytes = readMatrixMarket(Buffer.from(text, 'utf8'));
    expect(Array.from(fromBytes.colPtr)).toEqual(Array.from(fromText.colPtr));
    expect(Array.from(fromBytes.rowIndex)).toEqual(Array.from(fromText.rowIndex));
    expect(Array.from(fromBytes.values)).toEqual(Array.from(a.values));
  });

  it('a value or index that is not a number names its text', () => {
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n1 1 4x\n')).toThrow(/value "4x" is not a number/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n1.5 1 4\n')).toThrow(/row index "1.5" is not an integer/);
    expect(() => readMatrixMarketArray(Buffer.from('%%MatrixMarket matrix array real general\n2 1\n1\nzwei\n'))).toThrow(/value "zwei" is not a number/);
  });
});
