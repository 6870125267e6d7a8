/** `raiser charts`: lists the published Kt formulas; `raiser charts <id> --name value ...` evaluates one. */
import type { Command } from 'commander';
import { CHARTS, findChart } from '../charts/library.js';
import { ModelError } from '../model/errors.js';
import { closest } from '../model/suggest.js';
import { fmt } from '../report/summary.js';
import { parseParamPairs } from './new.js';

function listCharts(): string {
  const out = ['published Kt formulas (raiser charts <id> --<parameter> <value> ...):', ''];
  for (const c of CHARTS) {
    out.push(`  ${c.id}: ${c.title}`);
    out.push(`      Kt on ${c.nominal === 'bearing' ? 'the bearing stress' : `${c.nominal} section`}: ${c.nominalDefinition}; range ${c.range}`);
    if (c.params.length) out.push(`      parameters: ${c.params.map((p) => `--${p.name} (${p.meaning})`).join(', ')}`);
    out.push(`      source [${c.provenance}]: ${c.source}`);
    out.push('');
  }
  out.push('  provenance: V found in the named text; D derived from a closed form; M recalled, not checked against the text; M+ recalled with an independent cross-check');
  return out.join('\n');
}

export function chartsCommand(program: Command, setCode: (c: number) => void): void {
  program
    .command('charts')
    .description('list the published Kt formulas, or evaluate one: raiser charts fillet-tension --D 60 --d 40 --r 6')
    .argument('[chart]', 'chart id; omit it to list the library')
    .argument('[params...]', 'dimensions as --name value')
    .allowUnknownOption()
    .option('--json', 'print the evaluation as JSON')
    .action((id: string | undefined, params: string[], flags: { json?: boolean }) => {
      const json = !!flags.json || params.includes('--json');
      const rest = params.filter((p) => p !== '--json');
      if (!id) {
        process.stdout.write(listCharts() + '\n');
        setCode(0);
        return;
      }
      const chart = findChart(id);
      if (!chart) {
        const hint = closest(id, CHARTS.map((c) => c.id));
        throw new ModelError('', `there is no chart "${id}"${hint ? `; did you mean "${hint}"?` : ''}`, 'raiser charts lists them');
      }
      const raw = parseParamPairs(rest);
      const values: Record<string, number> = {};
      for (const p of chart.params) {
        const v = raw[p.name];
        if (v === undefined) throw new ModelError(p.name, `the chart ${chart.id} needs --${p.name} (${p.meaning})`, `give --${p.name} <value>`);
        const n = Number(v);
        if (!Number.isFinite(n) || n <= 0) throw new ModelError(p.name, `--${p.name} must be a positive number; found "${v}"`);
        values[p.name] = n;
      }
      for (const k of Object.keys(raw)) {
        if (!chart.params.some((p) => p.name === k)) {
          const hint = closest(k, chart.params.map((p) => p.name));
          throw new ModelError(k, `the chart ${chart.id} has no parameter "${k}"${hint ? `; did you mean "${hint}"?` : ''}`, `its parameters are ${chart.params.map((p) => p.name).join(', ') || 'none'}`);
        }
      }
      const outside = chart.outside(values);
      const kt = chart.evaluate(values);
      if (json) {
        process.stdout.write(JSON.stringify({ id: chart.id, kt, nominal: chart.nominal, nominalDefinition: chart.nominalDefinition, source: chart.source, provenance: chart.provenance, spread: chart.spread, outside, params: values }, null, 2) + '\n');
      } else {
        process.stdout.write(`${chart.title}\n  Kt ${chart.nominal} = ${fmt(kt, 4)}   (nominal stress ${chart.nominalDefinition})\n`);
        process.stdout.write(`  source [${chart.provenance}]: ${chart.source}; trust it to about ${fmt(100 * chart.spread, 2)}%\n`);
        for (const o of outside) process.stdout.write(`  warning: ${o}: outside the range of the chart (${chart.range}); the value is an extrapolation\n`);
      }
      setCode(0);
    });
}
