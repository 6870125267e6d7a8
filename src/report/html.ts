/**
 * The report as one self-contained HTML file: every picture embedded as a data: URI (drawn for
 * the column, with text that prints at 8 pt or more: src/report/report-pictures.ts), no
 * scripts, no external style sheets or fonts, so it can be mailed, archived and printed as it
 * is. The print style keeps figures and tables whole on a page and fits A4 and Letter alike
 * (a text width of 180 mm fits both with 14 mm margins; no fixed page heights).
 */
import { describeSelector } from '../geometry/select.js';
import type { Load, ReportInfo, Selector, Support } from '../model/schema.js';
import { loadsOf } from '../model/load-cases.js';
import { formatValue } from '../render/ticks.js';
import { measureName } from './pictures.js';
import { describePinLoad, describePinSupport, pinsHtml } from './pins.js';
import type { PlotSource } from './saved.js';
import type { ReportPicture } from './report-pictures.js';
import type { ResultJson } from './result-json.js';

function esc(t: unknown): string {
  return String(t).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

const f = (v: number | null | undefined, d = 4) => (v === null || v === undefined ? '-' : esc(formatValue(v, d)));
const pct = (v: number | null | undefined, d = 2) => (v === null || v === undefined ? '-' : `${formatValue(100 * v, d)}%`);

function target(on: Selector | Selector[] | undefined): string {
  if (on === undefined) return 'the outer edges without a support';
  return (Array.isArray(on) ? on : [on]).map(describeSelector).join(', ');
}

function describeLoad(l: Load, stress: string, force: string, moment: string, length: string): string {
  switch (l.type) {
    case 'traction':
      return `traction on ${target(l.on)}: ${[l.normal !== undefined ? `normal ${f(l.normal)} ${stress}` : '', l.shear !== undefined ? `shear ${f(l.shear)} ${stress}` : ''].filter(Boolean).join(', ')}`;
    case 'force':
      return `force on ${target(l.on)}: ${[l.fx !== undefined ? `fx ${f(l.fx)} ${force}` : '', l.fy !== undefined ? `fy ${f(l.fy)} ${force}` : ''].filter(Boolean).join(', ')}`;
    case 'moment':
      return `moment on ${target(l.on)}: ${f(l.m)} ${moment}`;
    case 'pressure':
      return `pressure on ${target(l.on)}: ${f(l.p)} ${stress}`;
    case 'remote':
      return `remote stress on ${target(l.on)}: sxx ${f(l.sxx ?? 0)}, syy ${f(l.syy ?? 0)}, sxy ${f(l.sxy ?? 0)} ${stress}`;
    default:
      return describePinLoad(l, force, length);
  }
}

function describeSupport(s: Support, length: string): string {
  switch (s.type) {
    case 'fixed':
      return `fixed (both components held) on ${target(s.on)}`;
    case 'roller':
      return `roller on ${target(s.on)}: the ${s.fix} displacement held, the ${s.fix === 'x' ? 'y' : 'x'} displacement free`;
    case 'symmetry':
      return `symmetry (normal displacement held) on ${target(s.on)}`;
    case 'pin': {
      const fix = s.fix ?? 'xy';
      return `point support at the boundary node nearest (${f(s.at[0], 5)}, ${f(s.at[1], 5)}) ${length}, holding ${fix === 'xy' ? 'both displacements' : `the ${fix} displacement`}`;
    }
    default:
      return describePinSupport(s, length);
  }
}

/**
 * A picture drawn for the column (src/report/report-pictures.ts), at its CSS size; the data
 * attributes say what its smallest text is, in CSS pixels at that size, so that a reader (the
 * legibility test) can tell the printed text size from the displayed width.
 */
function figure(png: ReadonlyMap<string, ReportPicture>, name: string, caption: string): string {
  const p = png.get(name);
  if (!p) return '';
  return `<figure id="fig-${name}"><img alt="${esc(caption)}" width="${p.width}" height="${p.height}" data-css-width="${p.width}" data-min-text-px="${p.minTextPx.toFixed(2)}" src="data:image/png;base64,${p.png.toString('base64')}"><figcaption>${esc(caption)}</figcaption></figure>`;
}

function rows(list: [string, string][]): string {
  return list.map(([k, v]) => `<tr><th scope="row">${esc(k)}</th><td>${v}</td></tr>`).join('');
}

const STYLE = `
:root { --ink: #1c1e26; --soft: #60646e; --rule: #d6d8dc; --accent: #c44e16; --band: #f3f1ec; --warn: #962819; }
* { box-sizing: border-box; }
body { margin: 0; color: var(--ink); font: 10.5pt/1.45 "DejaVu Sans", Verdana, sans-serif; background: #fff; }
main { max-width: 180mm; margin: 0 auto; padding: 10mm 0 16mm; }
header { border-bottom: 3px solid var(--ink); padding-bottom: 4mm; margin-bottom: 5mm; }
header .kind { text-transform: uppercase; letter-spacing: 0.12em; font-size: 8.5pt; color: var(--soft); margin: 0; }
h1 { font-size: 18pt; margin: 1mm 0 2mm; line-height: 1.2; }
header p { margin: 0.5mm 0; color: var(--soft); }
h2 { font-size: 12.5pt; margin: 8mm 0 2.5mm; padding-left: 3mm; border-left: 4px solid var(--accent); break-after: avoid; page-break-after: avoid; }
.keys { display: grid; grid-template-columns: repeat(3, 1fr); gap: 3mm; margin: 4mm 0; }
.key { background: var(--band); padding: 3mm 4mm; border-radius: 1.5mm; break-inside: avoid; }
.key .label { font-size: 8.5pt; color: var(--soft); text-transform: uppercase; letter-spacing: 0.08em; }
.key .value { font-size: 17pt; font-weight: bold; }
.key .sub { font-size: 8.5pt; color: var(--soft); }
.caution { border: 1.5px solid var(--warn); color: var(--warn); padding: 2.5mm 4mm; border-radius: 1.5mm; margin: 4mm 0; break-inside: avoid; }
.caution ul { margin: 1mm 0 0; padding-left: 5mm; color: var(--ink); }
table { border-collapse: collapse; width: 100%; margin: 2mm 0 3mm; break-inside: avoid; page-break-inside: avoid; font-size: 9.5pt; }
th, td { text-align: left; padding: 1.2mm 2mm; border-bottom: 1px solid var(--rule); vertical-align: top; }
thead th { border-bottom: 1.5px solid var(--ink); font-size: 8.5pt; text-transform: uppercase; letter-spacing: 0.05em; color: var(--soft); }
tbody th { font-weight: normal; color: var(--soft); width: 38%; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
figure { margin: 3mm 0 5mm; break-inside: avoid; page-break-inside: avoid; }
figure img { display: block; width: 100%; height: auto; border: 1px solid var(--rule); }
figcaption { font-size: 8.5pt; color: var(--soft); margin-top: 1mm; }
ul.plain { padding-left: 5mm; margin: 1mm 0; }
footer { margin-top: 8mm; border-top: 1px solid var(--rule); padding-top: 2mm; font-size: 8.5pt; color: var(--soft); }
@page { margin: 18mm 14mm 16mm; }
.signoff table { break-inside: avoid; }
.signoff table.people { border-collapse: separate; border-spacing: 2.5mm 0; }
.signoff table.people td { border-bottom: 1px solid var(--ink); height: 11mm; vertical-align: bottom; }
.signoff td.sign { width: 40%; }
.signoff td.name { width: 28%; }
.signoff td.date { width: 16%; }
.signoff .missing { color: var(--soft); }
@media print {
  main { max-width: none; padding: 0; }
  body { font-size: 9.5pt; }
  h2 { margin-top: 6mm; }
  .page { break-before: page; page-break-before: always; }
}
`;

/** The report; `png` holds the report's pictures by name (contour, peak, mesh, deformed, geometry, section, convergence), from reportPictures. */
export function reportHtml(src: PlotSource, png: ReadonlyMap<string, ReportPicture>): string {
  const r = src.result;
  const m = src.model;
  const u = r.units;
  const title = r.model.title ?? 'Untitled model';
  const date = src.createdAt.slice(0, 10);
  const c = r.convergence;
  const band = r.kt.error === null ? (r.kt.value === null ? '' : 'no error estimate (one mesh)') : `estimated error +-${pct(r.kt.error)}`;
  const headline = r.kt.value === null ? 'none' : f(r.kt.value, 4);
  const info = m.report ?? {};
  const parts: string[] = [];
  parts.push(`<header><p class="kind">Stress concentration report</p><h1>${esc(title)}</h1>
<p>Model file ${esc(r.model.file ?? '(not from a file)')}; analysed ${esc(date)} by raiser ${esc(r.tool.version)}.</p>
${info.project || info.part || info.revision ? `<p id="ident">${[info.project ? `Project ${esc(info.project)}` : '', info.part ? `part ${esc(info.part)}` : '', info.revision ? `revision ${esc(info.revision)}` : ''].filter(Boolean).join('; ')}</p>` : ''}
${m.note ? `<p>${esc(m.note)}</p>` : ''}</header>`);
  parts.push(`<section class="keys" aria-label="key results">
<div class="key"><div class="label">Kt${r.kt.kind ? ` ${esc(r.kt.kind)}` : ''}</div><div class="value" id="kt">${headline}</div><div class="sub">${esc(r.kt.value === null ? (r.kt.withheld ?? '') : `${band}; at ${r.kt.raiser}`)}</div></div>
<div class="key"><div class="label">Highest ${esc(measureName(r.peak.measure))}</div><div class="value">${f(r.peak.stress)} ${esc(u.stress)}</div><div class="sub">${esc(r.peak.feature)}</div></div>
</section>`);
  parts.push(`<div class="caution" role="note"><strong>Read before use.</strong> This is a linear elastic, small-strain analysis of the model as described. A peak above the yield strength means local plastic flow; Kt is not the fatigue factor Kf. The results must be checked by a qualified engineer under the applicable codes and standards before they are used for design. See the cautions at the end.</div>`);

  parts.push(...casesSection(r));
  parts.push('<h2>Inputs</h2>');
  const mat = m.material;
  parts.push(
    `<table><tbody>${rows([
      ['units', `${esc(u.length)}, ${esc(u.force)}; stress in ${esc(u.stress)}`],
      ['state', esc(r.analysis.state.replace('-', ' '))],
      ['thickness', `${f(r.analysis.thickness)} ${esc(u.length)}`],
      ['material', esc(mat.name ?? 'unnamed')],
      ...(r.material?.grade ? ([['grade', `${esc(r.material.grade.description)}${r.material.grade.unsetWhy ? `; yield and ultimate not set: ${esc(r.material.grade.unsetWhy)}` : ''}${r.material.grade.provenance === 'M' ? '; [M] recalled from the standard, not checked: verify' : ''}`]] as [string, string][]) : []),
      ["Young's modulus E", `${f(mat.E)} ${esc(u.stress)}`],
      ["Poisson's ratio", f(mat.nu)],
      ['yield strength', mat.yield === undefined ? 'not given' : `${f(mat.yield)} ${esc(u.stress)}`],
      ['ultimate strength', mat.ultimate === undefined ? 'not given' : `${f(mat.ultimate)} ${esc(u.stress)}`],
      ['stress measure', esc(measureName(r.analysis.measure))],
      ['supports', `<ul class="plain">${m.supports.map((s) => `<li>${esc(describeSupport(s, u.length))}${s.note ? ` (${esc(s.note)})` : ''}</li>`).join('')}</ul>`],
      [r.loadCase === undefined ? 'loads' : `loads of case "${esc(r.loadCase)}"`, `<ul class="plain">${loadsOf(m).map((l) => `<li>${esc(describeLoad(l, u.stress, u.force, u.moment, u.length))}${l.note ? ` (${esc(l.note)})` : ''}</li>`).join('')}</ul>`],
    ])}</tbody></table>`,
  );
  parts.push(geometryTable(r));
  parts.push(figure(png, 'geometry', 'Geometry with each stress raiser\'s net section (solid) and gross section (dashed) on which its nominal stresses are taken, the raisers\' peaks, and the loads (L, arrows not to scale) and supports (S).'));

  parts.push('<h2>Mesh</h2>');
  parts.push(
    `<table><tbody>${rows([
      ['elements', `${r.mesh.elements} ${r.mesh.elementType} triangles (${r.mesh.nodesPerElement}-node)`],
      ['nodes', String(r.mesh.nodes)],
      ['degrees of freedom', `${r.mesh.dofs} (${r.solver.equations} free)`],
      ['smallest and largest angle', `${f(r.mesh.minAngleDeg, 3)} and ${f(r.mesh.maxAngleDeg, 3)} degrees`],
      ['solver', `${r.solver.method === 'pcg' ? `conjugate gradients preconditioned by ${esc(r.solver.preconditioner ?? 'incomplete Cholesky')} (the direct factor would not fit in memory), ${r.solver.iterations} iterations` : `sparse Cholesky, ${esc(r.solver.ordering)} ordering, ${r.solver.factorNonzeros} nonzeros in the factor`}, relative residual ${esc(r.solver.relativeResidual.toExponential(1))}, backward error ${esc(r.solver.backwardError.toExponential(1))}`],
      ['equilibrium', `applied loads and reactions balance to ${esc(r.load.equilibriumError.toExponential(1))} of the load`],
    ])}</tbody></table>`,
  );
  parts.push(figure(png, 'mesh', 'The final mesh of the series.'));

  parts.push('<h2 class="page">Results</h2>');
  parts.push(raisersTable(r));
  if (r.singularPoints.length) {
    parts.push('<h3>Singular points</h3><p>Where the elastic stress of the model as described is infinite: a peak there grows without limit as the mesh is refined, so it has no Kt and is not a stress to design to.</p>');
    parts.push(
      `<table id="singular"><thead><tr><th>where</th><th>stress on the meshes (${esc(u.stress)})</th><th>what to do</th></tr></thead><tbody>${r.singularPoints
        .map((sp) => `<tr><td>${esc(sp.what)}</td><td>${sp.stresses.map((v) => f(v)).join(', ')}${sp.grows === true ? ' (grows)' : sp.grows === null ? ' (one mesh: cannot tell)' : ''}</td><td>${esc(sp.fix)}</td></tr>`)
        .join('')}</tbody></table>`,
    );
  }
  parts.push(
    `<table><tbody>${rows([
      [`highest ${esc(measureName(r.peak.measure))}`, `${f(r.peak.stress)} ${esc(u.stress)} at (${f(r.peak.x, 5)}, ${f(r.peak.y, 5)}) ${esc(u.length)}, ${esc(r.peak.feature)}; components sxx ${f(r.peak.sxx)}, syy ${f(r.peak.syy)}, sxy ${f(r.peak.sxy)}`],
      ['peak / yield', `${r.safety.peakOverYield === null ? '-' : pct(r.safety.peakOverYield, 3)}: ${r.safety.localPlasticity ? '<strong>above yield: local plastic flow expected</strong>' : r.safety.yield === null ? 'no yield strength given' : 'below yield'}`],
    ])}</tbody></table>`,
  );
  parts.push(figure(png, 'contour', `${measureName(r.peak.measure)} over the part, with iso-lines at the legend's values and the peak marked.`));
  parts.push(figure(png, 'peak', 'Close-up of the peak region with the element edges.'));
  parts.push(figure(png, 'section', 'Stress along the governing raiser\'s net section: the stress measure and the stress across the section (along the flow), with the beam-formula nominal stress.'));
  parts.push(figure(png, 'deformed', 'Deformed shape, displacements magnified by the factor printed on the picture.'));

  parts.push(pinsHtml(r));
  parts.push('<h2 class="page">Convergence</h2>');
  if (c.status === 'single-mesh') parts.push('<p>One mesh only: the discretisation error is not estimated. Solve without --single-mesh for a certified Kt.</p>');
  else {
    parts.push(
      `<p>Status: <strong>${esc(c.status)}</strong>; target ${pct(c.target)}, estimated error ${pct(c.estimatedError)} of ${esc(c.quantity ?? '')}; observed order ${f(c.observedOrder, 3)} (theory ${esc(c.theoreticalOrder)}), safety factor ${f(c.safetyFactor, 3)}; grid convergence index over the last three meshes. Every raiser's Kt has its own band, computed the same way on its own series (table above).</p>`,
    );
    parts.push(
      `<table id="convergence"><thead><tr><th class="num">DOF</th><th class="num">elements</th><th class="num">governing raiser's peak (${esc(u.stress)})</th><th class="num">Kt</th><th class="num">highest stress (${esc(u.stress)})</th><th class="num">time (ms)</th></tr></thead><tbody>${c.meshes
        .map((x) => `<tr><td class="num">${x.dofs}</td><td class="num">${x.elements}</td><td class="num">${f(x.raiserPeak, 6)}</td><td class="num">${f(x.kt, 5)}</td><td class="num">${f(x.peak, 6)}</td><td class="num">${f(x.timeMs, 3)}</td></tr>`)
        .join('')}</tbody></table>`,
    );
    if (c.notes.length) parts.push(`<ul class="plain">${c.notes.map((x) => `<li>${esc(x)}</li>`).join('')}</ul>`);
    parts.push(figure(png, 'convergence', 'Kt on each mesh of the series against the degrees of freedom, the error band on the finest mesh and the extrapolated values.'));
  }

  const charted = r.raisers.filter((x) => x.chart);
  if (charted.length) {
    parts.push('<h2>Comparison with published charts</h2>');
    for (const x of charted) {
      const ch = x.chart!;
      parts.push(
        `<table><tbody>${rows([
          ['raiser', esc(x.name)],
          ['chart', `${esc(ch.title)} [${esc(ch.provenance)}]`],
          ['source', esc(ch.source)],
          [`chart Kt ${ch.nominal}`, f(ch.value, 4)],
          [`computed Kt ${ch.nominal}`, f(ch.computed, 4)],
          ['difference', ch.difference === null ? `not compared${ch.outside.length ? ': the part lies outside the chart\'s range or conditions' : ''}` : `${ch.difference >= 0 ? '+' : ''}${pct(ch.difference)} (the chart is good to about ${pct(ch.spread)})`],
          ['range', ch.outside.length ? `outside the chart's range or conditions: ${esc(ch.outside.join('; '))}` : "inside the chart's range"],
        ])}</tbody></table>`,
      );
    }
  }
  if (r.fatigue) {
    parts.push('<h2>Fatigue notch factor (estimate)</h2>');
    if (r.fatigue.withheld) parts.push(`<p>${esc(r.fatigue.withheld)}</p>`);
    else parts.push(
      `<table><thead><tr><th>method</th><th class="num">q</th><th class="num">Kf</th><th>source</th></tr></thead><tbody>${r.fatigue.methods
        .map((x) => `<tr><td>${esc(x.name)}</td><td class="num">${f(x.q, 3)}</td><td class="num">${f(x.kf, 4)}</td><td>${esc(x.source)}</td></tr>`)
        .join('')}</tbody></table><p>At ${esc(r.fatigue.raiser)}, notch radius ${f(r.fatigue.radius, 4)} ${esc(u.length)}, from Kt ${esc(r.fatigue.kt ?? '')}.</p>${r.fatigue.notes.length ? `<ul class="plain">${r.fatigue.notes.map((x) => `<li>${esc(x)}</li>`).join('')}</ul>` : ''}`,
    );
  }
  if (r.warnings.length) {
    parts.push('<h2>Warnings</h2>');
    parts.push(`<ul class="plain" id="warnings">${r.warnings.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>`);
  }
  parts.push('<h2>Cautions and assumptions</h2>');
  parts.push(
    `<div class="caution" id="cautions"><strong>Cautions</strong><ul>${r.cautions.map((x) => `<li>${esc(x)}</li>`).join('')}</ul></div>
<ul class="plain">
<li>Plane ${esc(r.analysis.state === 'plane-strain' ? 'strain' : 'stress')}, isotropic homogeneous material, one thickness; no through-thickness effects.</li>
<li>Supports hold displacements at zero; loads act as described in the inputs. Friction and residual stresses are not modelled, nor contact other than that of rigid pins in holes.</li>
<li>Stresses are recovered nodal values (superconvergent patch recovery); the peak is searched on the boundary between nodes.</li>
<li>The error band covers the discretisation only, not whether the model represents the real part.</li>
<li>A peak at a singular point (a sharp re-entrant corner, the end of a rigid support, a point support) has no converged value and no Kt; model the real corner radius or support.</li>
<li>A Kt whose nominal stress means nothing here (a section that carries no load toward the raiser, a nominal stress of the other sign, a raiser loaded by shear, a biaxial state) is withheld with the reason; the peak stress is always given.</li>
</ul>`,
  );
  parts.push(signOff(info, date));
  parts.push(`<footer>Made by raiser ${esc(r.tool.version)} on ${esc(date)}. Colours: the batlow colour map (F. Crameri, Scientific colour maps, 2018). Text in the pictures: DejaVu Sans.</footer>`);
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="raiser ${esc(r.tool.version)}">
<title>${esc(title)}: stress concentration report</title>
<style>${STYLE}${printMargins(title, info)}</style>
</head>
<body>
<main>
${parts.filter(Boolean).join('\n')}
</main>
</body>
</html>
`;
}

/** The table of stress raisers: peak, section, nominal stresses, every Kt with its band or the reason it is withheld. */
/**
 * With load cases: each case's headline Kt with its band (or why it is withheld), its peak and
 * how its series ended, and which case the rest of the report shows. Nothing for plain loads.
 */
function casesSection(r: ResultJson): string[] {
  if (!r.cases) return [];
  const u = r.units;
  const body = r.cases
    .map((c) => {
      const kt = c.kt.value === null ? `none: ${esc(c.kt.withheld ?? '')}` : `${f(c.kt.value, 4)} (${esc(c.kt.kind ?? '')} at ${esc(c.kt.raiser ?? '')})${c.kt.error === null ? '' : `, +-${pct(c.kt.error)}`}`;
      const cv = c.convergence;
      const acc = cv.status === 'single-mesh' ? 'one mesh, error not estimated' : `${esc(cv.status)} on ${cv.meshes} meshes`;
      return `<tr><td>${c.governing ? '<strong>' : ''}${esc(c.name)}${c.governing ? '</strong> (governs)' : ''}</td><td>${kt}</td><td>${f(c.peak.stress)} ${esc(u.stress)}, ${esc(c.peak.feature)}${c.peak.atSharpCorner ? ' (a sharp corner: singular, not a peak to design to)' : ''}</td><td>${acc}</td><td>(${f(c.load.resultant.fx)}, ${f(c.load.resultant.fy)}) ${esc(u.force)}; balanced to ${esc(c.load.equilibriumError.toExponential(1))}</td></tr>`;
    })
    .join('');
  return [
    '<h2>Load cases</h2>',
    `<p>${r.cases.length} load cases on the same part and supports, solved on shared meshes${r.cases.every((c) => c.solve.factorisations === 1) ? ' with one factorisation of the stiffness per mesh' : ''}. The case with the highest peak stress governs: the rest of this report and its pictures are of case "${esc(r.loadCase)}".</p>`,
    `<table><thead><tr><th>case</th><th>Kt</th><th>highest stress</th><th>accuracy</th><th>load resultant</th></tr></thead><tbody>${body}</tbody></table>`,
  ];
}

function raisersTable(r: ResultJson): string {
  const u = r.units;
  if (r.raisers.length === 0) return '<p>The part has no stress raiser (no hole, notch, fillet or other concave curved edge), so no Kt is given.</p>';
  const kinds = ['net', 'bearing', 'gross', 'remote', 'given'] as const;
  const body = r.raisers
    .map((x) => {
      const sec = x.section;
      const secText = !sec
        ? 'none'
        : `${sec.given ? 'given' : 'net'} section (${f(sec.from[0], 5)}, ${f(sec.from[1], 5)}) to (${f(sec.to[0], 5)}, ${f(sec.to[1], 5)}), ${f(sec.length)} ${esc(u.length)} in ${sec.ligaments.length} ligament${sec.ligaments.length > 1 ? 's' : ''}; ${sec.mirror ? 'half of a symmetric section (N / A)' : `N ${f(sec.N)} ${esc(u.force)}, V ${f(sec.V)} ${esc(u.force)}, M ${f(sec.M)} ${esc(u.moment)}`}${x.gross ? `; gross width ${f(x.gross.length)} ${esc(u.length)}` : ''}`;
      const kt =
        x.status !== 'ok'
          ? `<td colspan="2">no Kt: ${esc(x.reason ?? '')}</td>`
          : `<td>${kinds
              .filter((k) => x.kt[k])
              .map((k) => {
                const e = x.kt[k]!;
                return e.value === null
                  ? `<div>Kt ${k}: <em>withheld</em>: ${esc(e.withheld ?? '')}</div>`
                  : `<div class="kt-${k}">Kt ${k} <strong>${f(e.value, 4)}</strong>${e.error === null ? '' : ` +-${pct(e.error)}`} (nominal ${f(e.nominal)} ${esc(u.stress)}${e.extrapolated === null ? '' : `; extrapolated ${f(e.extrapolated, 5)}`})</div>`;
              })
              .join('')}</td><td>${esc(secText)}</td>`;
      return `<tr${x.governing ? ' class="governing"' : ''}><td>${x.governing ? '<strong>' : ''}${esc(x.name)}${x.governing ? '</strong> (governs)' : ''}</td><td class="num">${f(x.peak.stress)}</td><td>(${f(x.peak.x, 5)}, ${f(x.peak.y, 5)})</td>${kt}</tr>`;
    })
    .join('');
  const defs = `<p class="defs">Kt net: peak / (N / A_net - M y / I_net) on the raiser's net section, the least-material cut across the flow at the raiser through all ligaments, at the raiser's edge. Kt gross: the same N and M over the prismatic width beside the raiser, at its outer fibre. Kt remote: peak / the largest principal remote stress. N, V and M come from the nodal forces on one side of the section (a free-body cut).</p>`;
  return `<table id="raisers"><thead><tr><th>stress raiser</th><th class="num">peak (${esc(u.stress)})</th><th>at</th><th>Kt</th><th>section</th></tr></thead><tbody>${body}</tbody></table>${defs}`;
}

/** A string for CSS `content`: quotes, backslashes and line breaks escaped, and `<` too so no text can close the style element. */
function cssString(t: string): string {
  return `"${t.replace(/[\\"<>\n\r]/g, (c) => `\\${c.charCodeAt(0).toString(16)} `)}"`;
}

/**
 * The print margins: a running header (title, part number, revision) and "page N of M" on every
 * printed page, in CSS page-margin boxes (CSS Paged Media Level 3; Chromium prints them since
 * version 131). A browser without them prints the pages without header and numbers.
 */
function printMargins(title: string, info: ReportInfo): string {
  const head = [title, info.part ? `part ${info.part}` : '', info.revision ? `rev. ${info.revision}` : ''].filter(Boolean).join('  |  ');
  const box = 'font: 8pt "DejaVu Sans", Verdana, sans-serif; color: #60646e;';
  return `
@page {
  @top-left { content: ${cssString(head)}; ${box} vertical-align: bottom; padding-bottom: 3mm; }
  @bottom-left { content: ${cssString(`raiser stress concentration report${info.project ? `, ${info.project}` : ''}`)}; ${box} vertical-align: top; padding-top: 3mm; }
  @bottom-right { content: "page " counter(page) " of " counter(pages); ${box} vertical-align: top; padding-top: 3mm; }
}
`;
}

/**
 * The sign-off block: project, part, revision and date, and a line to sign for each of
 * prepared, checked and approved. A name not given leaves its line empty, to be filled in by
 * hand; nothing is made up.
 */
function signOff(info: ReportInfo, analysed: string): string {
  const given = (v: string | undefined) => (v ? esc(v) : '<span class="missing">(not given)</span>');
  const person = (role: string, id: string, name: string | undefined) =>
    `<tr><th scope="row">${role}</th><td class="name" id="${id}">${name ? esc(name) : ''}</td><td class="sign"></td><td class="date"></td></tr>`;
  return `<section class="signoff" id="signoff"><h2>Sign-off</h2>
<table><tbody>${rows([
    ['project', given(info.project)],
    ['part number', given(info.part)],
    ['revision', given(info.revision)],
    ['date', info.date ? esc(info.date) : `${esc(analysed)} (the date of the analysis)`],
  ])}</tbody></table>
<table class="people"><thead><tr><th></th><th>name</th><th>signature</th><th>date</th></tr></thead><tbody>
${person('prepared by', 'prepared-by', info.preparedBy)}
${person('checked by', 'checked-by', info.checkedBy)}
${person('approved by', 'approved-by', info.approvedBy)}
</tbody></table>
<p>The signatures confirm that the model (geometry, material, loads and supports) represents the part, that the cautions above were read, and that the results were checked under the applicable codes and standards.</p>
</section>`;
}

type RaiserJson = ResultJson['raisers'][number];

/** A point as "(x, y)" in the length unit. */
const at = (p: readonly number[]) => `(${f(p[0], 5)}, ${f(p[1], 5)})`;

/** What a raiser is and its dimensions and position, from the shape the analysis recorded. */
function describeShape(x: RaiserJson, len: string): [string, string, string] {
  const sh = x.shape;
  const hole = x.kind === 'hole';
  if (!sh) return [hole ? 'hole' : 'curved edge', x.radius === null ? '-' : `smallest radius ${f(x.radius)} ${len}`, 'not recorded in this saved solution (solve again for it)'];
  switch (sh.type) {
    case 'circle':
      return ['circular hole', `diameter ${f(sh.diameter)} ${len} (radius ${f(sh.diameter / 2)})`, `centre ${at(sh.center)}`];
    case 'ellipse':
      return ['elliptical hole', `semi-axes ${f(sh.semiAxes[0])} and ${f(sh.semiAxes[1])} ${len}, the first at ${f(sh.angleDeg, 3)} deg to x`, `centre ${at(sh.center)}`];
    case 'rounded-rectangle':
      return ['rectangular cutout, rounded corners', `${f(sh.width)} by ${f(sh.height)} ${len}, corner radius ${f(sh.cornerRadius)} ${len}${sh.angleDeg ? `, turned ${f(sh.angleDeg, 3)} deg` : ''}`, `centre ${at(sh.center)}`];
    case 'slot':
      return ['slot (round ends)', `width ${f(sh.width)} ${len}, overall length ${f(sh.length)} ${len}`, `end centres ${at(sh.ends[0])} and ${at(sh.ends[1])}`];
    case 'arc':
      return [hole ? 'arc of a hole' : 'circular arc (fillet or notch root)', `radius ${f(sh.radius)} ${len}, ${f(sh.sweepDeg, 3)} deg of arc`, `centre ${at(sh.center)}; from ${at(sh.from)} to ${at(sh.to)}`];
    default:
      return [
        hole ? 'cutout' : 'curved edges (fillets, notch)',
        sh.radius === null ? 'no concave radius' : `smallest radius ${f(sh.radius)} ${len}`,
        `within x ${f(sh.extent[0], 5)} to ${f(sh.extent[2], 5)}, y ${f(sh.extent[1], 5)} to ${f(sh.extent[3], 5)}`,
      ];
  }
}

/**
 * The geometry table: the outline's extent and every stress raiser (hole, slot, fillet, notch)
 * with its dimensions and position, as the analysis recorded them from the model's geometry.
 */
function geometryTable(r: ResultJson): string {
  const len = r.units.length;
  const g = r.geometry as ResultJson['geometry'] | undefined;
  const out: string[] = ['<h3>Geometry</h3>'];
  if (g) {
    const [x0, y0, x1, y1] = g.extent;
    out.push(
      `<table id="outline"><tbody>${rows([
        ['outline extent', `x ${f(x0, 5)} to ${f(x1, 5)}, y ${f(y0, 5)} to ${f(y1, 5)} ${esc(len)}: ${f(x1 - x0)} by ${f(y1 - y0)} ${esc(len)}`],
        ['material area', `${f(g.area)} ${esc(len)}^2 (outline less holes)`],
        ['holes', String(g.holes)],
      ])}</tbody></table>`,
    );
  }
  if (r.raisers.length === 0) {
    out.push('<p>No stress raisers: no hole, notch, fillet or other concave curved edge.</p>');
    return out.join('');
  }
  const list = [...r.raisers].sort((a, b) => a.index - b.index);
  out.push(
    `<table id="geometry"><thead><tr><th>stress raiser</th><th>what</th><th>dimensions</th><th>where (${esc(len)})</th></tr></thead><tbody>${list
      .map((x) => {
        const [what, dims, where] = describeShape(x, len);
        return `<tr><td>${esc(x.name)}</td><td>${esc(what)}</td><td>${esc(dims)}</td><td>${esc(where)}</td></tr>`;
      })
      .join('')}</tbody></table>`,
  );
  if (g && g.raisers > list.length) out.push(`<p>${g.raisers - list.length} further stress raisers with lower peaks are not listed (the report lists the ${list.length} with the highest peaks).</p>`);
  return out.join('');
}
