/**
 * Kt of one raiser: its net section and nominal stress from what the section carries, the gross
 * section where the part has one, Kt against a remote stress, and the rules that withhold a Kt
 * whose nominal stress means nothing.
 *
 *   Kt net    = peak / sigma_net,    sigma_net = N / A_net - M (v_r - v_bar) / I_net at the
 *               raiser's fibre v_r, on the raiser's net section (src/post/section.ts,
 *               src/post/raiser-cut.ts);
 *   Kt gross  = peak / sigma_gross, the same resultants over the gross section (the part's
 *               prismatic width beside the raiser, as if the raiser were not there), at its
 *               outer fibre on the raiser's side: P / (W t) in tension, 6 M / (t H^2) in bending;
 *   Kt remote = peak / s1, s1 the largest principal value of an applied remote stress state
 *               (so Kirsch's cases read 3, 2 and 4);
 *   Kt given  = peak / the nominal stress given in the model for this raiser;
 *   Kt bearing = peak / F / (d t), for a hole a pin loads or holds: F the pin's force, d the
 *               hole's diameter (the second definition of the lug charts, Pilkey & Pilkey ch. 5).
 *
 * A Kt is withheld, with the reason, when its nominal stress
 *  - is zero or of the other sign than the peak (the section is not loaded the way the peak is);
 *  - is smaller than its section's mean shear stress V / A: the raiser is loaded by shear more
 *    than by the normal stress the Kt refers to (near the free end of a cantilever, or at the
 *    neutral axis of a beam carrying shear), and the beam formula does not describe it;
 *  - gives a Kt above KT_LIMIT;
 *  - (net and gross) belongs to a biaxial state: a remote state with a second principal stress
 *    above BIAXIAL_RATIO of the first, or a section across the flow at the raiser that carries
 *    more than BIAXIAL_RATIO of the nominal stress; a one-direction nominal stress does not
 *    describe it, and Kt against the remote principal stress is the one to read.
 * The peak stress itself is always reported.
 */
import type { Domain } from '../geometry/domain.js';
import { stretchesAlongLine } from '../geometry/line-cross.js';
import type { Mesh } from '../mesh/types.js';
import type { StressMeasure } from '../model/schema.js';
import { ALIGNED_SLACK, flowDirection, type RaiserCut, type RaiserCutFinder } from './raiser-cut.js';
import type { Raiser, RaiserPeak } from './raisers.js';
import { beamStress, cutBetween, cutOnLine, largestBeamStress, loadsThroughCut, makeCut, markMirror, pointOnCut, type Cut, type CutLoads } from './section.js';

/**
 * The largest Kt printed. The published charts for holes and notches with a root radius stop
 * below about 25 (an elliptical hole with a/b = 12 gives 1 + 2 a/b = 25, Inglis 1913); a ratio
 * of peak to nominal stress above 30 means the section does not carry what loads the raiser.
 * Our choice, stated here and in the README.
 */
export const KT_LIMIT = 30;
/** Above this ratio of the second to the first nominal (or remote principal) stress, the state is biaxial (our choice: 10% changes Kirsch's 3 by 0.1). */
const BIAXIAL_RATIO = 0.1;

export type KtKind = 'net' | 'gross' | 'remote' | 'given' | 'bearing';

export interface KtValue {
  kind: KtKind;
  /** peak / nominal, or null when withheld */
  value: number | null;
  /** the nominal stress it is taken against (NaN when none could be formed) */
  nominal: number;
  /** how the nominal stress is defined, in words */
  definition: string;
  /** why the value is withheld, or null */
  withheld: string | null;
}

export interface GrossSection {
  /** the gross section moved onto the net section's line, where its nominal stress is taken */
  cut: Cut;
  /** the prismatic stretch where it was found, beside the raiser (for pictures) */
  found: Cut;
  /** v of the outer fibre used for the bending part, on the raiser's side */
  vFibre: number;
}

export interface RaiserKt {
  /** the unit flow direction at the peak the section is taken across */
  flow: [number, number];
  section: Cut | null;
  /** v along the section where it meets the raiser */
  vRaiser: number;
  /** the section was given in the model */
  sectionGiven: boolean;
  loads: CutLoads | null;
  gross: GrossSection | null;
  kt: KtValue[];
  warnings: string[];
}

export interface KtContext {
  domain: Domain;
  mesh: Mesh;
  nodalForce: Float64Array;
  finder: RaiserCutFinder;
  measure: StressMeasure;
  thickness: number;
  remote?: { sxx: number; syy: number; sxy: number };
  /** the flow direction for every raiser, when the model gives one (results.direction) */
  direction?: readonly [number, number];
  /** per domain edge: 1 on a mirror plane (a symmetry support) */
  mirrorEdge: Uint8Array;
  /** per domain edge: 1 held by a support (not a mirror plane), 2 loaded, 0 free */
  edgeRole: Uint8Array;
  units: { stress: string };
}

export interface RaiserNominalInput {
  /** a section given for this raiser, from and to */
  section?: { from: readonly [number, number]; to: readonly [number, number] };
  /** a nominal stress given for this raiser */
  stress?: number;
  /** the bearing stress F / (d t) of the pin in this hole, when one loads or holds it */
  bearing?: number;
}

const UNSIGNED: readonly StressMeasure[] = ['von-mises', 'tresca'];

function fmt(v: number): string {
  return Number(v.toPrecision(4)).toString();
}

/**
 * Kt of the peak against one nominal stress, with the reasons to withhold it: `sign` when the
 * nominal stress is zero or of the other sign, `limit` when the ratio exceeds KT_LIMIT.
 */
function ratio(measure: StressMeasure, peak: number, nominal: number, units: { stress: string }): { value: number; sign: string | null; limit: string | null } {
  const nom = UNSIGNED.includes(measure) ? Math.abs(nominal) : nominal;
  const kt = peak / nom;
  if (!Number.isFinite(nom) || nom === 0 || !Number.isFinite(kt)) return { value: NaN, sign: 'the nominal stress is zero: the section carries no load that reaches this raiser', limit: null };
  if (kt < 0) {
    const hint =
      measure === 'max-principal' && nom < 0
        ? '; the raiser is in compression here: solve with --measure min-principal (or von-mises) for its Kt'
        : measure === 'min-principal' && nom > 0
          ? '; the raiser is in tension here: solve with --measure max-principal for its Kt'
          : '';
    return { value: kt, sign: `the nominal stress ${fmt(nominal)} ${units.stress} has the other sign than the peak ${fmt(peak)} ${units.stress}: the section is not loaded the way the peak is${hint}`, limit: null };
  }
  const limit = kt > KT_LIMIT ? `the nominal stress ${fmt(nominal)} ${units.stress} is under 1/${KT_LIMIT} of the peak: beyond every published chart for a raiser with a root radius, so the section does not carry what loads this raiser` : null;
  return { value: kt, sign: null, limit };
}

/** The first reason that applies, in order of how basic it is; the value when none does. */
function decide(r: { value: number; sign: string | null; limit: string | null }, ...others: (string | null | undefined)[]): { value: number | null; withheld: string | null } {
  const why = r.sign ?? others.find((o) => o) ?? r.limit;
  return why ? { value: null, withheld: why } : { value: r.value, withheld: null };
}

/** Reasons the beam formula on this section gives no meaningful nominal stress at fibre v (empty when fine). */
function sectionDoubts(cut: Cut, loads: CutLoads, v: number, units: { stress: string }): string[] {
  if (cut.mirror) return [];
  const s = beamStress(cut, loads, v);
  const tau = Math.abs(loads.V) / cut.area;
  if (tau <= Math.abs(s)) return [];
  const big = largestBeamStress(cut, loads);
  return [
    `the section's mean shear stress V / A = ${fmt(tau)} ${units.stress} exceeds the nominal normal stress at the raiser, ${fmt(s)} ${units.stress} (the largest over the section is ${fmt(big)}): the raiser is loaded more by shear than by the normal stress a Kt refers to`,
  ];
}

/**
 * The gross section beside a raiser: parallel to its net section, moved along the flow until the
 * line crosses one stretch of material, bounded by straight edges parallel to the flow, with no
 * hole, on each side of the raiser that has material; the widths found on the two sides must
 * agree. Null when the part is not prismatic there (a shoulder, a lug's round end).
 */
function findGrossSection(domain: Domain, net: Cut, raiser: Raiser, vRaiser: number): GrossSection | null {
  const lo = net.ligaments[0];
  const hi = net.ligaments[net.ligaments.length - 1];
  const mine = new Set(raiser.edges);
  // The raiser's extent along the flow sets the step.
  const [bx0, by0, bx1, by1] = domain.bbox;
  const span = Math.abs((bx1 - bx0) * net.dx) + Math.abs((by1 - by0) * net.dy);
  const step = Math.max(span / 400, 1e-6 * domain.scale);
  const parallel = (edge: number) => {
    const c = domain.edges[edge].curve;
    if (c.kind !== 'line') return false;
    const l = Math.hypot(c.x1 - c.x0, c.y1 - c.y0);
    return Math.abs(((c.x1 - c.x0) * net.ex + (c.y1 - c.y0) * net.ey) / l) <= 1e-9;
  };
  const found: Cut[] = [];
  for (const sgn of [1, -1]) {
    let hadMaterial = false;
    let hit: Cut | null = null;
    for (let k = 1; k <= 400 && !hit; k++) {
      const off = sgn * k * step;
      const ox = net.ox + off * net.dx;
      const oy = net.oy + off * net.dy;
      const st = stretchesAlongLine(domain, ox, oy, net.ex, net.ey);
      // The material stretch overlapping the net section most.
      let best = -1;
      let overlap = 0;
      st.forEach((s, i) => {
        if (s.kind !== 'material') return;
        const o = Math.min(hi, s.v1) - Math.max(lo, s.v0);
        if (o > overlap) {
          overlap = o;
          best = i;
        }
      });
      if (best < 0) break;
      hadMaterial = true;
      const s = st[best];
      const holeNext = (best > 0 && st[best - 1].kind === 'hole') || (best + 1 < st.length && st[best + 1].kind === 'hole');
      if (holeNext || mine.has(s.edge0) || mine.has(s.edge1)) continue;
      if (parallel(s.edge0) && parallel(s.edge1)) hit = makeCut(ox, oy, net.ex, net.ey, [s.v0, s.v1], [s.edge0, s.edge1], net.thickness);
    }
    if (hit) found.push(hit);
    else if (hadMaterial) return null;
  }
  if (found.length === 0) return null;
  const g = found[0];
  if (found.length === 2) {
    const h = found[1];
    const tol = 1e-6 * g.length;
    if (Math.abs(g.ligaments[0] - h.ligaments[0]) > tol || Math.abs(g.ligaments[1] - h.ligaments[1]) > tol) return null;
  }
  // The gross section at the net section's place, and its fibre on the raiser's side.
  const cut = makeCut(net.ox, net.oy, net.ex, net.ey, g.ligaments, g.ligamentEdges, net.thickness);
  return { cut, found: g, vFibre: vRaiser < cut.vBar ? cut.ligaments[0] : cut.ligaments[1] };
}

/** The beam stress over a gross section from the net section's loads, moved to the gross centroid. */
function grossStress(net: Cut, loads: CutLoads, g: GrossSection): number {
  const [gx, gy] = pointOnCut(g.cut, g.cut.vBar);
  // Moment about the gross centroid: M_g = M + (c_net - c_gross) x F.
  const M = loads.M + ((loads.cx - gx) * loads.fy - (loads.cy - gy) * loads.fx);
  return beamStress(g.cut, { ...loads, M }, g.vFibre);
}

/** Largest principal value of a plane stress state, the one of larger magnitude. */
function principals(sxx: number, syy: number, sxy: number): [number, number] {
  const c = 0.5 * (sxx + syy);
  const r = Math.hypot(0.5 * (sxx - syy), sxy);
  return Math.abs(c + r) >= Math.abs(c - r) ? [c + r, c - r] : [c - r, c + r];
}

/**
 * The net section among the candidate cuts (least material first): the first whose ends lie on
 * free edges or mirror planes and whose nominal stress at the raiser is not negligible (at least
 * the peak over KT_LIMIT), or a cut square to the part's edges within ALIGNED_SLACK of its
 * material; then the same among cuts ending on held or loaded edges. When none carries load,
 * the first.
 */
function chooseSection(ctx: KtContext, cands: readonly RaiserCut[], peak: number): RaiserCut | null {
  if (cands.length === 0) return null;
  // A cut that ends on a held or loaded edge passes part of the load straight into the support
  // or takes it from the load's own edge: it is not across the member. Such cuts come last.
  const free = (c: RaiserCut) => {
    const e = c.cut.ligamentEdges;
    return !(ctx.edgeRole[e[0]] || ctx.edgeRole[e[e.length - 1]]);
  };
  const carries = (c: RaiserCut) => {
    markMirror(c.cut, ctx.domain, ctx.mirrorEdge);
    const loads = loadsThroughCut(ctx.mesh, c.cut, ctx.nodalForce);
    return loads !== null && Math.abs(beamStress(c.cut, loads, c.vRaiser)) * KT_LIMIT >= Math.abs(peak);
  };
  for (const usable of [(c: RaiserCut) => free(c) && carries(c), carries]) {
    const first = cands.findIndex(usable);
    if (first < 0) continue;
    const limit = cands[first].cut.length * (1 + ALIGNED_SLACK);
    if (!cands[first].aligned) {
      for (let i = first + 1; i < cands.length && cands[i].cut.length <= limit; i++) if (cands[i].aligned && usable(cands[i])) return cands[i];
    }
    return cands[first];
  }
  return cands[0];
}

/** Net, gross, remote and given Kt of one raiser. */
export function evaluateRaiserKt(ctx: KtContext, raiser: Raiser, peak: RaiserPeak, given: RaiserNominalInput = {}): RaiserKt {
  const { domain, mesh, nodalForce, measure, units } = ctx;
  const warnings: string[] = [];
  const kt: KtValue[] = [];
  const peakValue = peak.stress;
  let flow: [number, number];
  if (ctx.direction) {
    const l = Math.hypot(ctx.direction[0], ctx.direction[1]);
    flow = [ctx.direction[0] / l, ctx.direction[1] / l];
  } else flow = flowDirection(peak.sxx, peak.syy, peak.sxy, measure);

  let section: Cut | null = null;
  let vRaiser = NaN;
  let sectionGiven = false;
  if (given.section) {
    section = cutBetween(domain, given.section.from[0], given.section.from[1], given.section.to[0], given.section.to[1], ctx.thickness);
    sectionGiven = true;
    if (section) {
      // The fibre: the ligament end nearest the peak.
      const vp = (peak.x - section.ox) * section.ex + (peak.y - section.oy) * section.ey;
      vRaiser = section.ligaments.reduce((b, v) => (Math.abs(v - vp) < Math.abs(b - vp) ? v : b), section.ligaments[0]);
    }
  } else {
    const chosen = chooseSection(ctx, ctx.finder.find(raiser, peak.x, peak.y, flow[0], flow[1]), peakValue);
    if (chosen) {
      section = chosen.cut;
      vRaiser = chosen.vRaiser;
    }
  }
  if (section) markMirror(section, domain, ctx.mirrorEdge);

  // Biaxial states: a remote state with a second principal stress, or load across the flow.
  let biaxial: string | null = null;
  if (ctx.remote) {
    const [s1, s2] = principals(ctx.remote.sxx, ctx.remote.syy, ctx.remote.sxy);
    if (Math.abs(s2) > BIAXIAL_RATIO * Math.abs(s1)) {
      biaxial = `the remote stress is biaxial (principal stresses ${fmt(s1)} and ${fmt(s2)} ${units.stress}): a nominal stress across one section takes one direction only; read Kt against the remote principal stress`;
    }
  }

  let loads: CutLoads | null = null;
  let gross: GrossSection | null = null;
  if (!section) {
    kt.push({ kind: 'net', value: null, nominal: NaN, definition: 'peak / the beam formula on the net section', withheld: 'no cut across the flow at this raiser meets material' });
  } else {
    loads = loadsThroughCut(mesh, section, nodalForce);
    const definition = sectionGiven
      ? 'N / A - M y / I on the section given in the model, at its end nearest the peak'
      : 'N / A_net - M y / I_net on the raiser\'s net section (the least-material cut across the flow at the raiser, all ligaments together), at the raiser\'s edge';
    if (!loads) {
      kt.push({ kind: 'net', value: null, nominal: NaN, definition, withheld: 'the section does not divide the part in two, so what it carries is not defined' });
    } else {
      const nominal = beamStress(section, loads, vRaiser);
      const doubts = sectionDoubts(section, loads, vRaiser, units);
      if (!biaxial && !ctx.remote) {
        // Load across the flow: the section along the flow through the middle of the raiser's ligament.
        const k = section.ligaments.findIndex((v) => v === vRaiser);
        const a = section.ligaments[k - (k % 2)];
        const b = section.ligaments[k - (k % 2) + 1];
        const [mx, my] = pointOnCut(section, 0.5 * (a + b));
        const across = cutOnLine(domain, mx, my, section.dx, section.dy, 0, ctx.thickness);
        if (across) markMirror(across, domain, ctx.mirrorEdge);
        const acrossLoads = across ? loadsThroughCut(mesh, across, nodalForce) : null;
        if (across && acrossLoads) {
          const sAcross = acrossLoads.N / across.area;
          if (Math.abs(sAcross) > BIAXIAL_RATIO * Math.abs(nominal)) {
            biaxial = `the part is loaded across the flow as well (mean stress ${fmt(sAcross)} ${units.stress} across, ${fmt(nominal)} ${units.stress} along): a one-direction nominal stress does not describe a biaxial state; give the loading as a \`remote\` stress state for Kt against its largest principal stress`;
          }
        }
      }
      kt.push({ kind: 'net', nominal, definition, ...decide(ratio(measure, peakValue, nominal, units), doubts[0], biaxial) });
      gross = sectionGiven ? null : findGrossSection(domain, section, raiser, vRaiser);
      if (gross) {
        markMirror(gross.cut, domain, ctx.mirrorEdge);
        const gNom = grossStress(section, loads, gross);
        kt.push({
          kind: 'gross',
          nominal: gNom,
          definition: 'the net section\'s N and M over the gross section (the prismatic width beside the raiser), at its outer fibre on the raiser\'s side',
          ...decide(ratio(measure, peakValue, gNom, units), doubts[0], biaxial),
        });
      }
    }
  }
  if (ctx.remote) {
    const [s1] = principals(ctx.remote.sxx, ctx.remote.syy, ctx.remote.sxy);
    kt.push({ kind: 'remote', nominal: s1, definition: 'the largest principal value of the applied remote stress state', ...decide(ratio(measure, peakValue, s1, units)) });
  }
  if (given.bearing !== undefined) {
    kt.push({ kind: 'bearing', nominal: given.bearing, definition: 'the bearing stress F / (d t) of the pin in the hole: its force over the hole diameter times the thickness', ...decide(ratio('von-mises', Math.abs(peakValue), given.bearing, units)) });
  }
  if (given.stress !== undefined) {
    kt.push({ kind: 'given', nominal: given.stress, definition: 'the nominal stress given in the model for this raiser', ...decide(ratio(measure, peakValue, given.stress, units)) });
  }
  for (const k of kt) {
    if (k.value !== null && k.value < 1) {
      warnings.push(`Kt ${k.kind} ${fmt(k.value)} is below 1: the peak at ${raiser.name} is lower than the nominal stress, so the feature relieves rather than concentrates stress, or the nominal stress is not the one a chart would use`);
    }
  }
  const net = kt.find((k) => k.kind === 'net');
  const grossKt = kt.find((k) => k.kind === 'gross');
  if (net?.value != null && grossKt?.value != null && net.value > grossKt.value) {
    warnings.push(`Kt net ${fmt(net.value)} exceeds Kt gross ${fmt(grossKt.value)} at ${raiser.name}: its net nominal stress is the lower one, which bending across the net section or an off-centre raiser can cause; compare with a chart only under the chart's own definition`);
  }
  return { flow, section, vRaiser, sectionGiven, loads, gross, kt, warnings };
}
