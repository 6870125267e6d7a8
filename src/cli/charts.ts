/**
 * `raiser charts`: lists the published Kt formulas; `raiser charts <id> --name value ...`
 * evaluates one. A template name of `raiser new` (plate-with-hole, stepped-bar ...) finds the
 * charts of that family (the chart entries list their templates) and evaluates each one the
 * given dimensions fit.
 */
import type { Command } from 'commander';
import { CHARTS, chartsForTemplate, findChart, type Chart } from '../charts/library.js';
import { ModelError } from '../model/errors.js';
import { closest, quoteList } from '../model/suggest.js';
import { TEMPLATES } from '../model/templates.js';
import { fmt } from '../report/summary.js';
import { parseParamPairs } from './new.js';

function describeChart(c: Chart): string[] {
  const out = [`  ${c.id}: ${c.title}`];
  out.push(`      Kt on ${c.nominal === 'bearing' ? 'the bearing stress' : `${c.nominal} section`}: ${c.nominalDefinition}; range ${c.range}`);
  if (c.params.length) out.push(`      parameters: ${c.params.map((p) => `--${p.name} (${p.meaning})`).join(', ')}`);
  if (c.templates.length) out.push(`      family of the template${c.templates.length === 1 ? '' : 's'} ${c.templates.join(', ')} (raiser new ${c.templates[0]})`);
  out.push(`      source [${c.provenance}]: ${c.source}`);
  out.push('');
  return out;
}

const PROVENANCE = '  provenance: V found in the named text; D derived from a closed form; M recalled, not checked against the text; M+ recalled with an independent cross-check';

function listCharts(): string {
  const out = ['published Kt formulas (raiser charts <id or template> --<parameter> <value> ...):', ''];
  for (const c of CHARTS) out.push(...describeChart(c));
  out.push(PROVENANCE);
  return out.join('\n');
}

/** Every name `raiser charts` answers to: chart ids, and the templates some chart lists. */
function chartNames(): string[] {
  return [...CHARTS.map((c) => c.id), ...TEMPLATES.map((t) => t.name).filter((t) => chartsForTemplate(t).length > 0)];
}

/** Numbers from "--name value" pairs; `known` are the names accepted (others get a suggestion). */
function readDimensions(rest: string[], known: string[], ignorable: string[], where: string): { values: Record<string, number>; ignored: string[] } {
  const raw = parseParamPairs(rest);
  const values: Record<string, number> = {};
  const ignored: string[] = [];
  for (const [k, v] of Object.entries(raw)) {
    if (!known.includes(k)) {
      if (ignorable.includes(k)) {
        ignored.push(k);
        continue;
      }
      const hint = closest(k, known);
      throw new ModelError(k, `${where} has no parameter "${k}"${hint ? `; did you mean "${hint}"?` : ''}`, `its parameters are ${known.join(', ') || 'none'}`);
    }
    const n = Number(v);
    if (!Number.isFinite(n) || n <= 0) throw new ModelError(k, `--${k} must be a positive number; found "${v}"`);
    values[k] = n;
  }
  return { values, ignored };
}

interface Evaluation {
  id: string;
  kt: number;
  nominal: Chart['nominal'];
  nominalDefinition: string;
  source: string;
  provenance: string;
  spread: number;
  outside: string[];
  params: Record<string, number>;
}

function evaluateChart(chart: Chart, all: Record<string, number>): Evaluation {
  const params: Record<string, number> = {};
  for (const p of chart.params) params[p.name] = all[p.name];
  return { id: chart.id, kt: chart.evaluate(params), nominal: chart.nominal, nominalDefinition: chart.nominalDefinition, source: chart.source, provenance: chart.provenance, spread: chart.spread, outside: chart.outside(params), params };
}

function formatEvaluation(chart: Chart, e: Evaluation, withId: boolean): string {
  const lines = [`${withId ? `${chart.id}: ` : ''}${chart.title}`, `  Kt ${chart.nominal} = ${fmt(e.kt, 4)}   (nominal stress ${chart.nominalDefinition})`];
  lines.push(`  source [${chart.provenance}]: ${chart.source}; trust it to about ${fmt(100 * chart.spread, 2)}%`);
  for (const o of e.outside) lines.push(`  warning: ${o}: outside the range of the chart (${chart.range}); the value is an extrapolation`);
  return lines.join('\n');
}

function runChart(chart: Chart, rest: string[], json: boolean): void {
  const { values } = readDimensions(rest, chart.params.map((p) => p.name), [], `the chart ${chart.id}`);
  for (const p of chart.params) {
    if (values[p.name] === undefined) throw new ModelError(p.name, `the chart ${chart.id} needs --${p.name} (${p.meaning})`, `give --${p.name} <value>`);
  }
  const e = evaluateChart(chart, values);
  process.stdout.write((json ? JSON.stringify(e, null, 2) : formatEvaluation(chart, e, false)) + '\n');
}

/** `raiser charts <template> ...`: the charts of the family, listed, or evaluated where the dimensions given fit. */
function runFamily(template: string, charts: Chart[], rest: string[], json: boolean): void {
  if (rest.length === 0) {
    const out = [`published Kt formulas for the family of the template ${template} (raiser charts ${template} --<parameter> <value> ... evaluates each one the dimensions fit):`, ''];
    for (const c of charts) out.push(...describeChart(c));
    out.push(PROVENANCE);
    process.stdout.write(out.join('\n') + '\n');
    return;
  }
  const known = [...new Set(charts.flatMap((c) => c.params.map((p) => p.name)))];
  // The template's other parameters (stress, thickness, lengths ...) may be given as for raiser new; no chart uses them.
  const templateParams = TEMPLATES.find((t) => t.name === template)!.params.flatMap((p) => [p.name, ...(p.aliases ?? [])]);
  const { values, ignored } = readDimensions(rest, known, templateParams, `no chart of the template ${template}`);
  // A chart without dimensions (a hole far from every edge) is a limit, not a value for these dimensions: named, not evaluated.
  const limits = charts.filter((c) => c.params.length === 0);
  const fits = charts.filter((c) => c.params.length > 0 && c.params.every((p) => values[p.name] !== undefined));
  const needing = charts.filter((c) => c.params.length > 0 && !fits.includes(c));
  if (fits.length === 0) {
    const c = needing[0];
    const missing = c.params.filter((p) => values[p.name] === undefined).map((p) => `--${p.name} (${p.meaning})`);
    throw new ModelError(missing[0].slice(2).split(' ')[0], `the chart ${c.id} of the template ${template} needs ${missing.join(', ')}`, `give ${missing.map((m) => m.split(' ')[0] + ' <value>').join(' ')}`);
  }
  const evals = fits.map((c) => ({ chart: c, e: evaluateChart(c, values) }));
  if (json) {
    process.stdout.write(JSON.stringify({ template, charts: evals.map((x) => x.e), notEvaluated: needing.map((c) => ({ id: c.id, needs: c.params.filter((p) => values[p.name] === undefined).map((p) => p.name) })), ignored }, null, 2) + '\n');
    return;
  }
  const out = [`charts for the template ${template}:`, ''];
  for (const x of evals) out.push(formatEvaluation(x.chart, x.e, true), '');
  for (const c of needing) out.push(`  not evaluated: ${c.id} needs ${c.params.filter((p) => values[p.name] === undefined).map((p) => `--${p.name} (${p.meaning})`).join(', ')}`);
  for (const c of limits) out.push(`  the limit with no dimensions: ${c.id}, ${c.title}: Kt ${c.nominal} = ${fmt(c.evaluate({}), 4)} (raiser charts ${c.id})`);
  if (ignored.length) out.push(`  not used by any chart: ${ignored.map((k) => `--${k}`).join(', ')} (the charts are Kt, without units or loads)`);
  process.stdout.write(out.join('\n').trimEnd() + '\n');
}

export function declareCharts(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('[chart]', 'chart id, or a template name of raiser new for the charts of its family; omit it to list the library')
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
      if (chart) {
        runChart(chart, rest, json);
        setCode(0);
        return;
      }
      const template = TEMPLATES.find((t) => t.name === id);
      if (template) {
        const charts = chartsForTemplate(id);
        if (charts.length === 0) {
          const withCharts = TEMPLATES.map((t) => t.name).filter((t) => chartsForTemplate(t).length > 0);
          throw new ModelError('', `the library has no published chart for the family of the template "${id}"`, `solve it (raiser new ${id} > m.json; raiser solve m.json); the templates with charts are ${quoteList(withCharts, 'and')}`);
        }
        runFamily(id, charts, rest, json);
        setCode(0);
        return;
      }
      const names = chartNames();
      const hint = closest(id, names);
      throw new ModelError('', `there is no chart or template "${id}"${hint ? `; did you mean "${hint}"?` : ''}`, `raiser charts lists them; the names are ${names.join(', ')}`);
    });
}
