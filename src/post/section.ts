/**
 * Sections (cuts across the part) and what they carry.
 *
 * A cut is a straight line across the part, from outer boundary to outer boundary, crossing any
 * holes on the way: the material on it is one or more ligaments. Along the cut v runs in the
 * direction e; the cut's normal d = (e_y, -e_x) points to its "plus" side.
 *
 *          plus side (d)
 *     |=====ligament=====|  hole  |==ligament==|      v along e --->
 *          minus side
 *
 * What the cut carries comes from the nodal forces r = K u of the finite element solution
 * (applied loads plus reactions; zero at free interior nodes up to round-off): the nodes of the
 * mesh are split into the two bodies the cut separates, and the resultant of r over the plus
 * body is what the minus body must pass through the cut (a free-body cut, exact for the discrete
 * solution whatever the stress distribution). With F that resultant and M its moment about the
 * centroid c of the net section (counter-clockwise positive):
 *
 *   N = F . d (normal force, tension positive), V = F . e (shear force),
 *   sigma(v) = N / A - M (v - v_bar) / I         (the beam formula on the net section)
 *
 * with A = t L the net area (L the ligaments' total length), v_bar their centroid and
 * I = t sum integral (v - v_bar)^2 dv their second moment. (Derivation: the traction on the plus
 * body's cut face is -sigma_dd d; force balance gives integral sigma_dd dA = F . d, moment
 * balance about c gives integral (v - v_bar) sigma_dd dA = -M, since e x d = -1.) For tension
 * alone it is N / A_net; for one ligament of width h in bending, 6 M / (t h^2) at its edges.
 * This is the membrane-plus-bending split of the stress-classification practice of pressure
 * equipment design by analysis: the membrane stress is "the component of normal stress that is
 * uniformly distributed and equal to the average value of the stress across the thickness", the
 * bending stress "the variable stress across the thickness ... after the subtraction of the
 * membrane stress" (US 46 CFR Part 154, Appendix B, stress analyses definitions [V]); in the
 * ASME Boiler and Pressure Vessel Code, Section VIII Division 2, Part 5, Annex 5-A, sigma_m =
 * (1/t) integral sigma dx and sigma_b = (6/t^2) integral sigma (t/2 - x) dx [M]. Here it is taken
 * from the section's resultants over all its ligaments together, which is how the published
 * charts define their nominal stresses: Roark's Formulas (Young & Budynas), Table 17.1, gives
 * for a central hole in a plate in bending sigma_nom = 12 M r / (t (D^3 - (2 r)^3)), that is
 * M (d/2) / I_net at the hole's edge [V], and P / A_net, 6 M / (t d^2) for notched and stepped
 * bars [V]. It is not the linearisation of the actual stress over one ligament, whose first
 * moment would count part of the concentration itself as bending.
 */
import type { Domain } from '../geometry/domain.js';
import { stretchesAlongLine } from '../geometry/line-cross.js';
import type { Mesh } from '../mesh/types.js';

export interface Cut {
  /** a point on the cut's line; v is measured from it along e */
  ox: number;
  oy: number;
  /** unit vector along the cut */
  ex: number;
  ey: number;
  /** unit normal of the cut, (ey, -ex): the direction of the flow it is taken across */
  dx: number;
  dy: number;
  /** the material ligaments along the cut, as v0, v1 pairs in increasing v */
  ligaments: number[];
  /** the domain edges at the ends of each ligament (two per ligament) */
  ligamentEdges: number[];
  /** total ligament length and net area (length x thickness) */
  length: number;
  area: number;
  /** v of the ligaments' centroid, and their second moment about it times the thickness */
  vBar: number;
  inertia: number;
  thickness: number;
  /**
   * the cut's line crosses a mirror plane (a symmetry support) at right angles: it is half of a
   * symmetric section whose whole carries no moment and no shear by symmetry, so its nominal
   * stress is N / A
   */
  mirror: boolean;
}

/** What a cut carries: normal force, shear force and moment about the net centroid (of the plus body's loads). */
export interface CutLoads {
  N: number;
  V: number;
  M: number;
  /** resultant of the plus body's nodal forces, and the centroid the moment is taken about */
  fx: number;
  fy: number;
  cx: number;
  cy: number;
}

/** The point at parameter v along the cut. */
export function pointOnCut(c: Cut, v: number): [number, number] {
  return [c.ox + v * c.ex, c.oy + v * c.ey];
}

/** The beam formula on the net section: N / A - M (v - v_bar) / I at parameter v (stress units). */
export function beamStress(c: Cut, loads: CutLoads, v: number): number {
  if (c.mirror) return loads.N / c.area;
  return loads.N / c.area - (loads.M * (v - c.vBar)) / c.inertia;
}

/**
 * Marks a cut whose line crosses a mirror plane at right angles (the line of a straight edge
 * flagged in `mirrorEdge`): the model is one side of that plane, so the cut is one half of a
 * symmetric section; see Cut.mirror.
 */
export function markMirror(c: Cut, domain: Domain, mirrorEdge: Uint8Array): Cut {
  for (let id = 0; id < mirrorEdge.length; id++) {
    if (!mirrorEdge[id]) continue;
    const k = domain.edges[id].curve;
    if (k.kind !== 'line') continue;
    const l = Math.hypot(k.x1 - k.x0, k.y1 - k.y0);
    if (Math.abs(((k.x1 - k.x0) * c.ex + (k.y1 - k.y0) * c.ey) / l) <= 1e-9) c.mirror = true;
  }
  return c;
}

/** The largest |beam stress| over the section: at one of the ligaments' outermost fibres. */
export function largestBeamStress(c: Cut, loads: CutLoads): number {
  const lo = c.ligaments[0];
  const hi = c.ligaments[c.ligaments.length - 1];
  return Math.max(Math.abs(beamStress(c, loads, lo)), Math.abs(beamStress(c, loads, hi)));
}

/** Builds a cut from its line and ligaments. */
export function makeCut(ox: number, oy: number, ex: number, ey: number, ligaments: number[], ligamentEdges: number[], thickness: number): Cut {
  let L = 0;
  let first = 0;
  for (let k = 0; k < ligaments.length; k += 2) {
    const a = ligaments[k];
    const b = ligaments[k + 1];
    L += b - a;
    first += 0.5 * (b * b - a * a);
  }
  const vBar = first / L;
  let I = 0;
  for (let k = 0; k < ligaments.length; k += 2) {
    const a = ligaments[k] - vBar;
    const b = ligaments[k + 1] - vBar;
    I += (b * b * b - a * a * a) / 3;
  }
  return { ox, oy, ex, ey, dx: ey, dy: -ex, ligaments, ligamentEdges, length: L, area: L * thickness, vBar, inertia: I * thickness, thickness, mirror: false };
}

/**
 * The cut along the line o + v e that contains the material point nearest to parameter vAt:
 * the material stretch there, extended across every hole it meets, up to the outline on both
 * sides. Null when the line crosses no material.
 */
export function cutOnLine(domain: Domain, ox: number, oy: number, ex: number, ey: number, vAt: number, thickness: number): Cut | null {
  const st = stretchesAlongLine(domain, ox, oy, ex, ey);
  let best = -1;
  let bestGap = Infinity;
  st.forEach((s, i) => {
    if (s.kind !== 'material') return;
    const gap = vAt < s.v0 ? s.v0 - vAt : vAt > s.v1 ? vAt - s.v1 : 0;
    if (gap < bestGap) {
      bestGap = gap;
      best = i;
    }
  });
  if (best < 0) return null;
  let lo = best;
  let hi = best;
  while (lo - 2 >= 0 && st[lo - 1].kind === 'hole' && st[lo - 2].kind === 'material') lo -= 2;
  while (hi + 2 < st.length && st[hi + 1].kind === 'hole' && st[hi + 2].kind === 'material') hi += 2;
  const lig: number[] = [];
  const edges: number[] = [];
  for (let i = lo; i <= hi; i += 2) {
    lig.push(st[i].v0, st[i].v1);
    edges.push(st[i].edge0, st[i].edge1);
  }
  return makeCut(ox, oy, ex, ey, lig, edges, thickness);
}

/**
 * A cut given by two points: the line through them, clipped to the segment between them. A cut
 * drawn along a straight boundary (a symmetry edge, say) is taken a hair inside the material:
 * of the lines 1e-9 of the part's size to either side, the one that crosses more material.
 */
export function cutBetween(domain: Domain, px: number, py: number, qx: number, qy: number, thickness: number): Cut | null {
  const len = Math.hypot(qx - px, qy - py);
  if (!(len > 0)) return null;
  const ex = (qx - px) / len;
  const ey = (qy - py) / len;
  const eps = 1e-9 * domain.scale;
  let best: Cut | null = null;
  // The offset lines first: a line exactly on a straight boundary edge puts that edge's nodes on
  // the cut itself, where no element straddles it.
  for (const off of [eps, -eps, 0]) {
    const ox = px + off * ey;
    const oy = py - off * ex;
    const st = stretchesAlongLine(domain, ox, oy, ex, ey);
    const lig: number[] = [];
    const edges: number[] = [];
    for (const s of st) {
      if (s.kind !== 'material') continue;
      const a = Math.max(0, s.v0);
      const b = Math.min(len, s.v1);
      if (b > a) {
        lig.push(a, b);
        edges.push(a === s.v0 ? s.edge0 : -1, b === s.v1 ? s.edge1 : -1);
      }
    }
    if (lig.length === 0) continue;
    const c = makeCut(ox, oy, ex, ey, lig, edges, thickness);
    if (!best || c.length > best.length * (1 + 1e-9)) best = c;
  }
  return best;
}

/**
 * Splits the mesh's nodes into the two bodies a cut separates and sums the nodal forces of the
 * plus body. An element whose nodes lie on both sides of the cut's line, with its chords crossing
 * the line within a ligament (widened by the chord's own length, so that the chords of a curved
 * boundary at a ligament's end count), is cut: its nodes join their own side only. Every other
 * element joins all its nodes. Returns null when the bodies are not separate (a path of uncut
 * elements leads around the cut), which means the cut does not divide the part in two.
 *
 * A node on the cut's line within a ligament (within 1e-12 of the ligaments' span: a hole's top
 * point on a cut through its centre, say) belongs to both bodies: its nodal force is shared,
 * half to each. Giving it whole to one side made the moment, and the net Kt, depend on the
 * round-off sign of a direction's zero component (measured: a link plate's Kt 3.724 or 3.747 on
 * the same mesh).
 */
export function loadsThroughCut(mesh: Mesh, cut: Cut, nodalForce: Float64Array): CutLoads | null {
  const n = mesh.nNodes;
  const per = mesh.order === 2 ? 6 : 3;
  const xy = mesh.nodes;
  const side = new Float64Array(n);
  const along = new Float64Array(n);
  const lig = cut.ligaments;
  // round-off in the cut's direction only (cutBetween's deliberate offset of 1e-9 of the part's size is far more)
  const onLineTol = 1e-12 * (lig[lig.length - 1] - lig[0]);
  const onLine = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const rx = xy[2 * i] - cut.ox;
    const ry = xy[2 * i + 1] - cut.oy;
    side[i] = rx * cut.dx + ry * cut.dy;
    along[i] = rx * cut.ex + ry * cut.ey;
    if (Math.abs(side[i]) <= onLineTol && along[i] >= lig[0] - onLineTol && along[i] <= lig[lig.length - 1] + onLineTol) {
      side[i] = 0; // on the line: the plus side when the mesh is split, half its force in the sums
      onLine[i] = 1;
    }
  }
  const parent = new Int32Array(n);
  for (let i = 0; i < n; i++) parent[i] = i;
  const find = (a: number): number => {
    while (parent[a] !== a) {
      parent[a] = parent[parent[a]];
      a = parent[a];
    }
    return a;
  };
  const join = (a: number, b: number) => {
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[ra] = rb;
  };
  const cutEl = new Uint8Array(mesh.nElements);
  const inLigament = (v: number, slack: number) => {
    for (let k = 0; k < lig.length; k += 2) if (v >= lig[k] - slack && v <= lig[k + 1] + slack) return true;
    return false;
  };
  for (let e = 0; e < mesh.nElements; e++) {
    const o = per * e;
    let crosses = false;
    for (let i = 0; i < per && !crosses; i++) {
      const a = mesh.elements[o + i];
      for (let j = i + 1; j < per && !crosses; j++) {
        const b = mesh.elements[o + j];
        if (side[a] >= 0 === side[b] >= 0) continue;
        const t = side[a] / (side[a] - side[b]);
        const v = along[a] + t * (along[b] - along[a]);
        const chord = Math.hypot(xy[2 * b] - xy[2 * a], xy[2 * b + 1] - xy[2 * a + 1]);
        if (inLigament(v, chord)) crosses = true;
      }
    }
    if (crosses) {
      cutEl[e] = 1;
      let plus = -1;
      let minus = -1;
      for (let i = 0; i < per; i++) {
        const a = mesh.elements[o + i];
        if (side[a] >= 0) plus < 0 ? (plus = a) : join(plus, a);
        else minus < 0 ? (minus = a) : join(minus, a);
      }
    } else {
      const a = mesh.elements[o];
      for (let i = 1; i < per; i++) join(a, mesh.elements[o + i]);
    }
  }
  // The plus body: every component holding a plus-side node of a cut element.
  const label = new Int8Array(n); // per root: 1 plus, 2 minus, 3 both
  let any = false;
  for (let e = 0; e < mesh.nElements; e++) {
    if (!cutEl[e]) continue;
    any = true;
    for (let i = 0; i < per; i++) {
      const a = mesh.elements[per * e + i];
      label[find(a)] |= side[a] >= 0 ? 1 : 2;
    }
  }
  if (!any) return null;
  // Moments about the centroid directly, so a part far from the origin loses no digits.
  const [cx, cy] = pointOnCut(cut, cut.vBar);
  let fx = 0;
  let fy = 0;
  let M = 0;
  for (let i = 0; i < n; i++) {
    const l = label[find(i)];
    if (l === 3) return null;
    if (l !== 1 && !onLine[i]) continue;
    const w = onLine[i] ? 0.5 : 1;
    const rx = w * nodalForce[2 * i];
    const ry = w * nodalForce[2 * i + 1];
    fx += rx;
    fy += ry;
    M += (xy[2 * i] - cx) * ry - (xy[2 * i + 1] - cy) * rx;
  }
  return { N: fx * cut.dx + fy * cut.dy, V: fx * cut.ex + fy * cut.ey, M, fx, fy, cx, cy };
}
