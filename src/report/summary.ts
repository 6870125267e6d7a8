/** The console summary of one analysis: the same facts as the JSON, laid out for a person. */
import type { ResultJson } from './result-json.js';
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
  const g = r.material?.grade; // absent in results saved before grades existed
  if (g) {
    const strengths = g.tableYieldMPa !== null ? `yield ${fmt(g.tableYieldMPa)} MPa, ultimate ${fmt(g.tableUltimateMPa ?? 0)}${g.tableUltimateMaxMPa !== null ? ` to ${fmt(g.tableUltimateMaxMPa)}` : ''} MPa (minimum${g.tableUltimateMaxMPa !== null ? '; Rm range' : ''})` : `yield and ultimate not set: ${g.unsetWhy}`;
    out.push(`  material ${g.description}`);
    out.push(`      ${strengths}${g.provenance === 'M' ? '; [M]: values recalled from the standard, not checked against a copy: verify them' : ''}; values given in the model override these`);
  }
  out.push('');
  const pct = (v: number) => `${fmt(100 * v, 2)}%`;
  out.push(...formatCasesSummary(r, pct));
  const c = r.convergence;
  // The headline: the governing raiser's Kt, or why there is none.
  if (r.kt.value !== null) {
    const pm = r.kt.error === null ? '' : ` +- ${pct(r.kt.error)}`;
    out.push(`  Kt ${r.kt.kind} ${fmt(r.kt.value, 4)}${pm} at ${r.kt.raiser} (the governing stress raiser)`);
    if (r.kt.extrapolated !== null) out.push(`      extrapolated to a zero mesh size: ${fmt(r.kt.extrapolated, 5)}`);
  } else {
    out.push(`  Kt  none: ${r.kt.withheld}`);
  }
  out.push(`  highest ${r.peak.measure} stress  ${fmt(r.peak.stress)} ${u.stress} at ${pt([r.peak.x, r.peak.y])}, ${r.peak.feature}`);
  out.push('');
  if (r.raisers.length > 0) {
    out.push(`  stress raisers, highest peak first${r.raisers.length > 1 ? ' (* governs)' : ''}`);
    for (const x of r.raisers) {
      out.push(`  ${x.governing && r.raisers.length > 1 ? '*' : ' '} ${x.name}: peak ${fmt(x.peak.stress)} ${u.stress} at ${pt([x.peak.x, x.peak.y])}${x.radius !== null ? `, radius ${fmt(x.radius)} ${u.length}` : ''}`);
      if (x.status !== 'ok') {
        out.push(`      no Kt: ${x.reason}`);
        continue;
      }
      const sec = x.section;
      if (sec) {
        const lig = sec.ligaments.length;
        const what = sec.mirror ? 'half of a symmetric section: N / A' : `N ${fmt(sec.N ?? NaN)} ${u.force}, V ${fmt(sec.V ?? NaN)} ${u.force}, M ${fmt(sec.M ?? NaN)} ${u.moment} about its centroid`;
        out.push(`      ${sec.given ? 'given section' : 'net section'} ${pt(sec.from)} to ${pt(sec.to)}, ${fmt(sec.length)} ${u.length} of material in ${lig} ligament${lig > 1 ? 's' : ''}; ${what}`);
      }
      for (const kind of ['net', 'bearing', 'gross', 'remote', 'given'] as const) {
        const k = x.kt[kind];
        if (!k) continue;
        const label = `Kt ${kind}`.padEnd(10);
        if (k.value === null) out.push(`      ${label} withheld: ${k.withheld}`);
        else {
          const pm = k.error === null ? '' : ` +- ${pct(k.error)}`;
          const m = kind === 'net' ? (k as { membrane?: number | null }).membrane : undefined;
          const split = m !== undefined && m !== null && k.nominal !== null && !sec?.mirror && Math.abs(k.nominal - m) > 1e-6 * Math.abs(k.nominal) ? ` = N / A ${fmt(m)} ${k.nominal - m >= 0 ? '+' : '-'} bending ${fmt(Math.abs(k.nominal - m))}` : '';
          const nomWord = kind === 'gross' && x.gross ? ` over the gross width ${fmt(x.gross.length)} ${u.length}` : split;
          out.push(`      ${label} ${`${fmt(k.value, 4)}${pm}`.padEnd(16)} nominal ${fmt(k.nominal ?? NaN)} ${u.stress}${nomWord}`);
        }
      }
      if (x.chart) {
        const ch = x.chart;
        const diff = ch.difference === null ? `not compared${ch.outside.length ? `: outside its range or conditions (${ch.outside.join('; ')})` : ''}` : `computed differs by ${ch.difference >= 0 ? '+' : ''}${fmt(100 * ch.difference, 2)}% (the chart is good to about ${fmt(100 * ch.spread, 2)}%)`;
        out.push(`      chart ${ch.id} [${ch.provenance}]: Kt ${ch.nominal} ${ch.value === null ? 'n/a' : fmt(ch.value, 4)}; ${diff}`);
        out.push(`        ${ch.source}`);
      }
    }
  } else {
    out.push('  stress raisers: none (no hole, notch, fillet or other concave curved edge)');
  }
  if (r.singularPoints.length > 0) {
    out.push('');
    out.push('  singular points (the elastic stress there is infinite: no Kt, and no peak to design to)');
    for (const sp of r.singularPoints) {
      const grows = sp.grows === true ? `grows under refinement: ${sp.stresses.slice(-3).map((v) => fmt(v)).join(', ')} ${u.stress}` : sp.grows === null ? `${fmt(sp.stresses[sp.stresses.length - 1])} ${u.stress} on one mesh; a series would tell whether it grows` : 'converges here';
      out.push(`    ${sp.what}: ${grows}`);
      out.push(`      ${sp.fix}`);
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
          ? 'no raiser converges: every peak sits at a singular point'
          : `target ${pct(c.target!)} NOT met: estimated error ${c.estimatedError === null ? 'unknown' : pct(c.estimatedError)}`;
    const order = c.observedOrder === null ? 'no observed order' : `observed order ${fmt(c.observedOrder, 3)} (theory ${c.theoreticalOrder})`;
    out.push(`  accuracy  ${head} on ${c.quantity}; ${order}, safety factor ${c.safetyFactor ?? '-'} (grid convergence index over the last three meshes)`);
    out.push('      DOF        elements   raiser peak   Kt         highest stress  time');
    for (const m of c.meshes) {
      out.push(
        `      ${String(m.dofs).padEnd(10)} ${String(m.elements).padEnd(10)} ${(m.raiserPeak === null ? '-' : fmt(m.raiserPeak, 6)).padEnd(13)} ${(m.kt === null ? '-' : fmt(m.kt, 5)).padEnd(10)} ${fmt(m.peak, 6).padEnd(15)} ${fmt(m.timeMs, 3)} ms`,
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
  if (r.fatigue) {
    const f = r.fatigue;
    const what = f.withheld ?? f.methods.map((x) => `${x.name}: q ${fmt(x.q, 3)}, Kf ${fmt(x.kf, 4)}`).join('; ');
    out.push(`  fatigue  at ${f.raiser}, notch radius ${fmt(f.radius, 4)} ${u.length}, from Kt ${f.kt}: ${what}`);
    for (const n of f.notes) out.push(`      ${n}`);
  }
  if (r.plasticity) {
    const p = r.plasticity;
    out.push(`  plasticity  at the governing raiser, Neuber's rule with the given stress-strain law: local stress ${fmt(p.localStress)} ${u.stress}, strain ${fmt(100 * p.localStrain, 3)}% (elastic ${fmt(100 * p.elasticStrain, 3)}%)`);
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

/**
 * With load cases: one short block per case (headline Kt with its band or why it is withheld,
 * each raiser's Kt, the peak, how its series ended), then the governing case, which the rest of
 * the summary and the pictures describe. Nothing for a model of plain loads.
 */
function formatCasesSummary(r: ResultJson, pct: (v: number) => string): string[] {
  if (!r.cases) return [];
  const u = r.units;
  const out: string[] = [];
  const last = r.cases.map((c) => c.solve);
  out.push(`  load cases: ${r.cases.length}, solved together on shared meshes (${last.every((s) => s.factorisations === 1) ? 'one factorisation of the stiffness per mesh' : 'the iterative solver: no factorisation to share'})`);
  for (const c of r.cases) {
    out.push(`  ${c.governing ? '*' : ' '} case "${c.name}"`);
    if (c.kt.value !== null) out.push(`      Kt ${c.kt.kind} ${fmt(c.kt.value, 4)}${c.kt.error === null ? '' : ` +- ${pct(c.kt.error)}`} at ${c.kt.raiser}`);
    else out.push(`      Kt  none: ${c.kt.withheld}`);
    for (const x of c.raisers) {
      if (x.name === c.kt.raiser) continue;
      const k = x.headline ? x.kt[x.headline] : undefined;
      const what = x.status !== 'ok' ? `no Kt: ${x.reason}` : k && k.value !== null ? `Kt ${x.headline} ${fmt(k.value, 4)}${k.error === null ? '' : ` +- ${pct(k.error)}`}` : `Kt withheld: ${k?.withheld ?? 'no nominal stress'}`;
      out.push(`      ${x.name}: peak ${fmt(x.peak.stress)} ${u.stress}; ${what}`);
    }
    const cv = c.convergence;
    const acc = cv.status === 'single-mesh' ? 'one mesh, error not estimated' : cv.status === 'converged' ? `target met on ${cv.meshes} meshes` : cv.status === 'singular' ? `no raiser converges (${cv.meshes} meshes)` : `target NOT met on ${cv.meshes} meshes`;
    out.push(`      highest ${c.peak.measure} stress ${fmt(c.peak.stress)} ${u.stress} at ${pt([c.peak.x, c.peak.y])}, ${c.peak.feature}; ${acc}; loads (${fmt(c.load.resultant.fx)}, ${fmt(c.load.resultant.fy)}) ${u.force}, balanced to ${c.load.equilibriumError.toExponential(1)}`);
    // the governing case's warnings are listed below with the rest of its summary
    if (!c.governing) for (const w of c.warnings) out.push(`      warning: ${w}`);
  }
  out.push(`  governing case: "${r.loadCase}" (the highest peak stress); everything below, and the pictures, are of this case`);
  out.push('');
  return out;
}
