/** The console summary of one analysis: the same facts as the JSON, laid out for a person. */
import type { ResultJson } from './result.js';

/** A number with `digits` significant figures, without exponent for everyday magnitudes. */
export function fmt(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-4 && a < 1e9) return Number(v.toPrecision(digits)).toString();
  return v.toExponential(digits - 1);
}

function pt(p: readonly number[]): string {
  return `(${fmt(p[0], 5)}, ${fmt(p[1], 5)})`;
}

export function formatSummary(r: ResultJson): string {
  const u = r.units;
  const out: string[] = [];
  const title = r.model.title ? `${r.model.title}` : 'untitled model';
  out.push(`raiser ${r.tool.version}: ${title}${r.model.file ? ` (${r.model.file})` : ''}`);
  out.push(
    `  ${r.analysis.state.replace('-', ' ')}, thickness ${fmt(r.analysis.thickness)} ${u.length}, E ${fmt(r.analysis.E)} ${u.stress}, nu ${fmt(r.analysis.nu)}; units ${u.length}, ${u.force}, ${u.stress}`,
  );
  out.push('');
  out.push(`  peak ${r.peak.measure} stress  ${fmt(r.peak.stress)} ${u.stress} at ${pt([r.peak.x, r.peak.y])}, ${r.peak.feature}`);
  const n = r.nominal;
  const s = n.section;
  const what = n.kind === 'tension' ? `F ${fmt(s.force)} ${u.force} over A ${fmt(s.area)} ${u.length}^2` : `M ${fmt(s.moment)} ${u.moment}, section depth ${fmt(s.length)} ${u.length}`;
  out.push(`  net nominal stress    ${fmt(n.stress)} ${u.stress}  ${what}`);
  out.push(`      cut ${pt(s.from)} to ${pt(s.to)}, material length ${fmt(s.length)} ${u.length}`);
  out.push(`      ${n.definition}`);
  out.push(`  gross nominal stress  ${fmt(n.gross.stress)} ${u.stress}`);
  out.push(`      ${n.gross.definition}`);
  out.push('');
  out.push(`  Kt net    ${fmt(r.kt.net, 4)}   = peak / net nominal stress`);
  out.push(`  Kt gross  ${fmt(r.kt.gross, 4)}   = peak / gross nominal stress`);
  out.push('');
  out.push(
    `  mesh   ${r.mesh.nodes} nodes, ${r.mesh.elements} ${r.mesh.elementType} triangles (${r.mesh.nodesPerElement}-node), ${r.mesh.dofs} DOF, smallest angle ${fmt(r.mesh.minAngleDeg, 3)} deg`,
  );
  out.push(`  time   mesh ${fmt(r.timeMs.mesh, 3)} ms, stiffness ${fmt(r.timeMs.assemble, 3)} ms, solve ${fmt(r.timeMs.solve, 3)} ms, total ${fmt(r.timeMs.total, 3)} ms`);
  out.push(
    `  loads  resultant (${fmt(r.load.resultant.fx)}, ${fmt(r.load.resultant.fy)}) ${u.force}; reactions balance them to ${r.load.equilibriumError.toExponential(1)} of the load`,
  );
  if (r.safety.yield !== null) {
    out.push(
      `  yield  peak is ${fmt(100 * (r.safety.peakOverYield ?? 0), 3)}% of the yield strength ${fmt(r.safety.yield)} ${u.stress}${r.safety.localPlasticity ? ': LOCAL PLASTICITY EXPECTED' : ''}`,
    );
  }
  if (r.warnings.length > 0) {
    out.push('');
    out.push('  warnings');
    for (const w of r.warnings) out.push(`   - ${w}`);
  }
  out.push('');
  out.push('  cautions');
  for (const c of r.cautions) out.push(`   - ${c}`);
  return out.join('\n');
}
