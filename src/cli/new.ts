/** `raiser new <template> --param value ...`: prints a model built from a template. */
import type { Command } from 'commander';
import { ModelError } from '../model/errors.js';
import { expandTemplate, TEMPLATES, type TemplateInfo } from '../model/templates.js';
import { chartsForTemplate } from '../charts/library.js';
import { didYouMean, quoteList } from '../model/suggest.js';
import { formatJson } from '../model/format-json.js';

/** One line per parameter: name, meaning, other names, choices, default with its unit. */
function describeParams(t: TemplateInfo, indent: string): string[] {
  return t.params.map((p) => {
    const unit = p.unit ? ` ${p.unit}` : '';
    const choices = p.choices ? ` (${p.choices.join(' | ')})` : '';
    const also = p.aliases?.length ? ` (also --${p.aliases.join(', --')})` : '';
    return `${indent}--${p.name.padEnd(14)} ${p.meaning}${also}${choices}; default ${p.default}${typeof p.default === 'number' ? unit : ''}`;
  });
}

function listTemplates(): string {
  const out: string[] = ['templates (raiser new <template> --<parameter> <value> ...; raiser new <template> --help for one):', ''];
  for (const t of TEMPLATES) {
    out.push(`  ${t.name}: ${t.description}`);
    out.push(...describeParams(t, '      '));
    out.push('');
  }
  return out.join('\n');
}

/** `raiser new <template> --help`: the template's parameters, their units and what they may be. */
function templateHelp(t: TemplateInfo): string {
  const out = [`Usage: raiser new ${t.name} [--<parameter> <value> ...] > model.json`, '', `${t.name}: ${t.description}`, '', 'parameters:'];
  out.push(...describeParams(t, '  '));
  out.push(
    '',
    'lengths are in the model\'s length unit and stresses in its stress unit (mm and MPa unless',
    '--length-unit and --force-unit say otherwise); every length is positive, and a shape that cannot',
    'be drawn (a hole wider than the plate) is refused with the reason.',
  );
  const charts = chartsForTemplate(t.name);
  if (charts.length) {
    out.push('', `ranges of the published charts of this family (raiser charts ${t.name}; outside them a model solves, but the chart check is an extrapolation):`);
    for (const c of charts) out.push(`  ${c.id}: ${c.range}`);
  } else out.push('', 'no published chart of this family is in the library: the solution is checked by its convergence study alone.');
  return out.join('\n');
}

/** Parses "--name value" pairs (also "--name=value"). */
export function parseParamPairs(args: string[]): Record<string, string> {
  const values: Record<string, string> = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (!a.startsWith('--')) throw new ModelError('', `unexpected argument "${a}"`, 'give parameters as --name value');
    const eq = a.indexOf('=');
    if (eq > 0) {
      values[a.slice(2, eq)] = a.slice(eq + 1);
      continue;
    }
    const v = args[i + 1];
    if (v === undefined || (v.startsWith('--') && !/^--?\d/.test(v))) throw new ModelError(a.slice(2), `${a} needs a value`, `write ${a} <value>`);
    values[a.slice(2)] = v;
    i++;
  }
  return values;
}

export function declareNew(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('[template]', 'template name; omit it to list the templates')
    .argument('[params...]', 'parameters as --name value')
    .allowUnknownOption()
    // --help is read here, not by commander: after a template name it shows that template's parameters.
    .helpOption(false)
    .addHelpText('after', '\nraiser new lists the templates; raiser new <template> --help shows the parameters of one.')
    .action((name: string | undefined, params: string[], _flags: object, cmd: Command) => {
      const help = (a: string) => a === '--help' || a === '-h';
      if (name !== undefined && help(name)) {
        cmd.outputHelp();
        setCode(0);
        return;
      }
      if (!name || name === '--list') {
        process.stdout.write(listTemplates() + '\n');
        setCode(0);
        return;
      }
      if (params.some(help)) {
        const t = TEMPLATES.find((x) => x.name === name);
        if (!t) {
          const names = TEMPLATES.map((x) => x.name);
          throw new ModelError('', `there is no template "${name}"${didYouMean(name, names)}`, `the templates are ${quoteList(names, 'and')}`);
        }
        process.stdout.write(templateHelp(t) + '\n');
        setCode(0);
        return;
      }
      const model = expandTemplate(name, parseParamPairs(params));
      process.stdout.write(formatJson(model) + '\n');
      setCode(0);
    });
}
