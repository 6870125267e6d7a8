/**
 * The command line: parses arguments, calls the library, prints. No analysis logic lives here.
 * Exit codes: 0 done, 2 bad input, 3 the model cannot be analysed as given, 1 internal fault.
 *
 * Start-up loads only this file and commander: each command's module (and through it the
 * schema, the analysis, the fonts, the parsers) is imported when that command is run, so
 * `raiser --version` and `raiser --help` do no work they do not need.
 */
import { Command, CommanderError, Help } from 'commander';
import { AnalysisError, ModelError } from '../model/errors.js';
import { TOOL_VERSION } from '../model/version.js';
import { addressSpaceLimit } from './address-space.js';

const EXIT = { ok: 0, internal: 1, badInput: 2, cannotAnalyse: 3 } as const;

type Declare = (cmd: Command, setCode: (c: number) => void) => void;

/**
 * The commands: name, the usage shown in the list, the one-line description, and the module
 * that declares the rest (arguments, options, action). The list is the only place a command's
 * name and description are written.
 */
const COMMANDS: readonly { name: string; usage: string; description: string; load: () => Promise<Declare> }[] = [
  {
    name: 'solve',
    usage: '[options] <model>',
    description: 'mesh, solve and report the peak stress, nominal stress and Kt of a model file',
    load: async () => (await import('./solve.js')).declareSolve,
  },
  {
    name: 'new',
    usage: '[template] [params...]',
    description: 'print a model file for a standard family (plate with a hole, stepped bar, notched bars ...)',
    load: async () => (await import('./new.js')).declareNew,
  },
  {
    name: 'charts',
    usage: '[options] [chart] [params...]',
    description:
      'list the published Kt formulas, or evaluate one: raiser charts fillet-tension --D 60 --d 40 --r 6, or those of a template family: raiser charts stepped-bar --D 60 --d 40 --r 6',
    load: async () => (await import('./charts.js')).declareCharts,
  },
  {
    name: 'sweep',
    usage: '[options] <model>',
    description: 'solve a model over a range of a dimension and write a Kt chart: raiser sweep m.json --vary fillet=1:10:10',
    load: async () => (await import('./sweep.js')).declareSweep,
  },
  {
    name: 'size',
    usage: '[options] <model>',
    description: 'find the smallest (or largest) value of a dimension that meets a Kt or stress limit: raiser size m.json --vary fillet=1:20 --kt-max 1.8',
    load: async () => (await import('./sweep.js')).declareSize,
  },
  {
    name: 'plot',
    usage: '[options] <saved>',
    description: 'draw the pictures again from a saved solution (solution.raiser written by solve -o, or its folder), without solving',
    load: async () => (await import('./plot.js')).declarePlot,
  },
  {
    name: 'report',
    usage: '[options] <dir>',
    description: 'write report.html again from a saved solution (the folder solve -o wrote), with the sign-off fields, and with --pdf print it to report.pdf',
    load: async () => (await import('./report.js')).declareReport,
  },
  {
    name: 'probe',
    usage: '[options] <saved>',
    description: 'print the stresses and displacements of a saved solution at given points or along a line',
    load: async () => (await import('./probe.js')).declareProbe,
  },
  {
    name: 'mesh',
    usage: '[options] <model>',
    description: 'mesh a model without solving it: the geometry with its tags and the mesh, as a summary and (with -o) a picture',
    load: async () => (await import('./mesh.js')).declareMesh,
  },
  {
    name: 'bench-solve',
    usage: '[options] <K.mtx> [b.mtx]',
    description: 'factor and solve a symmetric positive definite Matrix Market file; print times, fill, flops, memory and the residual',
    load: async () => (await import('./bench-solve.js')).declareBenchSolve,
  },
  {
    name: 'verify',
    usage: '[options]',
    description: 'run the verification suite: published and closed-form cases, with sources and tolerances',
    load: async () => (await import('./verify.js')).declareVerify,
  },
];

/** A command's term in the list of commands: from the table, as commander would write it once declared. */
function termOf(cmd: Command): string {
  const c = COMMANDS.find((x) => x.name === cmd.name());
  return c ? `${c.name} ${c.usage}` : new Help().subcommandTerm(cmd);
}

/** The command a command line runs: its first word, or the word after `help`. */
function commandWord(argv: string[]): string | undefined {
  const words = argv.filter((a) => !a.startsWith('-'));
  return words[0] === 'help' ? words[1] : words[0];
}

/** Runs the program; returns the exit code (the process is not exited here, so tests can call it). */
export async function main(argv: string[]): Promise<number> {
  let code: number = EXIT.ok;
  const debug = argv.includes('--debug');
  const setCode = (c: number) => {
    code = c;
  };
  const program = new Command();
  program
    .name('raiser')
    .description('Stress concentration factors of flat parts by finite elements')
    .version(TOOL_VERSION)
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) })
    .configureHelp({ subcommandTerm: termOf });

  try {
    const word = commandWord(argv);
    for (const c of COMMANDS) {
      const cmd = program.command(c.name).description(c.description);
      // only the command being run is declared in full (and its module loaded)
      if (c.name === word) (await c.load())(cmd, setCode);
    }
    await program.parseAsync(argv, { from: 'user' });
  } catch (err) {
    return reportError(err, debug);
  }
  return code;
}

/** An allocation that the engine or the system refused: not a bug, a model too large for the memory allowed. */
function outOfMemory(err: unknown): boolean {
  return err instanceof RangeError && /could not allocate memory|Array buffer allocation failed|Invalid typed array length|out of memory/i.test(err.message);
}
function reportError(err: unknown, debug: boolean): number {
  if (err instanceof CommanderError) {
    // commander has already printed its message (help and version exit with code 0).
    return err.exitCode === 0 ? EXIT.ok : EXIT.badInput;
  }
  if (err instanceof ModelError) {
    process.stderr.write(`raiser: bad input: ${err.describe()}\n`);
    if (debug && err.stack) process.stderr.write(err.stack + '\n');
    return EXIT.badInput;
  }
  if (err instanceof AnalysisError) {
    process.stderr.write(`raiser: cannot analyse: ${err.describe()}\n`);
    if (debug && err.stack) process.stderr.write(err.stack + '\n');
    return EXIT.cannotAnalyse;
  }
  if (outOfMemory(err)) {
    const limit = addressSpaceLimit();
    process.stderr.write(
      `raiser: cannot analyse: the analysis needs more memory than this process may use (${(err as Error).message})${limit !== undefined ? `; its address space is limited to ${(limit / 2 ** 30).toFixed(1)} GB (ulimit -v)` : ''}\n  fix: coarsen the mesh (mesh.size, mesh.raiserSize), lower --max-memory so the model is refused or solved iteratively, or raise the limit\n`,
    );
    if (debug && (err as Error).stack) process.stderr.write((err as Error).stack + '\n');
    return EXIT.cannotAnalyse;
  }
  const e = err as Error;
  process.stderr.write(`raiser: internal fault: ${e?.message ?? String(err)}\n  this is a bug in raiser, not in your model; please report it with the model file\n`);
  if (debug && e?.stack) process.stderr.write(e.stack + '\n');
  return EXIT.internal;
}
