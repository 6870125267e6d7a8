/**
 * Errors meant for people. Each names where the problem is (a JSON path into the model file,
 * such as `geometry.holes[1].radius`), what is wrong, and how to fix it. The command line turns
 * them into exit codes: ModelError -> 2 (bad input), AnalysisError -> 3 (the model cannot be
 * analysed as given; ModelTooLargeError is one), anything else -> 1 (an internal fault).
 */

/** A problem that names a field of the model file, and once placed, the file, line and column. */
export interface PlacedProblem {
  /** JSON path of the field, '' for the whole file */
  readonly path: string;
  readonly message: string;
  readonly hint?: string;
  file?: string;
  /** 1-based line and column in the file, when the problem can be placed there */
  line?: number;
  column?: number;
  /** the offending lines of the file with a caret under the column, when known */
  excerpt?: string;
}

/**
 * "file:line:column: at path: message", then the excerpt and "fix: hint" on lines of their
 * own. The file:line:column form is the one terminals and editors turn into a link.
 */
function describePlaced(e: PlacedProblem): string {
  let place = e.file ?? '';
  if (e.line !== undefined) place += `${place ? ':' : 'line '}${e.line}${e.column !== undefined ? `:${e.column}` : ''}`;
  const where = [place, e.path ? `at ${quoteText(e.path, 160)}` : ''].filter(Boolean).join(': ');
  const excerpt = e.excerpt ? `\n${indent(e.excerpt, '    ')}` : '';
  return `${where ? where + ': ' : ''}${e.message}${excerpt}${e.hint ? `\n  fix: ${e.hint}` : ''}`;
}

export class ModelError extends Error implements PlacedProblem {
  override readonly name = 'ModelError';
  /** 1-based line and column in the file, when the problem can be placed there */
  line?: number;
  column?: number;
  /** the offending lines of the file with a caret under the column, when known */
  excerpt?: string;
  constructor(
    /** JSON path of the offending field, '' for the whole file */
    readonly path: string,
    message: string,
    /** how to fix it, if there is something to say */
    readonly hint?: string,
    /** the file the model came from, when known */
    public file?: string,
  ) {
    super(message);
  }

  /** See describePlaced: "file:line:column: at path: message", the excerpt, "fix: hint". */
  describe(): string {
    return describePlaced(this);
  }
}

/**
 * Several problems found in one pass over a model file, reported together so that one run
 * shows everything to correct. It is a ModelError (exit code 2); `problems` holds each one,
 * in the order they occur in the file, and the message lists them one per line.
 */
export class ModelErrorList extends ModelError {
  readonly problems: readonly ModelError[];
  constructor(
    problems: readonly ModelError[],
    file?: string,
    /** further problems found but not listed (only the first MAX_REPORTED_PROBLEMS are) */
    readonly omitted = 0,
  ) {
    if (problems.length === 0) throw new InternalError('ModelErrorList needs at least one problem');
    const lines = problems.map((p) => `${p.path ? `${quoteText(p.path, 160)}: ` : ''}${p.message}`);
    if (omitted > 0) lines.push(omittedLine(problems.length, omitted));
    super('', `${problemCount(problems.length + omitted)} in the model:\n${lines.join('\n')}`, undefined, file);
    this.problems = problems;
    for (const p of problems) if (file !== undefined && p.file === undefined) p.file = file;
  }

  override describe(): string {
    const head = `${this.file ? `${this.file}: ` : ''}${problemCount(this.problems.length + this.omitted)} in the model`;
    const tail = this.omitted > 0 ? [`  ${omittedLine(this.problems.length, this.omitted)}`] : [];
    return [head, ...this.problems.map((p) => indent(p.describe(), '  ')), ...tail].join('\n');
  }
}

/** How many problems of one file are listed; the rest are counted. */
export const MAX_REPORTED_PROBLEMS = 20;

function problemCount(n: number): string {
  return `${n.toLocaleString('en-US')} problem${n === 1 ? '' : 's'}`;
}

function omittedLine(shown: number, omitted: number): string {
  return `... and ${problemCount(omitted).replace('problem', 'more problem')} (the first ${shown} are listed; correct these and run again)`;
}

/**
 * Text from a file quoted in a message: as it is when short, otherwise its start and end with
 * the number of characters left out, so a message never echoes a whole file.
 */
export function quoteText(text: string, max = 60): string {
  if (text.length <= max) return text;
  const keep = Math.floor((max - 5) / 2);
  return `${text.slice(0, keep)} ... ${text.slice(-keep)} (${text.length.toLocaleString('en-US')} characters)`;
}

function indent(text: string, by: string): string {
  return text
    .split('\n')
    .map((l) => by + l)
    .join('\n');
}

export class AnalysisError extends Error {
  override readonly name: string = 'AnalysisError';
  constructor(
    message: string,
    readonly hint?: string,
  ) {
    super(message);
  }

  describe(): string {
    return `${this.message}${this.hint ? `\n  fix: ${this.hint}` : ''}`;
  }
}

/**
 * A valid model whose analysis would need more memory than the limit allows (the memory guard
 * of the mesher, src/mesh/estimate.ts): the analysis is refused (exit 3), the input is not
 * wrong. It names the field that sets the mesh's size (`path`), and once the command line has
 * placed it, where that field is in the file. A series of meshes that reaches this limit stops
 * with what it has (src/pipeline/certify.ts catches it by its type).
 */
export class ModelTooLargeError extends AnalysisError implements PlacedProblem {
  override readonly name: string = 'ModelTooLargeError';
  file?: string;
  line?: number;
  column?: number;
  excerpt?: string;
  constructor(
    /** JSON path of the field that sets the size ('mesh') */
    readonly path: string,
    message: string,
    hint?: string,
  ) {
    super(message, hint);
  }

  override describe(): string {
    return describePlaced(this);
  }
}

/** A check inside raiser failed: a bug, not a problem with the model. */
export class InternalError extends Error {
  override readonly name = 'InternalError';
}

/** Formats a JSON path from its parts: ['geometry', 'holes', 1, 'radius'] -> geometry.holes[1].radius */
export function formatPath(parts: readonly (string | number)[]): string {
  let s = '';
  for (const p of parts) {
    if (typeof p === 'number') s += `[${p}]`;
    else s += s ? `.${p}` : p;
  }
  return s;
}
