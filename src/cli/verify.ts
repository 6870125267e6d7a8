/** `raiser verify`: the verification suite, published and closed-form cases with sources and tolerances. */
import type { Command } from 'commander';
import { join } from 'node:path';
import { ModelError } from '../model/errors.js';
import { TOOL_VERSION } from '../model/version.js';
import { prepareOutputDir, writeAtomic } from '../report/files.js';
import { environment, formatVerifyLine, formatVerifySummary, verifyReportMarkdown } from '../report/verify-report.js';
import { runVerify, verifyCases } from '../verify/suite.js';

function runVerifyCommand(flags: { json?: boolean; out?: string; force?: boolean; only?: string }): number {
  const only = flags.only ? flags.only.split(',').map((x) => x.trim()).filter(Boolean) : undefined;
  if (flags.out !== undefined) prepareOutputDir(flags.out, ['verify-report.md', 'verify.json'], flags.force ?? false);
  if (!flags.json) process.stdout.write(`raiser ${TOOL_VERSION} verification suite\n`);
  const rows = runVerify(only, flags.json ? undefined : (r) => process.stdout.write(formatVerifyLine(r) + '\n'));
  if (rows.length === 0) throw new ModelError('--only', `no verification case starts with ${flags.only}`, `the cases are ${verifyCases().map((c) => c.id).join(', ')}`);
  const summary = { environment: environment(), pass: rows.every((r) => r.pass), rows };
  if (flags.out !== undefined) {
    writeAtomic(join(flags.out, 'verify-report.md'), verifyReportMarkdown(rows));
    writeAtomic(join(flags.out, 'verify.json'), JSON.stringify(summary, null, 2) + '\n');
  }
  if (flags.json) process.stdout.write(JSON.stringify(summary, null, 2) + '\n');
  else {
    process.stdout.write(formatVerifySummary(rows) + '\n');
    if (flags.out !== undefined) process.stdout.write(`  wrote ${join(flags.out, 'verify-report.md')} and ${join(flags.out, 'verify.json')}\n`);
  }
  // A failed case means this installation does not reproduce a published value: a fault.
  return summary.pass ? 0 : 1;
}

export function declareVerify(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .option('--json', 'print the rows as one JSON object on stdout, nothing else')
    .option('-o, --out <dir>', 'write verify-report.md and verify.json into this folder')
    .option('--force', 'replace report files that already exist')
    .option('--only <ids>', 'run only the cases whose id starts with one of these (comma separated)')
    .action((flags: { json?: boolean; out?: string; force?: boolean; only?: string }) => setCode(runVerifyCommand(flags)));
}
