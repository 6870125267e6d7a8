/**
 * Parameters and expressions in model files: a small evaluator of arithmetic and named
 * parameters only (nothing in a model file is executed), with errors that name the place.
 */
import { describe, expect, it } from 'vitest';
import { ModelError } from '../src/model/errors.js';
import { parseModelText } from '../src/model/load.js';
import { evaluateExpression, substituteParameters } from '../src/model/params.js';

describe('evaluateExpression', () => {
  it('follows the usual precedence: unary minus, ^ (right-associative), * /, + -', () => {
    expect(evaluateExpression('1 + 2 * 3', {})).toBe(7);
    expect(evaluateExpression('(1 + 2) * 3', {})).toBe(9);
    expect(evaluateExpression('2 ^ 3 ^ 2', {})).toBe(512);
    expect(evaluateExpression('-2 ^ 2', {})).toBe(-4);
    expect(evaluateExpression('10 / 4 - 1.5e1', {})).toBe(-12.5);
  });

  it('knows parameters, pi and the listed functions (trigonometry in degrees)', () => {
    expect(evaluateExpression('W/2 - r', { W: 50, r: 5 })).toBe(20);
    expect(evaluateExpression('sqrt(16) + abs(-2) + min(3, 1, 2) + max(4, 5)', {})).toBe(12);
    expect(evaluateExpression('sind(30) + cosd(60)', {})).toBeCloseTo(1, 14);
    expect(evaluateExpression('atan2d(1, 1)', {})).toBeCloseTo(45, 12);
    expect(evaluateExpression('2 * pi', {})).toBeCloseTo(2 * Math.PI, 14);
  });

  it('refuses anything that is not arithmetic, with a reason', () => {
    expect(() => evaluateExpression('process.exit()', {})).toThrow(/not a declared parameter|not allowed/);
    expect(() => evaluateExpression('W', { w: 1 })).toThrow(/did you mean "w"/);
    expect(() => evaluateExpression('sqr(4)', {})).toThrow(/did you mean "sqrt"/);
    expect(() => evaluateExpression('1 / 0', {})).toThrow(/division by zero/);
    expect(() => evaluateExpression('(1 + 2', {})).toThrow(/parenthesis/);
    expect(() => evaluateExpression('1 + ', {})).toThrow(/ends too early/);
    expect(() => evaluateExpression('2 $ 3', {})).toThrow(/unexpected|not allowed/);
    expect(() => evaluateExpression('sqrt(-1)', {})).toThrow(/square root of a negative number/);
    expect(() => evaluateExpression('min()', {})).toThrow(/at least one/);
  });
});

describe('substituteParameters', () => {
  it('evaluates parameters in order and every "=" string elsewhere, leaving text alone', () => {
    const { data, problems } = substituteParameters({ parameters: { W: 40, L: '=4*W' }, title: '=not evaluated', geometry: { at: ['=L', '=W/2'] } });
    expect(problems).toEqual([]);
    expect(data).toEqual({ parameters: { W: 40, L: 160 }, title: '=not evaluated', geometry: { at: [160, 20] } });
  });

  it('overrides recompute the parameters that depend on them; unknown overrides are problems', () => {
    const { data } = substituteParameters({ parameters: { W: 40, L: '=4*W' }, x: '=L' }, { W: 10 });
    expect((data as { x: number }).x).toBe(40);
    expect(substituteParameters({ parameters: { W: 1 } }, { V: 2 }).problems[0].message).toMatch(/"V" is not a parameter/);
  });

  it('a model file reports an expression error at its line with the JSON path', () => {
    const text = '{\n "parameters": {"d": 10},\n "material": {"E": 1, "nu": 0.3},\n "thickness": "=t"\n}';
    try {
      parseModelText(text, 'p.json');
      expect.unreachable();
    } catch (e) {
      const m = (e as ModelError).describe();
      expect(m).toContain('p.json:4:');
      expect(m).toContain('thickness');
      expect(m).toContain('"t" is not a declared parameter');
    }
  });
});
