/** The console summary of one analysis: the same facts as the JSON, laid out for a person. */
import type { ResultJson } from './result.js';
import { formatPinsSummary } from './pins.js';

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
  const c = r.convergence;
  const pct = (v: number) => `${fmt(100 * v, 2)}%`;
  if (r.kt.net === null || r.kt.gross === null) {
    out.push(`  Kt        none: the peak does not converge`);
    out.push(`      the peak at ${pt([r.peak.x, r.peak.y])} (${r.peak.feature}) grows as the mesh is refined; the elastic stress at a sharp`);
    out.push(`      re-entrant corner is infinite, so no Kt exists there. Model the real corner radius and solve again.`);
  } else {
    const pm = r.kt.error === null ? '' : ` +- ${pct(r.kt.error)}`;
    out.push(`  Kt net    ${fmt(r.kt.net, 4)}${pm}   = peak / net nominal stress`);
    out.push(`  Kt gross  ${fmt(r.kt.gross, 4)}${pm}   = peak / gross nominal stress`);
    if (r.kt.netExtrapolated !== null && r.kt.grossExtrapolated !== null) {
      out.push(`      extrapolated to a zero mesh size: Kt net ${fmt(r.kt.netExtrapolated, 5)}, Kt gross ${fmt(r.kt.grossExtrapolated, 5)}`);
    }
  }
  out.push('');
  if (c.status === 'single-mesh') {
    out.push('  accuracy  one mesh only: the discretisation error is not estimated');
  } else {
    const head =
      c.status === 'converged'
        ? `target ${pct(c.target!)} met: estimated error ${pct(c.estimatedError!)}`
        : c.status === 'singular'
          ? 'the peak diverges under refinement'
          : `target ${pct(c.target!)} NOT met: estimated error ${c.estimatedError === null ? 'unknown' : pct(c.estimatedError)}`;
    const order = c.observedOrder === null ? 'no observed order' : `observed order ${fmt(c.observedOrder, 3)} (theory ${c.theoreticalOrder})`;
    out.push(`  accuracy  ${head}; ${order}, safety factor ${c.safetyFactor ?? '-'} (grid convergence index over the last three meshes)`);
    out.push('      DOF        elements   peak          Kt net     Kt gross   time');
    for (const m of c.meshes) {
      out.push(
        `      ${String(m.dofs).padEnd(10)} ${String(m.elements).padEnd(10)} ${fmt(m.peak, 6).padEnd(13)} ${fmt(m.ktNet, 5).padEnd(10)} ${fmt(m.ktGross, 5).padEnd(10)} ${fmt(m.timeMs, 3)} ms`,
      );
    }
    for (const note of c.notes) out.push(`      ${note}`);
  }
  out.push('');
  out.push(
    `  mesh   ${r.mesh.nodes} nodes, ${r.mesh.elements} ${r.mesh.elementType} triangles (${r.mesh.nodesPerElement}-node), ${r.mesh.dofs} DOF, smallest angle ${fmt(r.mesh.minAngleDeg, 3)} deg`,
  );
  out.push(`  time   mesh ${fmt(r.timeMs.mesh, 3)} ms, stiffness ${fmt(r.timeMs.assemble, 3)} ms, solve ${fmt(r.timeMs.solve, 3)} ms, total ${fmt(r.timeMs.total, 3)} ms`);
  if (r.solver.method === 'pcg') {
    out.push(`  solver the direct factor would not fit in memory: conjugate gradients preconditioned by ${r.solver.preconditioner ?? 'incomplete Cholesky'}, ${r.solver.iterations} iterations, residual ${r.solver.relativeResidual.toExponential(1)}, backward error ${r.solver.backwardError.toExponential(1)}`);
  }
  out.push(
    `  loads  resultant (${fmt(r.load.resultant.fx)}, ${fmt(r.load.resultant.fy)}) ${u.force}; reactions balance them to ${r.load.equilibriumError.toExponential(1)} of the load`,
  );
  if (r.chart) {
    const ch = r.chart;
    const diff = ch.difference === null ? 'not comparable' : `computed differs by ${ch.difference >= 0 ? '+' : ''}${fmt(100 * ch.difference, 2)}%`;
    out.push(`  chart  ${ch.id} [${ch.provenance}]: Kt ${ch.nominal} ${ch.value === null ? 'n/a' : fmt(ch.value, 4)}; ${diff} (the chart is good to about ${fmt(100 * ch.spread, 2)}%)`);
    out.push(`      ${ch.source}`);
    for (const o of ch.outside) out.push(`      outside the chart's range: ${o}`);
  }
  if (r.fatigue) {
    const f = r.fatigue;
    out.push(`  fatigue  at the notch radius ${fmt(f.radius, 4)} ${u.length}: ${f.methods.map((x) => `${x.name}: q ${fmt(x.q, 3)}, Kf ${fmt(x.kf, 4)}`).join('; ')}`);
    for (const n of f.notes) out.push(`      ${n}`);
  }
  if (r.plasticity) {
    const p = r.plasticity;
    out.push(`  plasticity  Neuber's rule with the given stress-strain law: local stress ${fmt(p.localStress)} ${u.stress}, strain ${fmt(100 * p.localStrain, 3)}% (elastic ${fmt(100 * p.elasticStrain, 3)}%)`);
  }
  if (r.safety.yield !== null) {
    out.push(
      `  yield  peak is ${fmt(100 * (r.safety.peakOverYield ?? 0), 3)}% of the yield strength ${fmt(r.safety.yield)} ${u.stress}${r.safety.localPlasticity ? ': LOCAL PLASTICITY EXPECTED' : ''}`,
    );
  }
  out.push(...formatPinsSummary(r));
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
