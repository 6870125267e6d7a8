/** `raiser new <template> --param value ...`: prints a model built from a template. */
import type { Command } from 'commander';
import { ModelError } from '../model/errors.js';
import { expandTemplate, TEMPLATES } from '../model/templates.js';
import { formatJson } from '../model/format-json.js';

function listTemplates(): string {
  const out: string[] = ['templates (raiser new <template> --<parameter> <value> ...):', ''];
  for (const t of TEMPLATES) {
    out.push(`  ${t.name}: ${t.description}`);
    for (const p of t.params) {
      const unit = p.unit ? ` ${p.unit}` : '';
      const choices = p.choices ? ` (${p.choices.join(' | ')})` : '';
      const also = p.aliases?.length ? ` (also --${p.aliases.join(', --')})` : '';
      out.push(`      --${p.name.padEnd(14)} ${p.meaning}${also}${choices}; default ${p.default}${typeof p.default === 'number' ? unit : ''}`);
    }
    out.push('');
  }
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

export function newCommand(program: Command, setCode: (c: number) => void): void {
  program
    .command('new')
    .description('print a model file for a standard family (plate with a hole, stepped bar, notched bars ...)')
    .argument('[template]', 'template name; omit it to list the templates')
    .argument('[params...]', 'parameters as --name value')
    .allowUnknownOption()
    .helpOption('-h, --help', 'show this help')
    .action((name: string | undefined, params: string[]) => {
      if (!name || name === '--list') {
        process.stdout.write(listTemplates() + '\n');
        setCode(0);
        return;
      }
      const model = expandTemplate(name, parseParamPairs(params));
      process.stdout.write(formatJson(model) + '\n');
      setCode(0);
    });
}
