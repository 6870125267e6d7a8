/** The verification table: for the console and, as Markdown, for quality records. */
import { arch, cpus, platform, release } from 'node:os';
import type { VerifyRow } from '../verify/suite.js';
import { TOOL_VERSION } from '../model/version.js';
import { fmt } from './summary.js';

export function environment() {
  return {
    raiser: TOOL_VERSION,
    node: process.version,
    platform: `${platform()} ${release()} ${arch()}`,
    cpu: `${cpus()[0]?.model ?? 'unknown'} x ${cpus().length}`,
    date: new Date().toISOString(),
  };
}

function tol(r: VerifyRow): string {
  return r.toleranceKind === 'relative' ? `${fmt(100 * r.tolerance, 3)}%` : fmt(r.tolerance, 3);
}

function err(r: VerifyRow): string {
  if (!Number.isFinite(r.error)) return 'n/a';
  return r.toleranceKind === 'relative' ? `${fmt(100 * r.error, 2)}%` : fmt(r.error, 2);
}

/** One line per case, for the console. */
export function formatVerifyLine(r: VerifyRow): string {
  return `  ${r.pass ? 'pass' : 'FAIL'}  ${r.id.padEnd(26)} ref ${fmt(r.reference, 5).padEnd(10)} got ${fmt(r.computed, 5).padEnd(10)} err ${err(r).padEnd(9)} tol ${tol(r).padEnd(7)} ${fmt(r.timeMs / 1000, 2)} s`;
}

export function formatVerifySummary(rows: VerifyRow[]): string {
  const failed = rows.filter((r) => !r.pass);
  return failed.length === 0 ? `  all ${rows.length} cases pass` : `  ${failed.length} of ${rows.length} cases FAIL: ${failed.map((r) => r.id).join(', ')}`;
}

/** The written report: environment, then the table with sources and details. */
export function verifyReportMarkdown(rows: VerifyRow[]): string {
  const env = environment();
  const out: string[] = [];
  out.push('# raiser verification report');
  out.push('');
  out.push(`- raiser ${env.raiser}, Node ${env.node}`);
  out.push(`- ${env.platform}; ${env.cpu}`);
  out.push(`- run ${env.date}`);
  out.push(`- result: ${formatVerifySummary(rows).trim()}`);
  out.push('');
  out.push('| case | what | source | reference | computed | error | tolerance | result |');
  out.push('|---|---|---|---|---|---|---|---|');
  for (const r of rows) {
    out.push(`| ${r.id} | ${r.title}; ${r.quantity} | ${r.source} | ${fmt(r.reference, 6)} | ${fmt(r.computed, 6)} | ${err(r)} | ${tol(r)} | ${r.pass ? 'pass' : 'FAIL'} |`);
  }
  out.push('');
  out.push('Details:');
  out.push('');
  for (const r of rows) out.push(`- ${r.id}: ${r.detail} (${fmt(r.timeMs / 1000, 3)} s)`);
  out.push('');
  out.push('Provenance tags: [V] found in the named text; [D] derived from a closed form; [M] recalled, not checked against the text; [M+] recalled with an independent cross-check.');
  out.push('A pass means this installation reproduces the published values within the stated tolerances; it does not make any particular model right. Results must be checked by a qualified engineer under the applicable codes.');
  return out.join('\n') + '\n';
}
