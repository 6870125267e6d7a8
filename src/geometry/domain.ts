/**
 * Turns the geometry of a model file into a Domain: closed loops of curves with the material on
 * the left (outline counter-clockwise, holes clockwise), each edge carrying its tags and a label
 * people can read ("hole 2", "fillet at corner 5"). Corner rounding and hole primitives are
 * expanded here; nothing downstream knows about them.
 */
import { ModelError, formatPath } from '../model/errors.js';
import type { ArcSpec, DrawingGeometry, Geometry, Loop, Vertex } from '../model/schema.js';
import type { ImportedDrawing } from './import/index.js';
import { MAX_EDGES, MAX_LOOPS } from './limits.js';
import { type Curve, curveAreaTerm, curveTangent, evaluateCurve, reverseCurve } from './curve.js';

export interface DomainEdge {
  id: number;
  loop: number;
  curve: Curve;
  tags: string[];
  /** what a person calls this piece of boundary */
  label: string;
  /** the feature the edge belongs to, for naming where a peak sits */
  feature: string;
  /** JSON path of the model field it came from */
  source: string;
}

export interface DomainCorner {
  loop: number;
  x: number;
  y: number;
  /** interior angle in the material, radians (pi = no corner; > pi re-entrant) */
  materialAngle: number;
  edgeIn: number;
  edgeOut: number;
  label: string;
}

export interface DomainLoop {
  index: number;
  /** 0 for the outline, k for hole k (counting from 1) */
  hole: number;
  name?: string;
  label: string;
  /** edge ids in order of travel, material on the left */
  edges: number[];
  source: string;
  /** signed area enclosed (positive for the outline, negative for holes) */
  signedArea: number;
}

export interface Domain {
  loops: DomainLoop[];
  edges: DomainEdge[];
  /** junctions between consecutive edges that are not tangent-continuous */
  corners: DomainCorner[];
  bbox: [number, number, number, number];
  /** the bounding-box diagonal, the length scale for tolerances */
  scale: number;
  /** exact material area (outline minus holes) */
  area: number;
}

interface RawEdge {
  curve: Curve;
  tags: string[];
  label: string;
  feature: string;
  source: string;
}

const DEG = Math.PI / 180;


/**
 * Builds the domain; throws ModelError naming the field when a loop cannot be built. A geometry
 * `from` a drawing is built from `drawing`, the drawing it names as read by readModelDrawing
 * (src/geometry/import), which the caller passes; without it the geometry is refused.
 */
export function buildDomain(geometry: Geometry, drawing?: ImportedDrawing, basePath = 'geometry'): Domain {
  const built: { raw: RawEdge[]; path: string; name?: string; label: string }[] = [];
  if ('from' in geometry) built.push(...drawingLoops(geometry, drawing, basePath));
  else {
    const all: Loop[] = [geometry.outline, ...(geometry.holes ?? [])];
    all.forEach((loop, li) => {
      const path = li === 0 ? `${basePath}.outline` : formatPath([basePath, 'holes', li - 1]);
      const name = loop.name;
      const label = li === 0 ? 'outline' : name ? `hole ${li} "${name}"` : `hole ${li}`;
      built.push({ raw: buildLoop(loop, path, label, li === 0), path, name, label });
    });
  }
  return assembleDomain(built);
}

/** The loops of the drawing the geometry names, read by the caller (src/geometry/import), as raw edges. */
function drawingLoops(geometry: DrawingGeometry, d: ImportedDrawing | undefined, basePath: string): { raw: RawEdge[]; path: string; name?: string; label: string }[] {
  const path = `${basePath}.from`;
  if (!d) throw new ModelError(path, `the geometry comes from the drawing "${geometry.from}", and no drawing was given to build it from`, 'load the model with loadModelAndDrawing (src/pipeline/load.ts), which reads the drawing it names, and pass its drawing on');
  if (d.file !== geometry.from) throw new ModelError(path, `the geometry comes from the drawing "${geometry.from}", but the drawing given was read from "${d.file}"`, 'pass the drawing loaded with this model');
  const edgeWord = (c: Curve) => (c.kind === 'line' ? 'line' : c.kind === 'arc' ? 'arc' : c.kind === 'ellipse' ? 'elliptical arc' : 'curve');
  const loops = [d.outline, ...d.holes];
  return loops.map((loop, li) => {
    const label = li === 0 ? 'outline' : loop.name ? `hole ${li} "${loop.name}"` : `hole ${li}`;
    const raw = loop.edges.map((e): RawEdge => {
      const what = `${edgeWord(e.curve)}${e.tags.length ? ` "${e.tags[e.tags.length - 1]}"` : ''} (${e.origin})`;
      return { curve: e.curve, tags: e.tags, label: li === 0 ? `${what} of the outline` : `${what} of ${label}`, feature: li === 0 ? what : label, source: path };
    });
    return { raw, path, name: loop.name, label };
  });
}

/** Orients the loops (outline counter-clockwise, holes clockwise), numbers the edges, finds corners and the bounding box. */
function assembleDomain(built: { raw: RawEdge[]; path: string; name?: string; label: string }[]): Domain {
  const loops: DomainLoop[] = [];
  const edges: DomainEdge[] = [];
  if (built.length > MAX_LOOPS) {
    throw new ModelError(built[MAX_LOOPS].path, `the part has ${built.length - 1} holes, more than the ${MAX_LOOPS - 1} raiser analyses in one model`, 'model a representative piece of the part (a strip of holes with symmetry supports), not the whole perforated plate');
  }
  let edgeCount = 0;
  built.forEach(({ raw: written, path, name, label }, li) => {
    const hole = li;
    if (written.length === 0) throw new ModelError(path, `${label}: the loop has no edges`);
    const raw = mergeCollinear(written);
    edgeCount += raw.length;
    if (edgeCount > MAX_EDGES) {
      throw new ModelError(path, `the part has more than ${MAX_EDGES.toLocaleString('en-US')} edges (${label} passes the limit), after straight edges in line are merged`, 'simplify the profile: join short segments into arcs, or model a representative piece of the part');
    }
    let signed = 0;
    for (const e of raw) signed += curveAreaTerm(e.curve);
    const wantPositive = li === 0;
    let ordered = raw;
    if (Math.abs(signed) === 0 || !Number.isFinite(signed)) {
      throw new ModelError(path, `${label}: the loop encloses no area`, 'check that its vertices are not all on one line');
    }
    if (signed > 0 !== wantPositive) {
      ordered = raw.slice().reverse().map((e) => ({ ...e, curve: reverseCurve(e.curve) }));
      signed = -signed;
    }
    const ids: number[] = [];
    for (const e of ordered) {
      const id = edges.length;
      edges.push({ id, loop: li, ...e });
      ids.push(id);
    }
    loops.push({ index: li, hole, name, label, edges: ids, source: path, signedArea: signed });
  });

  const corners = findCorners(loops, edges);
  let xmin = Infinity;
  let ymin = Infinity;
  let xmax = -Infinity;
  let ymax = -Infinity;
  const p = [0, 0];
  for (const e of edges) {
    for (let k = 0; k <= 32; k++) {
      evaluateCurve(e.curve, k / 32, p);
      xmin = Math.min(xmin, p[0]);
      ymin = Math.min(ymin, p[1]);
      xmax = Math.max(xmax, p[0]);
      ymax = Math.max(ymax, p[1]);
    }
  }
  const area = loops.reduce((s, l) => s + l.signedArea, 0);
  return { loops, edges, corners, bbox: [xmin, ymin, xmax, ymax], scale: Math.hypot(xmax - xmin, ymax - ymin), area };
}

/**
 * Runs of straight edges in line, with the same tags, become one edge (labelled as the first of
 * the run). A straight edge written as thousands of vertices is the same boundary as one edge,
 * and must cost and mesh the same: otherwise every vertex forces a node, the mesh is refined
 * along the whole edge, and a singular point there (the end of a clamp, say) takes the peak.
 * A vertex is in line when it lies within 1e-10 of the merged edge's length from it, between its ends.
 */
export function mergeCollinear<E extends { curve: Curve; tags: string[] }>(edges: E[]): E[] {
  const inLine = (a: E, b: E): boolean => {
    const ca = a.curve;
    const cb = b.curve;
    if (ca.kind !== 'line' || cb.kind !== 'line') return false;
    if (ca.x1 !== cb.x0 || ca.y1 !== cb.y0) return false;
    if (a.tags.length !== b.tags.length || a.tags.some((t, i) => t !== b.tags[i])) return false;
    const dx = cb.x1 - ca.x0;
    const dy = cb.y1 - ca.y0;
    const len = Math.hypot(dx, dy);
    if (!(len > 0)) return false;
    const off = Math.abs(dx * (ca.y1 - ca.y0) - dy * (ca.x1 - ca.x0)) / len;
    const along = (dx * (ca.x1 - ca.x0) + dy * (ca.y1 - ca.y0)) / (len * len);
    return off <= 1e-10 * len && along > 0 && along < 1;
  };
  const join = (a: E, b: E): E => {
    const ca = a.curve as Extract<Curve, { kind: 'line' }>;
    const cb = b.curve as Extract<Curve, { kind: 'line' }>;
    return { ...a, curve: { kind: 'line', x0: ca.x0, y0: ca.y0, x1: cb.x1, y1: cb.y1 } };
  };
  const out: E[] = [];
  for (const e of edges) {
    const last = out[out.length - 1];
    if (last && inLine(last, e)) out[out.length - 1] = join(last, e);
    else out.push(e);
  }
  // The run may go on across the loop's start.
  while (out.length > 2 && inLine(out[out.length - 1], out[0])) out[0] = join(out.pop()!, out[0]);
  return out;
}

function findCorners(loops: DomainLoop[], edges: DomainEdge[]): DomainCorner[] {
  const corners: DomainCorner[] = [];
  const d0 = [0, 0];
  const d1 = [0, 0];
  const p = [0, 0];
  for (const loop of loops) {
    const n = loop.edges.length;
    for (let k = 0; k < n; k++) {
      const ein = edges[loop.edges[k]];
      const eout = edges[loop.edges[(k + 1) % n]];
      curveTangent(ein.curve, 1, d0);
      curveTangent(eout.curve, 0, d1);
      const turn = Math.atan2(d0[0] * d1[1] - d0[1] * d1[0], d0[0] * d1[0] + d0[1] * d1[1]);
      if (Math.abs(turn) < 1e-6) continue; // tangent-continuous: no corner
      evaluateCurve(eout.curve, 0, p);
      corners.push({
        loop: loop.index,
        x: p[0],
        y: p[1],
        materialAngle: Math.PI - turn,
        edgeIn: ein.id,
        edgeOut: eout.id,
        label: `corner at (${fmt(p[0])}, ${fmt(p[1])}) of the ${loop.label}`,
      });
    }
  }
  return corners;
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

// ---------------------------------------------------------------------------------------------

function buildLoop(loop: Loop, path: string, label: string, isOutline: boolean): RawEdge[] {
  const loopTags = loop.tag ? [loop.tag] : [];
  const feature = isOutline ? 'outline' : label;
  switch (loop.shape) {
    case 'path':
      return buildPath(loop.path, `${path}.path`, loopTags, isOutline, label);
    case 'circle': {
      const r = circleRadius(loop, path);
      return [{ curve: { kind: 'arc', cx: loop.center[0], cy: loop.center[1], r, a0: 0, sweep: 2 * Math.PI }, tags: loopTags, label, feature, source: path }];
    }
    case 'ellipse': {
      const rot = (loop.angle ?? 0) * DEG;
      return [
        {
          curve: { kind: 'ellipse', cx: loop.center[0], cy: loop.center[1], a: loop.a, b: loop.b, rot, t0: 0, sweep: 2 * Math.PI },
          tags: loopTags,
          label,
          feature,
          source: path,
        },
      ];
    }
    case 'slot': {
      if (loop.length <= loop.width) {
        throw new ModelError(`${path}.length`, `${label}: a slot's length (${loop.length}) must exceed its width (${loop.width})`, 'for a round hole use shape "circle"');
      }
      const r = loop.width / 2;
      const half = loop.length / 2 - r;
      return roundedBox(loop.center, half, 0, r, loop.angle ?? 0, loopTags, label, feature, path);
    }
    case 'rounded-rect': {
      const rmax = Math.min(loop.width, loop.height) / 2;
      if (loop.radius > rmax * (1 + 1e-12)) {
        throw new ModelError(`${path}.radius`, `${label}: corner radius ${loop.radius} is larger than half the smaller side (${rmax})`, `use a radius of at most ${rmax}`);
      }
      const r = Math.min(loop.radius, rmax);
      return roundedBox(loop.center, loop.width / 2 - r, loop.height / 2 - r, r, loop.angle ?? 0, loopTags, label, feature, path);
    }
  }
}

function circleRadius(loop: { radius?: number; diameter?: number }, path: string): number {
  if (loop.radius !== undefined && loop.diameter !== undefined) {
    if (Math.abs(loop.radius * 2 - loop.diameter) > 1e-12 * loop.diameter) {
      throw new ModelError(path, `radius ${loop.radius} and diameter ${loop.diameter} disagree`, 'give one of them');
    }
  }
  const r = loop.radius ?? (loop.diameter !== undefined ? loop.diameter / 2 : undefined);
  if (r === undefined) throw new ModelError(path, 'a circle needs a radius or a diameter');
  return r;
}

/**
 * A rectangle of half sizes (hx + r, hy + r) with corners rounded to radius r, rotated by
 * angleDeg about centre c; counter-clockwise. hx or hy may be zero (a slot end is then a half circle).
 */
function roundedBox(
  c: readonly [number, number],
  hx: number,
  hy: number,
  r: number,
  angleDeg: number,
  tags: string[],
  label: string,
  feature: string,
  source: string,
): RawEdge[] {
  const th = angleDeg * DEG;
  const co = Math.cos(th);
  const si = Math.sin(th);
  const X = (x: number, y: number) => c[0] + co * x - si * y;
  const Y = (x: number, y: number) => c[1] + si * x + co * y;
  const out: RawEdge[] = [];
  const line = (x0: number, y0: number, x1: number, y1: number) => {
    if (Math.hypot(x1 - x0, y1 - y0) <= 1e-12 * (hx + hy + r)) return;
    out.push({ curve: { kind: 'line', x0: X(x0, y0), y0: Y(x0, y0), x1: X(x1, y1), y1: Y(x1, y1) }, tags, label, feature, source });
  };
  const arc = (cx: number, cy: number, a0: number) => {
    if (r <= 0) return;
    out.push({ curve: { kind: 'arc', cx: X(cx, cy), cy: Y(cx, cy), r, a0: a0 + th, sweep: Math.PI / 2 }, tags, label, feature, source });
  };
  // Counter-clockwise from the bottom edge.
  line(-hx, -hy - r, hx, -hy - r);
  arc(hx, -hy, -Math.PI / 2);
  line(hx + r, -hy, hx + r, hy);
  arc(hx, hy, 0);
  line(hx, hy + r, -hx, hy + r);
  arc(-hx, hy, Math.PI / 2);
  line(-hx - r, hy, -hx - r, -hy);
  arc(-hx, -hy, Math.PI);
  return out;
}

interface PathVertex {
  x: number;
  y: number;
  round?: number;
  edge?: string;
  arc?: ArcSpec;
}

function normaliseVertex(v: Vertex): PathVertex {
  if (Array.isArray(v)) return { x: v[0], y: v[1] };
  const o = v as Exclude<Vertex, readonly [number, number]>;
  return { x: o.at[0], y: o.at[1], round: o.round, edge: o.edge, arc: o.arc };
}

/** An arc from (ax, ay) to (bx, by) as given by spec; throws when it cannot be built. */
function buildArc(ax: number, ay: number, bx: number, by: number, spec: ArcSpec, path: string, scale: number): Curve {
  if ('ellipse' in spec) return buildEllipticalArc(ax, ay, bx, by, spec.ellipse, `${path}.ellipse`);
  const chord = Math.hypot(bx - ax, by - ay);
  let cx: number;
  let cy: number;
  let ccw: boolean;
  if ('through' in spec) {
    // Relative to A: squares of coordinates far from the origin (a part at x = 1e9) would
    // cancel away every digit of the centre.
    const px = spec.through[0] - ax;
    const py = spec.through[1] - ay;
    const qx = bx - ax;
    const qy = by - ay;
    const d = 2 * (px * qy - qx * py);
    if (Math.abs(d) <= 1e-12 * scale * scale) {
      throw new ModelError(`${path}.through`, 'the three points of the arc lie on one line', 'move the "through" point off the chord, or make the edge straight');
    }
    const p2 = px * px + py * py;
    const q2 = qx * qx + qy * qy;
    cx = ax + (p2 * qy - q2 * py) / d;
    cy = ay + (q2 * px - p2 * qx) / d;
    ccw = px * qy - py * qx > 0; // A -> P -> B turns left
  } else if ('center' in spec) {
    [cx, cy] = spec.center;
    const ra = Math.hypot(ax - cx, ay - cy);
    const rb = Math.hypot(bx - cx, by - cy);
    if (Math.abs(ra - rb) > 1e-6 * Math.max(ra, rb)) {
      throw new ModelError(`${path}.center`, `the arc centre is ${fmt(ra)} from the start and ${fmt(rb)} from the end; they must be equal`, 'correct the centre or the end points');
    }
    ccw = spec.turn === 'ccw';
  } else {
    const r = spec.radius;
    if (r < chord / 2 * (1 - 1e-9)) {
      throw new ModelError(`${path}.radius`, `an arc of radius ${r} cannot span a chord of ${fmt(chord)}`, `use a radius of at least ${fmt(chord / 2)}`);
    }
    const h = Math.sqrt(Math.max(0, r * r - (chord * chord) / 4));
    const mx = (ax + bx) / 2;
    const my = (ay + by) / 2;
    const nx = -(by - ay) / chord;
    const ny = (bx - ax) / chord;
    ccw = spec.turn === 'ccw';
    const left = ccw !== (spec.large ?? false); // small ccw arc: centre on the left of A -> B
    cx = mx + (left ? h : -h) * nx;
    cy = my + (left ? h : -h) * ny;
  }
  const r = Math.hypot(ax - cx, ay - cy);
  const a0 = Math.atan2(ay - cy, ax - cx);
  const a1 = Math.atan2(by - cy, bx - cx);
  let sweep = a1 - a0;
  if (ccw) {
    while (sweep <= 0) sweep += 2 * Math.PI;
    while (sweep > 2 * Math.PI) sweep -= 2 * Math.PI;
  } else {
    while (sweep >= 0) sweep -= 2 * Math.PI;
    while (sweep < -2 * Math.PI) sweep += 2 * Math.PI;
  }
  return { kind: 'arc', cx, cy, r, a0, sweep };
}

/**
 * An elliptical arc from (ax, ay) to (bx, by) on the ellipse given, in the eccentric angle t of
 * the curve kind 'ellipse' (x = a cos t, y = b sin t in the ellipse's own axes, so increasing t
 * runs counter-clockwise). Each end must lie on the ellipse: its normalised radius
 * sqrt((u/rx)^2 + (v/ry)^2) within 1e-6 of 1, the same relative tolerance as a circular arc's
 * centre check.
 */
function buildEllipticalArc(
  ax: number,
  ay: number,
  bx: number,
  by: number,
  e: { center: readonly [number, number]; rx: number; ry: number; rotation?: number; turn: 'ccw' | 'cw' },
  path: string,
): Curve {
  const rot = ((e.rotation ?? 0) * Math.PI) / 180;
  const c = Math.cos(rot);
  const s = Math.sin(rot);
  const [cx, cy] = e.center;
  const angleOf = (x: number, y: number, which: string): number => {
    const u = ((x - cx) * c + (y - cy) * s) / e.rx;
    const v = (-(x - cx) * s + (y - cy) * c) / e.ry;
    const rho = Math.hypot(u, v);
    if (Math.abs(rho - 1) > 1e-6) {
      throw new ModelError(
        `${path}.center`,
        `the ${which} point (${fmt(x)}, ${fmt(y)}) is not on the ellipse: it lies at ${fmt(rho)} times the ellipse's size from its centre in that direction (1 is on it)`,
        'correct the centre, rx, ry or rotation, or the end points; a point on the ellipse is (cx + rx cos t, cy + ry sin t) turned by the rotation',
      );
    }
    return Math.atan2(v, u);
  };
  const t0 = angleOf(ax, ay, 'start');
  const t1 = angleOf(bx, by, 'end');
  let sweep = t1 - t0;
  if (e.turn === 'ccw') {
    while (sweep <= 0) sweep += 2 * Math.PI;
    while (sweep > 2 * Math.PI) sweep -= 2 * Math.PI;
  } else {
    while (sweep >= 0) sweep -= 2 * Math.PI;
    while (sweep < -2 * Math.PI) sweep += 2 * Math.PI;
  }
  return { kind: 'ellipse', cx, cy, a: e.rx, b: e.ry, rot, t0, sweep };
}

function buildPath(vertices: Vertex[], path: string, loopTags: string[], isOutline: boolean, loopLabel: string): RawEdge[] {
  const vs = vertices.map(normaliseVertex);
  const n = vs.length;
  // The loop's own extent, not the size of its coordinates: a part drawn at x = 1e9 keeps the
  // tolerances of the same part at the origin.
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (const v of vs) {
    x0 = Math.min(x0, v.x);
    y0 = Math.min(y0, v.y);
    x1 = Math.max(x1, v.x);
    y1 = Math.max(y1, v.y);
  }
  const scale = Math.max(x1 - x0, y1 - y0);
  const where = (i: number) => (isOutline ? `corner ${i + 1}` : `corner ${i + 1} of ${loopLabel}`);
  if (n === 2 && !vs[0].arc && !vs[1].arc) {
    throw new ModelError(path, 'a path of two vertices with two straight edges encloses no area', 'make one or both of its edges an arc (two half circles make a round hole), or give three or more vertices');
  }
  const edgeName = (i: number) => (isOutline ? `outline edge ${i + 1}` : `edge ${i + 1} of ${loopLabel}`);
  // Zero-length edges.
  for (let i = 0; i < n; i++) {
    const a = vs[i];
    const b = vs[(i + 1) % n];
    if (Math.hypot(b.x - a.x, b.y - a.y) <= 1e-9 * (scale || 1)) {
      throw new ModelError(
        formatPath([path, (i + 1) % n]),
        `vertices ${i + 1} and ${((i + 1) % n) + 1} are at the same place (${fmt(a.x)}, ${fmt(a.y)}): a zero-length edge`,
        'remove the repeated vertex (the loop closes itself; do not repeat the first vertex at the end)',
      );
    }
  }
  // Fillet trims: at vertex i with radius r, the tangent points lie d_i along both neighbouring edges.
  const trim = new Float64Array(n);
  const filletArcs: (Curve | null)[] = new Array(n).fill(null);
  for (let i = 0; i < n; i++) {
    const r = vs[i].round;
    if (r === undefined) continue;
    const prev = vs[(i - 1 + n) % n];
    const v = vs[i];
    const next = vs[(i + 1) % n];
    if (prev.arc || v.arc) {
      throw new ModelError(formatPath([path, i, 'round']), `${where(i)}: rounding needs straight edges on both sides of the corner`, 'draw the fillet as an arc edge instead');
    }
    const l1 = Math.hypot(prev.x - v.x, prev.y - v.y);
    const l2 = Math.hypot(next.x - v.x, next.y - v.y);
    const u1x = (prev.x - v.x) / l1;
    const u1y = (prev.y - v.y) / l1;
    const u2x = (next.x - v.x) / l2;
    const u2y = (next.y - v.y) / l2;
    const cosA = Math.max(-1, Math.min(1, u1x * u2x + u1y * u2y));
    const angle = Math.acos(cosA); // angle between the two edges at the vertex, (0, pi)
    if (angle > Math.PI - 1e-9) {
      throw new ModelError(formatPath([path, i, 'round']), `${where(i)}: the edges are in line, there is no corner to round`, 'remove "round" from this vertex');
    }
    const d = r / Math.tan(angle / 2);
    trim[i] = d;
    const bx = u1x + u2x;
    const by = u1y + u2y;
    const bl = Math.hypot(bx, by);
    const dist = r / Math.sin(angle / 2);
    const cx = v.x + (bx / bl) * dist;
    const cy = v.y + (by / bl) * dist;
    const t1x = v.x + u1x * d;
    const t1y = v.y + u1y * d;
    const t2x = v.x + u2x * d;
    const t2y = v.y + u2y * d;
    const a0 = Math.atan2(t1y - cy, t1x - cx);
    const a1 = Math.atan2(t2y - cy, t2x - cx);
    // The short way round from the first tangent point to the second.
    let sweep = a1 - a0;
    while (sweep > Math.PI) sweep -= 2 * Math.PI;
    while (sweep < -Math.PI) sweep += 2 * Math.PI;
    filletArcs[i] = { kind: 'arc', cx, cy, r, a0, sweep };
  }
  for (let i = 0; i < n; i++) {
    const a = vs[i];
    const b = vs[(i + 1) % n];
    const len = Math.hypot(b.x - a.x, b.y - a.y);
    const used = trim[i] + trim[(i + 1) % n];
    if (used > len * (1 + 1e-9)) {
      const j = trim[i] > trim[(i + 1) % n] ? i : (i + 1) % n;
      throw new ModelError(
        formatPath([path, j, 'round']),
        `${edgeName(i)} is ${fmt(len)} long, but the roundings at its ends need ${fmt(used)} of it`,
        'use smaller radii at its corners',
      );
    }
  }
  const out: RawEdge[] = [];
  for (let i = 0; i < n; i++) {
    const a = vs[i];
    const b = vs[(i + 1) % n];
    const tags = [...loopTags, ...(a.edge ? [a.edge] : [])];
    const source = formatPath([path, i]);
    const label = a.edge ? `edge "${a.edge}"` : edgeName(i);
    if (filletArcs[i]) {
      out.push({ curve: filletArcs[i]!, tags: [...loopTags], label: `fillet at ${where(i)}`, feature: `fillet at ${where(i)}`, source: formatPath([path, i, 'round']) });
    }
    if (a.arc) {
      const curve = buildArc(a.x, a.y, b.x, b.y, a.arc, `${source}.arc`, scale || 1);
      const arcName = a.edge ? `arc "${a.edge}" (${edgeName(i)})` : `arc ${edgeName(i)}`;
      out.push({ curve, tags, label: arcName, feature: isOutline ? arcName : loopLabel, source: `${source}.arc` });
    } else {
      const len = Math.hypot(b.x - a.x, b.y - a.y);
      const ux = (b.x - a.x) / len;
      const uy = (b.y - a.y) / len;
      const s0 = trim[i];
      const s1 = len - trim[(i + 1) % n];
      if (s1 - s0 > 1e-12 * len) {
        out.push({
          curve: { kind: 'line', x0: a.x + ux * s0, y0: a.y + uy * s0, x1: a.x + ux * s1, y1: a.y + uy * s1 },
          tags,
          label,
          feature: isOutline ? label : loopLabel,
          source,
        });
      }
    }
  }
  return out;
}
