/**
 * The JSON scan: it must accept exactly what JSON.parse accepts, place every value and field
 * name, and explain syntax errors at the right line and column.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { excerptAt, lineColumn, scanJson } from '../src/model/json-text.js';
import { closest, editDistance } from '../src/model/suggest.js';

function errorAt(text: string): { line: number; column: number; message: string } {
  const s = scanJson(text);
  expect(s.error, `expected a syntax error in ${JSON.stringify(text)}`).toBeDefined();
  return { ...lineColumn(text, s.error!.offset), message: s.error!.message };
}

describe('scanJson agrees with JSON.parse', () => {
  it('on arbitrary JSON values, printed compactly and indented', () => {
    fc.assert(
      fc.property(fc.jsonValue(), fc.boolean(), (v, indent) => {
        const text = JSON.stringify(v, null, indent ? 2 : undefined);
        expect(scanJson(text).error).toBeUndefined();
      }),
      { numRuns: 300 },
    );
  });
  it('on arbitrary short strings: an error exactly when JSON.parse throws', () => {
    const alphabet = fc.constantFrom(...'{}[]:,"\\ 0123456789.eE+-truefalsn\n\tx\''.split(''));
    fc.assert(
      fc.property(fc.array(alphabet, { maxLength: 14 }), (chars) => {
        const text = chars.join('');
        let ok = true;
        try {
          JSON.parse(text);
        } catch {
          ok = false;
        }
        expect(scanJson(text).error === undefined).toBe(ok);
      }),
      { numRuns: 3000 },
    );
  });
});

describe('scanJson places values and names', () => {
  const text = '{\n  "a": [1, {"b": true}],\n  "c": "x"\n}';
  it('records the offset of each value and field name by JSON path', () => {
    const s = scanJson(text);
    expect(lineColumn(text, s.valueAt.get('a[1].b')!)).toEqual({ line: 2, column: 18 });
    expect(lineColumn(text, s.keyAt.get('a[1].b')!)).toEqual({ line: 2, column: 13 });
    expect(lineColumn(text, s.valueAt.get('c')!)).toEqual({ line: 3, column: 8 });
    expect(s.valueAt.get('')).toBe(0);
  });
  it('finds a field given twice and a number that overflows', () => {
    const s = scanJson('{"r": 1, "q": {"r": 2}, "r": 1e400}');
    expect(s.duplicates.map((d) => d.path)).toEqual(['r']);
    expect(s.hugeNumbers.map((h) => h.text)).toEqual(['1e400']);
  });
  it('scans very deep nesting without recursion', () => {
    const deep = '['.repeat(200000) + ']'.repeat(200000);
    expect(scanJson(deep).error).toBeUndefined();
  });
});

describe('scanJson explains syntax errors', () => {
  it('a trailing comma, at the comma', () => {
    expect(errorAt('{\n  "a": 1,\n}')).toEqual({ line: 2, column: 9, message: 'a comma after the last field of an object' });
    expect(errorAt('[1, 2, ]').message).toBe('a comma after the last item of a list');
  });
  it('a missing comma, at the next field', () => {
    expect(errorAt('{\n  "a": 1\n  "b": 2\n}')).toMatchObject({ line: 3, column: 3, message: 'a comma is missing after the value of "a"' });
  });
  it('an unclosed object, naming where it opened', () => {
    expect(errorAt('{\n  "a": {\n').message).toBe('the file ends inside the object opened at line 2, column 8');
  });
  it('comments, single quotes, bare names, NaN, Python literals, .5, leading zeros', () => {
    expect(errorAt('{"a": 1 // note\n}').message).toBe('JSON does not allow comments');
    expect(errorAt("{'a': 1}").message).toMatch(/double quotes/);
    expect(errorAt('{radius: 1}').message).toBe('field names need double quotes: "radius"');
    expect(errorAt('{"a": NaN}').message).toMatch(/NaN is not allowed/);
    expect(errorAt('{"a": True}').message).toBe('"True" is not a JSON value');
    expect(errorAt('{"a": .5}').message).toMatch(/digit before its decimal point/);
    expect(errorAt('{"a": 05}').message).toMatch(/must not start with 0/);
    expect(errorAt('{"a": 10mm}').message).toBe('"10mm" is not a number');
  });
  it('a text value left open at the end of its line', () => {
    expect(errorAt('{"a": "abc\n}')).toMatchObject({ line: 1, column: 7 });
  });
  it('a bracket that closes the wrong thing', () => {
    expect(errorAt('{"a": [1, 2}').message).toBe('"}" closes an object, but the list opened at line 1, column 7 is still open');
  });
  it('text after the end of the value', () => {
    expect(errorAt('{"a": 1}}').message).toBe('there is more text after the end of the JSON value');
  });
});

describe('excerptAt', () => {
  it('quotes the line with a caret under the column, tabs shown as spaces', () => {
    expect(excerptAt('{\n\t"a": 1,,\n}', 10)).toBe(' "a": 1,,\n        ^');
  });
  it('cuts long lines around the column', () => {
    const line = 'x'.repeat(300) + 'Y' + 'x'.repeat(300);
    const ex = excerptAt(line, 300).split('\n');
    expect(ex[0].length).toBeLessThanOrEqual(82);
    expect(ex[0][ex[1].length - 1]).toBe('Y');
  });
});

describe('suggestions', () => {
  it('edit distance counts a swap of neighbours as one edit', () => {
    expect(editDistance('circel', 'circle')).toBe(1);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('kitten', 'sitting')).toBe(3);
  });
  it('closest picks plausible slips and nothing else', () => {
    expect(closest('circel', ['path', 'circle', 'ellipse'])).toBe('circle');
    expect(closest('Radius', ['radius', 'diameter'])).toBe('radius');
    expect(closest('diam', ['radius', 'diameter'])).toBe('diameter');
    expect(closest('banana', ['radius', 'diameter'])).toBeUndefined();
  });
});
