/**
 * Named parameters in model files. A model may declare `"parameters": { "fillet": 4, "W": 50 }`
 * and write any number as an expression string starting with "=": `"round": "=fillet"`,
 * `"at": ["=W/2", 0]`. Expressions are data, never code: a small recursive-descent parser
 * accepts numbers, parameter names, + - * / ^ (power, right-associative), parentheses, unary
 * signs, the constant pi and the functions sqrt, abs, min, max, sind, cosd, tand (degrees),
 * atan2d (degrees). Nothing else is evaluated. A parameter's own value may be an expression of
 * the parameters declared before it.
 */
import { quoteText } from './errors.js';
import { closest } from './suggest.js';

export interface ParameterProblem {
  path: string;
  message: string;
  hint?: string;
}

const FUNCTIONS: Record<string, { arity: number | 'any'; fn: (...a: number[]) => number }> = {
  sqrt: { arity: 1, fn: Math.sqrt },
  abs: { arity: 1, fn: Math.abs },
  min: { arity: 'any', fn: Math.min },
  max: { arity: 'any', fn: Math.max },
  sind: { arity: 1, fn: (d) => Math.sin((d * Math.PI) / 180) },
  cosd: { arity: 1, fn: (d) => Math.cos((d * Math.PI) / 180) },
  tand: { arity: 1, fn: (d) => Math.tan((d * Math.PI) / 180) },
  atan2d: { arity: 2, fn: (y, x) => (Math.atan2(y, x) * 180) / Math.PI },
};

/** Longest expression read (characters), deepest nesting of parentheses and calls, and most arguments of one call. */
const MAX_EXPRESSION_LENGTH = 1000;
const MAX_EXPRESSION_DEPTH = 32;
const MAX_EXPRESSION_ARGUMENTS = 100;

const SYNTAX_HINT = 'expressions take numbers, parameter names, + - * / ^, parentheses and sqrt abs min max sind cosd tand atan2d pi';

class ExprError extends Error {
  constructor(
    message: string,
    readonly hint?: string,
  ) {
    super(message);
  }
}

/** Evaluates one expression (without the leading "=") with the given parameter values. */
export function evaluateExpression(text: string, params: Readonly<Record<string, number>>): number {
  let i = 0;
  const src = text;
  const shown = quoteText(src);
  if (src.length > MAX_EXPRESSION_LENGTH) {
    throw new ExprError(`the expression "${shown}" is longer than the ${MAX_EXPRESSION_LENGTH} characters an expression may have`, 'write a shorter expression, with parameters for its parts');
  }
  // Nesting is counted before the recursive descent, so its depth is bounded.
  let open = 0;
  for (let k = 0; k < src.length; k++) {
    if (src[k] === '(') open++;
    else if (src[k] === ')') open--;
    if (open > MAX_EXPRESSION_DEPTH) {
      throw new ExprError(`the expression "${shown}" nests parentheses more than ${MAX_EXPRESSION_DEPTH} deep`, 'write it with fewer parentheses, or split it into parameters');
    }
  }
  const skip = () => {
    while (i < src.length && /\s/.test(src[i])) i++;
  };
  const peek = () => {
    skip();
    return src[i];
  };
  const fail = (what: string): never => {
    throw new ExprError(`${what} at position ${i + 1} of "${shown}"`, SYNTAX_HINT);
  };
  /** A finite result, or an error that says which operation left the numbers and what to do. */
  const finite = (v: number, what: string, hint: string): number => {
    if (!Number.isFinite(v)) throw new ExprError(`${what} in "${shown}" does not give a finite number`, hint);
    return v;
  };
  const depth = { unary: 0 };
  const expr = (): number => {
    let v = term();
    for (;;) {
      const c = peek();
      if (c === '+') {
        i++;
        v += term();
      } else if (c === '-') {
        i++;
        v -= term();
      } else return v;
    }
  };
  const term = (): number => {
    let v = unary();
    for (;;) {
      const c = peek();
      if (c === '*') {
        i++;
        v *= unary();
      } else if (c === '/') {
        i++;
        const d = unary();
        if (d === 0) throw new ExprError(`division by zero in "${shown}"`, 'check the divisor: a parameter it uses may be 0, or a value is missing');
        v = finite(v / d, 'a division', 'the quotient is too large for a number: check the values and their units');
      } else return v;
    }
  };
  const unary = (): number => {
    const c = peek();
    if (c === '-' || c === '+') {
      // Signs are the one repetition that is not a parenthesis: bound their run too.
      if (++depth.unary > MAX_EXPRESSION_DEPTH) fail(`more than ${MAX_EXPRESSION_DEPTH} signs in a row`);
      i++;
      const v = unary();
      depth.unary--;
      return c === '-' ? -v : v;
    }
    return power();
  };
  const power = (): number => {
    const base = primary();
    if (peek() === '^') {
      i++;
      const e = unary();
      const v = Math.pow(base, e);
      if (Number.isNaN(v)) throw new ExprError(`${base}^${e} in "${shown}" is not a real number`, 'a negative number has no real power with a fractional exponent: check the sign of the base');
      return finite(v, `${base}^${e}`, 'the power is too large for a number: check the exponent');
    }
    return base;
  };
  const primary = (): number => {
    const c = peek();
    if (c === undefined) return fail('an expression ends too early');
    if (c === '(') {
      i++;
      const v = expr();
      if (peek() !== ')') fail('a closing parenthesis is missing');
      i++;
      return v;
    }
    const num = /^(\d+\.?\d*|\.\d+)(e[-+]?\d+)?/i.exec(src.slice(i));
    if (num) {
      i += num[0].length;
      return Number(num[0]);
    }
    const name = /^[A-Za-z_][A-Za-z0-9_]*/.exec(src.slice(i));
    if (!name) return fail(`"${c}" is not allowed`);
    i += name[0].length;
    const id = name[0];
    if (peek() === '(') {
      const f = Object.hasOwn(FUNCTIONS, id) ? FUNCTIONS[id] : undefined;
      if (!f) {
        const near = closest(id, Object.keys(FUNCTIONS));
        throw new ExprError(`"${quoteText(id, 40)}" is not a function raiser knows${near ? `; did you mean "${near}"?` : ''}`, `the functions are ${Object.keys(FUNCTIONS).join(', ')}`);
      }
      i++;
      const args: number[] = [];
      if (peek() !== ')') {
        args.push(expr());
        while (peek() === ',') {
          i++;
          if (args.length >= MAX_EXPRESSION_ARGUMENTS) throw new ExprError(`${id} is given more than ${MAX_EXPRESSION_ARGUMENTS} arguments in "${shown}"`, 'give it fewer arguments; nest calls such as max(max(a, b), c) for long lists');
          args.push(expr());
        }
      }
      if (peek() !== ')') fail('a closing parenthesis is missing');
      i++;
      if (f.arity !== 'any' && args.length !== f.arity) throw new ExprError(`${id} takes ${f.arity} argument${f.arity === 1 ? '' : 's'}, not ${args.length}`);
      if (f.arity === 'any' && args.length === 0) throw new ExprError(`${id} needs at least one argument`);
      if (id === 'sqrt' && args[0] < 0) throw new ExprError(`sqrt(${args[0]}) in "${shown}": the square root of a negative number`, 'check the sign of what is under the root');
      return finite(f.fn(...args), `${id}(${args.join(', ')})`, id === 'tand' ? 'the tangent of 90 degrees (and of odd multiples of it) is infinite: check the angle' : 'check the arguments');
    }
    if (id === 'pi') return Math.PI;
    if (Object.prototype.hasOwnProperty.call(params, id)) return params[id];
    const near = closest(id, [...Object.keys(params), 'pi']);
    throw new ExprError(`"${quoteText(id, 40)}" is not a declared parameter${near ? `; did you mean "${near}"?` : ''}`, Object.keys(params).length ? `the parameters are ${Object.keys(params).join(', ')}` : 'declare it under "parameters" at the top of the model');
  };
  const v = expr();
  if (peek() !== undefined) fail(`"${peek()}" is unexpected`);
  return finite(v, 'the expression', 'check the values and their units');
}

const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * Replaces every "=expression" string in the model data by its value. `overrides` replace
 * declared parameter values (a sweep's case); naming an undeclared parameter there is a problem.
 * Returns the new data (the input is not changed) and the problems found.
 */
export function substituteParameters(data: unknown, overrides: Readonly<Record<string, number>> = {}): { data: unknown; problems: ParameterProblem[]; parameters: Record<string, number> } {
  const problems: ParameterProblem[] = [];
  const params: Record<string, number> = {};
  if (!data || typeof data !== 'object' || Array.isArray(data)) return { data, problems, parameters: params };
  const root = data as Record<string, unknown>;
  const declared = root.parameters;
  if (declared !== undefined) {
    if (!declared || typeof declared !== 'object' || Array.isArray(declared)) {
      problems.push({ path: 'parameters', message: 'parameters must be an object of names and numbers', hint: 'write "parameters": { "fillet": 4 }' });
    } else {
      for (const [name, raw] of Object.entries(declared as Record<string, unknown>)) {
        const path = `parameters.${name}`;
        if (!NAME.test(name)) {
          problems.push({ path, message: `"${name}" is not a usable parameter name`, hint: 'names start with a letter or _ and hold letters, digits and _' });
          continue;
        }
        if (Object.hasOwn(FUNCTIONS, name) || name === 'pi') {
          problems.push({ path, message: `"${name}" is a built-in name and cannot be a parameter`, hint: 'choose another name' });
          continue;
        }
        if (typeof raw === 'number' && Number.isFinite(raw)) params[name] = raw;
        else if (typeof raw === 'string' && raw.startsWith('=')) {
          try {
            params[name] = evaluateExpression(raw.slice(1), params);
          } catch (e) {
            problems.push({ path, message: (e as Error).message, hint: (e as ExprError).hint });
          }
        } else problems.push({ path, message: `the parameter ${name} must be a number or an "=expression"`, hint: `for example "${name}": 4` });
      }
    }
  }
  for (const [name, v] of Object.entries(overrides)) {
    if (!(name in params)) {
      const near = closest(name, Object.keys(params));
      problems.push({ path: 'parameters', message: `"${name}" is not a parameter of the model${near ? `; did you mean "${near}"?` : ''}`, hint: Object.keys(params).length ? `its parameters are ${Object.keys(params).join(', ')}` : 'the model declares no parameters' });
      continue;
    }
    params[name] = v;
  }
  // Declared values that depend on an overridden one are re-evaluated in declaration order.
  if (Object.keys(overrides).length && declared && typeof declared === 'object') {
    for (const [name, raw] of Object.entries(declared as Record<string, unknown>)) {
      if (name in overrides) continue;
      if (typeof raw === 'string' && raw.startsWith('=')) {
        try {
          params[name] = evaluateExpression(raw.slice(1), params);
        } catch {
          // already reported above
        }
      }
    }
  }
  const walk = (v: unknown, path: string): unknown => {
    if (typeof v === 'string' && v.startsWith('=')) {
      try {
        return evaluateExpression(v.slice(1), params);
      } catch (e) {
        problems.push({ path, message: (e as Error).message, hint: (e as ExprError).hint });
        return v;
      }
    }
    if (Array.isArray(v)) return v.map((x, k) => walk(x, `${path}[${k}]`));
    if (v && typeof v === 'object') {
      const out: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
        // Free text never holds expressions.
        out[k] = k === 'parameters' || k === 'note' || k === 'title' || k === 'name' || k === '$schema' ? x : walk(x, path ? `${path}.${k}` : k);
      }
      return out;
    }
    return v;
  };
  const result = walk(root, '') as Record<string, unknown>;
  if (declared !== undefined) result.parameters = { ...params };
  return { data: result, problems, parameters: params };
}
