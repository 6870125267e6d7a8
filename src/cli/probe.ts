/**
 * `raiser probe <saved> --at x,y ... --line x0,y0,x1,y1 --points n`: the recovered stresses and
 * displacements at any points of a saved solution, each evaluated in the element that contains
 * the point with that element's shape functions (src/mesh/probe.ts), not taken from the nearest
 * node. Prints a table, or --json, or --csv. Parsing and printing only.
 */
import { Command } from 'commander';
import { FieldProbe } from '../mesh/probe.js';
import { ModelError } from '../model/errors.js';
import { stressMeasure } from '../post/stress.js';
import { readSaved } from '../report/saved.js';
import { fmt } from '../report/summary.js';

interface ProbeFlags {
  at?: string[];
  line?: string;
  points?: string;
  json?: boolean;
  csv?: boolean;
}

export interface ProbeRow {
  x: number;
  y: number;
  /** false where the point lies outside the part (then every value is null) */
  inside: boolean;
  ux: number | null;
  uy: number | null;
  sxx: number | null;
  syy: number | null;
  sxy: number | null;
  s1: number | null;
  s2: number | null;
  vonMises: number | null;
  tresca: number | null;
}

function pair(text: string, what: string): [number, number] {
  const p = text.split(/[,\s]+/).filter(Boolean).map(Number);
  if (p.length !== 2 || !p.every(Number.isFinite)) throw new ModelError(what, `"${text}" is not a point x,y`, `write for example ${what} 12.5,40`);
  return [p[0], p[1]];
}

/** The points asked for: each --at, then n points evenly along --line (ends included). */
function probePoints(flags: ProbeFlags): [number, number][] {
  const pts: [number, number][] = (flags.at ?? []).map((t) => pair(t, '--at'));
  if (flags.line) {
    const v = flags.line.split(/[,\s]+/).filter(Boolean).map(Number);
    if (v.length !== 4 || !v.every(Number.isFinite)) throw new ModelError('--line', `"${flags.line}" is not a line x0,y0,x1,y1`, 'write for example --line 0,0,0,50');
    const n = flags.points === undefined ? 11 : Number(flags.points);
    if (!Number.isInteger(n) || n < 2 || n > 100000) throw new ModelError('--points', `"${flags.points}" is not a number of points from 2 to 100000`, 'write for example --points 21');
    for (let k = 0; k < n; k++) {
      const t = k / (n - 1);
      pts.push([v[0] + t * (v[2] - v[0]), v[1] + t * (v[3] - v[1])]);
    }
  } else if (flags.points !== undefined) throw new ModelError('--points', '--points needs --line', 'give the line to place the points on: --line x0,y0,x1,y1');
  if (pts.length === 0) throw new ModelError('--at', 'no point to probe', 'give --at x,y (repeatable) or --line x0,y0,x1,y1 --points n');
  return pts;
}

/** The stresses and displacements at the points of a saved solution. */
function probeSaved(saved: string, pts: readonly [number, number][]): { rows: ProbeRow[]; stressUnit: string; lengthUnit: string } {
  const src = readSaved(saved);
  const probe = new FieldProbe(src.mesh);
  const rows = pts.map(([x, y]): ProbeRow => {
    const sxx = probe.value(src.stress, 3, 0, x, y);
    if (!Number.isFinite(sxx)) return { x, y, inside: false, ux: null, uy: null, sxx: null, syy: null, sxy: null, s1: null, s2: null, vonMises: null, tresca: null };
    const syy = probe.value(src.stress, 3, 1, x, y);
    const sxy = probe.value(src.stress, 3, 2, x, y);
    const szz = src.szzFactor * (sxx + syy);
    return {
      x,
      y,
      inside: true,
      ux: probe.value(src.u, 2, 0, x, y),
      uy: probe.value(src.u, 2, 1, x, y),
      sxx,
      syy,
      sxy,
      s1: stressMeasure('max-principal', sxx, syy, sxy, szz),
      s2: stressMeasure('min-principal', sxx, syy, sxy, szz),
      vonMises: stressMeasure('von-mises', sxx, syy, sxy, szz),
      tresca: stressMeasure('tresca', sxx, syy, sxy, szz),
    };
  });
  return { rows, stressUnit: src.result.units.stress, lengthUnit: src.result.units.length };
}

const COLUMNS = ['x', 'y', 'ux', 'uy', 'sxx', 'syy', 'sxy', 's1', 's2', 'vonMises', 'tresca'] as const;

function runProbe(saved: string, flags: ProbeFlags): number {
  const { rows, stressUnit, lengthUnit } = probeSaved(saved, probePoints(flags));
  if (flags.json) {
    process.stdout.write(`${JSON.stringify({ units: { length: lengthUnit, stress: stressUnit }, points: rows }, null, 2)}\n`);
    return 0;
  }
  if (flags.csv) {
    const head = ['x', 'y', 'ux', 'uy', 'sxx', 'syy', 'sxy', 's1', 's2', 'von_mises', 'tresca'];
    const lines = [head.join(','), ...rows.map((r) => COLUMNS.map((c) => (r[c] === null ? '' : String(r[c]))).join(','))];
    process.stdout.write(`${lines.join('\n')}\n`);
    return 0;
  }
  const out: string[] = [];
  out.push(`raiser probe: stresses in ${stressUnit}, lengths and displacements in ${lengthUnit}; values in the element holding each point`);
  out.push(COLUMNS.map((c) => c.padStart(11)).join(' '));
  for (const r of rows) {
    if (!r.inside) out.push(`${fmt(r.x, 6).padStart(11)} ${fmt(r.y, 6).padStart(11)}  outside the part`);
    else out.push(COLUMNS.map((c) => fmt(r[c] as number, c === 'ux' || c === 'uy' ? 4 : 5).padStart(11)).join(' '));
  }
  process.stdout.write(`${out.join('\n')}\n`);
  return 0;
}

export function declareProbe(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('<saved>', 'solution.raiser written by solve -o, or its folder')
    .option('--at <x,y>', 'a point (repeatable)', (v: string, prev: string[] = []) => [...prev, v])
    .option('--line <x0,y0,x1,y1>', 'points evenly along this line, ends included')
    .option('--points <n>', 'how many points along --line (default 11)')
    .option('--json', 'print the points as JSON')
    .option('--csv', 'print the points as CSV')
    .action((saved: string, flags: ProbeFlags) => setCode(runProbe(saved, flags)));
}
