/**
 * Pins in holes in the result, the console summary and the report: per pin, what it is (a
 * bearing load, a pushed or a fixed rigid pin), its force, the bearing stress F / (d t), the
 * peak stress on its hole and that peak over the bearing stress, and for a rigid pin the contact
 * arc, the peak contact pressure and where it is, the pin's displacement and the contact
 * pressure along the hole (as data, and as a small chart in the report).
 *
 * Angles are in degrees, counter-clockwise from +x about the hole's centre. A contact arc runs
 * from the first to the last node in contact; its true ends lie within one node spacing beyond
 * (given as `endSpacing`), where the gap opens.
 */
import { describeSelector } from '../geometry/select.js';
import type { Load, Support } from '../model/schema.js';
import type { Analysis } from '../pipeline/analyse.js';
import { stressMeasure } from '../post/stress.js';
import { formatValue } from '../render/ticks.js';
import type { ResultJson } from './result-json.js';

const DEG = 180 / Math.PI;

/** Degrees from radians, with round-off about zero (1e-14 of a turn) shown as 0. */
function degrees(radians: number): number {
  const v = radians * DEG;
  return Math.abs(v) < 1e-9 ? 0 : v;
}

/** Plain numbers for text meant for a terminal (no typographic minus). */
function fmt(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-4 && a < 1e9) return Number(v.toPrecision(digits)).toString();
  return v.toExponential(digits - 1);
}

const num = (v: number) => formatValue(v, 4);

function fit(item: { clearance?: number; diameter?: number }, length: string): string {
  if (item.diameter !== undefined) return `pin diameter ${num(item.diameter)} ${length}`;
  return item.clearance ? `diametral clearance ${num(item.clearance)} ${length}` : 'close fit (no clearance)';
}

/** Words for a pin load (bearing or rigid-pin), for the report's list of inputs; '' for other loads. */
export function describePinLoad(l: Load, force: string, length: string): string {
  if (l.type === 'bearing') return `bearing on ${describeSelector(l.on)}: force (${num(l.force[0])}, ${num(l.force[1])}) ${force} as a cosine pressure on the half of the hole facing it`;
  if (l.type === 'rigid-pin') return `rigid pin in ${describeSelector(l.on)} pushed with (${num(l.force[0])}, ${num(l.force[1])}) ${force}, frictionless contact, ${fit(l, length)}`;
  return '';
}

/** Words for a pin support, for the report's list of inputs; '' for other supports. */
export function describePinSupport(s: Support, length: string): string {
  if (s.type === 'rigid-pin') return `fixed rigid pin in ${describeSelector(s.on)}, frictionless contact, ${fit(s, length)}`;
  return '';
}

/** Runs of consecutive nodes in contact around the hole (nodes sorted by angle), as [first, last] indices; a run may wrap past the end. */
function contactRuns(active: Uint8Array): [number, number][] {
  const m = active.length;
  if (m === 0) return [];
  let start = -1;
  for (let i = 0; i < m; i++) if (!active[i]) start = i;
  if (start < 0) return [[0, m - 1]];
  const runs: [number, number][] = [];
  let open = -1;
  for (let s = 1; s <= m; s++) {
    const i = (start + s) % m;
    if (active[i] && open < 0) open = i;
    if (!active[i] && open >= 0) {
      runs.push([open, (i - 1 + m) % m]);
      open = -1;
    }
  }
  if (open >= 0) runs.push([open, start === 0 ? m - 1 : (start - 1 + m) % m]);
  return runs;
}

/** The pins of an analysis for result.json, or null when the model has none. */
export function pinsResult(a: Analysis) {
  const p = a.pins;
  if (!p) return null;
  const t = a.model.thickness;
  const measure = a.peak.measure;
  const contact = p.contact;
  const items = p.holes.map((pin) => {
    const c = contact?.pins.find((x) => x.pin.path === pin.path) ?? null;
    const force: [number, number] = c && pin.role === 'support' ? [c.resultant[0], c.resultant[1]] : [pin.force[0], pin.force[1]];
    const d = 2 * pin.radius;
    const bearingStress = Math.hypot(force[0], force[1]) / (d * t);
    // the peak of the analysis's measure on the hole (for min-principal the most compressive)
    let best = -1;
    let bestValue = 0;
    let bx = 0;
    let by = 0;
    const onHole = new Set(pin.edges);
    for (let n = 0; n < a.mesh.nNodes; n++) {
      if (!onHole.has(a.mesh.nodeEdge[n])) continue;
      const sxx = a.stress[3 * n];
      const syy = a.stress[3 * n + 1];
      const v = stressMeasure(measure, sxx, syy, a.stress[3 * n + 2], a.szzFactor * (sxx + syy));
      if (best < 0 || (measure === 'min-principal' ? v < bestValue : v > bestValue)) {
        best = n;
        bestValue = v;
        bx = a.mesh.nodes[2 * n];
        by = a.mesh.nodes[2 * n + 1];
      }
    }
    const holePeak =
      best < 0
        ? null
        : {
            stress: bestValue,
            x: bx,
            y: by,
            angle: degrees(Math.atan2(by - pin.cy, bx - pin.cx)),
            overBearingStress: bearingStress > 0 ? Math.abs(bestValue) / bearingStress : null,
          };
    let contactJson = null;
    if (c) {
      const { angle } = c.hole;
      const m = angle.length;
      const spacing = (i: number, j: number) => {
        const dA = Math.abs(angle[j] - angle[i]);
        return Math.min(dA, 2 * Math.PI - dA) * DEG;
      };
      const arcs = contactRuns(c.active).map(([i0, i1]) => {
        let from = degrees(angle[i0]);
        let to = degrees(angle[i1]);
        if (to < from) to += 360;
        if (from > 180) {
          from -= 360;
          to -= 360;
        }
        return { from, to, endSpacing: Math.max(spacing(i0, (i0 - 1 + m) % m), spacing(i1, (i1 + 1) % m)) };
      });
      let peak = 0;
      let peakAt = 0;
      for (let i = 0; i < m; i++) {
        if (c.pressure[i] > peak) {
          peak = c.pressure[i];
          peakAt = degrees(angle[i]);
        }
      }
      contactJson = {
        arcs,
        nodesInContact: c.active.reduce((s, v) => s + v, 0),
        peakPressure: peak,
        peakPressureAngle: peakAt,
        pinDisplacement: pin.role === 'load' ? [c.displacement[0], c.displacement[1]] : null,
        pressure: { angle: Array.from(angle, degrees), value: Array.from(c.pressure) },
      };
    }
    return {
      item: pin.path,
      kind: pin.kind,
      role: pin.role,
      hole: { number: pin.hole, label: pin.label, center: [pin.cx, pin.cy] as [number, number], diameter: d },
      clearance: pin.kind === 'rigid-pin' ? pin.clearance : null,
      force,
      bearingStress,
      bearingPressurePeak: pin.kind === 'bearing' ? (4 * Math.hypot(force[0], force[1])) / (Math.PI * d * t) : null,
      holePeak,
      contact: contactJson,
    };
  });
  return {
    items,
    bearingStressDefinition: 'F / (d t): the pin force over the projected area of the hole (diameter times thickness)',
    contactIterations: contact ? contact.iterations : null,
    contactTolerance: contact ? contact.tolerance : null,
    notes: [
      ...(p.holes.some((h) => h.kind === 'bearing')
        ? ['bearing load: the idealised pressure p0 cos(phi) on the half of the hole facing the force, p0 = 4 F / (pi d t); the real pressure depends on the fit and the part (see the README)']
        : []),
      ...(contact ? ['rigid pin: a rigid round pin, frictionless contact solved exactly on the hole nodes (primal-dual active set); the pin does not bend or deform'] : []),
    ],
  };
}

export type PinsJson = NonNullable<ReturnType<typeof pinsResult>>;

function arcWords(arcs: { from: number; to: number; endSpacing: number }[]): string {
  if (arcs.length === 0) return 'no contact';
  return arcs.map((x) => `${fmt(x.from, 4)} to ${fmt(x.to, 4)} deg (half-angle ${fmt((x.to - x.from) / 2, 3)} deg, ends to within ${fmt(x.endSpacing, 2)} deg)`).join('; ');
}

/** The console summary's lines for the pins (none without pins). */
export function formatPinsSummary(r: ResultJson): string[] {
  const p = r.pins;
  if (!p) return [];
  const u = r.units;
  const out: string[] = [''];
  p.items.forEach((it, k) => {
    const what =
      it.kind === 'bearing'
        ? `bearing load on ${it.hole.label}`
        : it.role === 'load'
          ? `rigid pin in ${it.hole.label}, pushed`
          : `fixed rigid pin in ${it.hole.label}`;
    const fitWords = it.clearance === null ? '' : it.clearance === 0 ? ', close fit' : `, clearance ${fmt(it.clearance)} ${u.length}`;
    out.push(`${k === 0 ? '  pins   ' : '         '}${it.item} ${what}${fitWords}: force on the part (${fmt(it.force[0])}, ${fmt(it.force[1])}) ${u.force}`);
    const peak = it.holePeak
      ? `; peak on the hole ${fmt(it.holePeak.stress)} ${u.stress} at ${fmt(it.holePeak.angle, 4)} deg${it.holePeak.overBearingStress === null ? '' : ` = ${fmt(it.holePeak.overBearingStress, 4)} x the bearing stress`}`
      : '';
    out.push(`           bearing stress F/(d t) ${fmt(it.bearingStress)} ${u.stress} (d ${fmt(it.hole.diameter)} ${u.length})${peak}`);
    if (it.bearingPressurePeak !== null) out.push(`           cosine bearing pressure, peak p0 = 4F/(pi d t) = ${fmt(it.bearingPressurePeak)} ${u.stress}`);
    if (it.contact) {
      const c = it.contact;
      out.push(`           contact arc ${arcWords(c.arcs)}, ${c.nodesInContact} nodes`);
      out.push(
        `           peak contact pressure ${fmt(c.peakPressure)} ${u.stress} at ${fmt(c.peakPressureAngle, 4)} deg${c.pinDisplacement ? `; the pin moved (${fmt(c.pinDisplacement[0])}, ${fmt(c.pinDisplacement[1])}) ${u.length}` : ''}`,
      );
    }
  });
  if (p.contactIterations !== null) out.push(`         contact found in ${p.contactIterations} active-set iteration${p.contactIterations === 1 ? '' : 's'} (frictionless; no tension and no overlap beyond round-off)`);
  for (const n of p.notes) out.push(`         ${n}`);
  return out;
}

function esc(t: unknown): string {
  return String(t).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/**
 * The contact pressure along a hole as a small inline SVG chart: pressure against the angle
 * about the hole's centre, over the arc in contact and a margin either side, with the arc's ends
 * marked. Plain strokes and text, no script.
 */
function pressureChartSvg(c: NonNullable<PinsJson['items'][number]['contact']>, stressUnit: string): string {
  const W = 480;
  const H = 200;
  const L = 56;
  const R = 12;
  const T = 12;
  const B = 36;
  const arcs = c.arcs;
  if (arcs.length === 0) return '';
  // angles unwrapped about the middle of the first arc
  const mid = 0.5 * (arcs[0].from + arcs[0].to);
  const wrap = (a: number) => a - 360 * Math.round((a - mid) / 360);
  const half = Math.max(10, ...arcs.map((x) => 0.5 * (x.to - x.from)));
  const a0 = Math.max(mid - 180, mid - 1.3 * half - 5);
  const a1 = Math.min(mid + 180, mid + 1.3 * half + 5);
  const pts = c.pressure.angle.map((a, i) => [wrap(a), c.pressure.value[i]] as [number, number]).filter(([a]) => a >= a0 && a <= a1).sort((p, q) => p[0] - q[0]);
  const pMax = Math.max(c.peakPressure, 1e-300);
  const X = (a: number) => L + ((a - a0) / (a1 - a0)) * (W - L - R);
  const Y = (p: number) => H - B - (p / (1.1 * pMax)) * (H - B - T);
  const line = pts.map(([a, p]) => `${X(a).toFixed(1)},${Y(p).toFixed(1)}`).join(' ');
  const ticks = [0, 0.5, 1].map((f) => `<line x1="${L - 4}" y1="${Y(f * pMax).toFixed(1)}" x2="${L}" y2="${Y(f * pMax).toFixed(1)}" stroke="#60646e"/><text x="${L - 6}" y="${(Y(f * pMax) + 3).toFixed(1)}" text-anchor="end">${esc(fmt(f * pMax, 3))}</text>`).join('');
  const step = a1 - a0 > 120 ? 45 : a1 - a0 > 50 ? 15 : 5;
  const xt: string[] = [];
  for (let a = Math.ceil(a0 / step) * step; a <= a1; a += step) xt.push(`<line x1="${X(a).toFixed(1)}" y1="${H - B}" x2="${X(a).toFixed(1)}" y2="${H - B + 4}" stroke="#60646e"/><text x="${X(a).toFixed(1)}" y="${H - B + 15}" text-anchor="middle">${esc(fmt(a - 360 * Math.round(a / 360), 3))}</text>`);
  const ends = arcs.flatMap((x) => [x.from, x.to]).map((a) => wrap(a)).filter((a) => a >= a0 && a <= a1).map((a) => `<line x1="${X(a).toFixed(1)}" y1="${T}" x2="${X(a).toFixed(1)}" y2="${H - B}" stroke="#c44e16" stroke-dasharray="4 3"/>`).join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="contact pressure along the hole" font-family="DejaVu Sans, Verdana, sans-serif" font-size="10" fill="#1c1e26">
<line x1="${L}" y1="${T}" x2="${L}" y2="${H - B}" stroke="#1c1e26"/><line x1="${L}" y1="${H - B}" x2="${W - R}" y2="${H - B}" stroke="#1c1e26"/>${ticks}${xt.join('')}${ends}
<polyline points="${line}" fill="none" stroke="#1c1e26" stroke-width="1.5"/>
<text x="${(L + W - R) / 2}" y="${H - 6}" text-anchor="middle">angle about the hole centre, deg (dashed: ends of the contact arc)</text>
<text x="12" y="${(T + H - B) / 2}" text-anchor="middle" transform="rotate(-90 12 ${(T + H - B) / 2})">pressure, ${esc(stressUnit)}</text>
</svg>`;
}

/** The report's section on the pins ('' without pins). */
export function pinsHtml(r: ResultJson): string {
  const p = r.pins;
  if (!p) return '';
  const u = r.units;
  const f = (v: number | null | undefined, d = 4) => (v === null || v === undefined ? '-' : esc(formatValue(v, d)));
  const parts: string[] = ['<h2>Pins</h2>'];
  for (const it of p.items) {
    const kind = it.kind === 'bearing' ? 'bearing load (cosine pressure)' : it.role === 'load' ? 'rigid pin, pushed' : 'rigid pin, fixed';
    const rows: [string, string][] = [
      ['pin', `${esc(it.item)}: ${esc(kind)} in ${esc(it.hole.label)}, diameter ${f(it.hole.diameter)} ${esc(u.length)}${it.clearance === null ? '' : it.clearance === 0 ? ', close fit' : `, diametral clearance ${f(it.clearance)} ${esc(u.length)}`}`],
      ['force on the part', `(${f(it.force[0])}, ${f(it.force[1])}) ${esc(u.force)}`],
      ['bearing stress F/(d t)', `${f(it.bearingStress)} ${esc(u.stress)}`],
    ];
    if (it.holePeak) rows.push(['peak on the hole', `${f(it.holePeak.stress)} ${esc(u.stress)} at ${f(it.holePeak.angle, 4)} deg${it.holePeak.overBearingStress === null ? '' : `: ${f(it.holePeak.overBearingStress)} times the bearing stress`}`]);
    if (it.bearingPressurePeak !== null) rows.push(['cosine pressure peak p0 = 4F/(pi d t)', `${f(it.bearingPressurePeak)} ${esc(u.stress)}`]);
    if (it.contact) {
      const c = it.contact;
      rows.push(['contact arc', esc(arcWords(c.arcs))]);
      rows.push(['peak contact pressure', `${f(c.peakPressure)} ${esc(u.stress)} at ${f(c.peakPressureAngle, 4)} deg`]);
      if (c.pinDisplacement) rows.push(['pin displacement', `(${f(c.pinDisplacement[0])}, ${f(c.pinDisplacement[1])}) ${esc(u.length)}`]);
    }
    parts.push(`<table><tbody>${rows.map(([k, v]) => `<tr><th scope="row">${esc(k)}</th><td>${v}</td></tr>`).join('')}</tbody></table>`);
    if (it.contact && it.contact.arcs.length) parts.push(`<figure>${pressureChartSvg(it.contact, u.stress)}<figcaption>Contact pressure along ${esc(it.hole.label)} (${esc(it.item)}); angles counter-clockwise from +x about the hole's centre.</figcaption></figure>`);
  }
  const notes = [...p.notes, p.bearingStressDefinition];
  if (p.contactIterations !== null) notes.unshift(`The contact was found in ${p.contactIterations} active-set iteration${p.contactIterations === 1 ? '' : 's'}.`);
  parts.push(`<ul class="plain">${notes.map((x) => `<li>${esc(x)}</li>`).join('')}</ul>`);
  return parts.join('\n');
}
