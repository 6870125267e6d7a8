/**
 * Standard stress-raiser families as templates. Each template is a function from a few
 * dimensions to an ordinary Model: plain data, valid against the schema, with a note that says
 * how it was generated and a `chart` record { family, dims } that links it to the published
 * chart family it was built for. Symmetry is used wherever the loading allows, and the note
 * says which part is modelled.
 *
 * Coordinates: x along the load (the bar or plate axis), y across it, y up. Edge tags used by
 * the templates:
 *   "load"   the loaded end(s)
 *   "sym-x"  a mirror edge on x = 0 (x-displacement held)
 *   "sym-y"  a mirror edge on y = 0 (y-displacement held)
 *   "end"    a held end (x-displacement held, free across)
 *   "hole", "notch", "fillet"   the stress raiser itself
 *
 * The registry (TEMPLATES) lists each template's parameters for a `raiser new <template>
 * --param value` command; expandTemplate() takes those values as text or numbers.
 */
import { checkModel } from './checks.js';
import { InternalError, ModelError } from './errors.js';
import { FORCE_UNITS, LENGTH_UNITS, Model, type Load } from './schema.js';
import { didYouMean, quoteList } from './suggest.js';
import { type ForceUnit, type LengthUnit, resolveUnits } from './units.js';

export interface TemplateParam {
  name: string;
  meaning: string;
  /** the default: a number, a choice, or a rule in words such as "4 W" */
  default: number | string;
  /** 'length' and 'stress' are in the model's units (mm and MPa unless the unit parameters say otherwise) */
  quantity: 'length' | 'stress' | 'ratio' | 'choice';
  /** the unit of the default, as printed: "mm", "MPa", "" */
  unit: string;
  choices?: readonly string[];
  /** other names accepted for it on the command line (--width for --W) */
  aliases?: readonly string[];
}

export interface TemplateInfo {
  name: string;
  description: string;
  params: readonly TemplateParam[];
}

/** The chart families the templates link to (chart.family), with what the family means. */
export const CHART_FAMILIES = {
  'plate-with-hole-tension': 'central circular hole of diameter d in a strip of width W, uniaxial tension along the strip',
  'plate-with-elliptical-hole-tension': 'central elliptical hole, semi-axis a across the load and b along it, in a strip of width W, uniaxial tension',
  'stepped-bar-tension': 'flat bar stepping from width D to width d with shoulder fillets of radius r, axial tension',
  'stepped-bar-bending': 'flat bar stepping from width D to width d with shoulder fillets of radius r, in-plane bending',
  'u-notched-bar-tension': 'flat bar of width H with two opposite U-notches of depth t and root radius r, axial tension',
  'edge-notched-bar-tension': 'flat bar of width H with one U-notch of depth t and root radius r on one edge, axial tension',
  'pin-loaded-lug': 'lug of width W with a round end, hole of diameter d at distance e from its end, pulled through a rigid pin in the hole',
  'pin-loaded-lug-square': 'lug of width W with a square end, hole of diameter d at distance e from its end, pulled through a rigid pin in the hole',
  'bearing-loaded-lug': 'lug of width W with a round end, hole of diameter d at distance e from its end, loaded by the cosine bearing pressure of a close-fitting pin',
  'bearing-loaded-lug-square': 'lug of width W with a square end, hole of diameter d at distance e from its end, loaded by the cosine bearing pressure of a close-fitting pin',
  'pin-link': 'link plate of width W with two holes of diameter d a pitch p apart, pulled apart through rigid pins in the holes',
} as const;
export type ChartFamily = keyof typeof CHART_FAMILIES;

// ---------------------------------------------------------------------------------------------
// Parameters shared by every template.

const COMMON_PARAMS: readonly TemplateParam[] = [
  { name: 'thickness', meaning: 'plate thickness', default: 10, quantity: 'length', unit: 'mm' },
  { name: 'E', meaning: "Young's modulus (Kt does not depend on it)", default: '210 GPa in the stress unit (210000 MPa)', quantity: 'stress', unit: 'MPa' },
  { name: 'nu', meaning: "Poisson's ratio (Kt in plane stress does not depend on it)", default: 0.3, quantity: 'ratio', unit: '' },
  { name: 'length-unit', meaning: 'length unit of the model', default: 'mm', quantity: 'choice', unit: '', choices: LENGTH_UNITS },
  { name: 'force-unit', meaning: 'force unit of the model (stress is force / length^2)', default: 'N', quantity: 'choice', unit: '', choices: FORCE_UNITS },
];

export interface CommonParams {
  thickness?: number;
  E?: number;
  nu?: number;
  lengthUnit?: LengthUnit;
  forceUnit?: ForceUnit;
}

interface Common {
  thickness: number;
  E: number;
  /** E was not given, so it is the steel-like default */
  defaultE: boolean;
  nu: number;
  units: ReturnType<typeof resolveUnits>;
}

function resolveCommon(p: CommonParams): Common {
  const units = resolveUnits({ length: p.lengthUnit, force: p.forceUnit });
  const E = p.E ?? Number((210e9 / units.toSI.stress).toPrecision(4));
  const thickness = p.thickness ?? 10;
  const nu = p.nu ?? 0.3;
  requirePositive('thickness', 'plate thickness', thickness);
  requirePositive('E', "Young's modulus E", E);
  if (!(nu >= 0 && nu < 0.5)) throw new ModelError('nu', `Poisson's ratio nu = ${nu} must be at least 0 and less than 0.5`, 'structural metals are about 0.27 to 0.34');
  return { thickness, E, defaultE: p.E === undefined, nu, units };
}

function requirePositive(name: string, what: string, v: number): void {
  if (!(Number.isFinite(v) && v > 0)) throw new ModelError(name, `${what} ${name} = ${v} must be a positive number`, `give --${name} a value greater than 0`);
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

/** The parts shared by every generated model. */
function baseModel(c: Common, title: string, note: string): Pick<Model, 'title' | 'note' | 'units' | 'material' | 'thickness' | 'state'> {
  return {
    title,
    note: note.trim(),
    units: { length: c.units.length, force: c.units.force },
    material: c.defaultE ? { name: 'generic steel, E = 210 GPa (Kt does not depend on E, nor in plane stress on nu)', E: c.E, nu: c.nu } : { E: c.E, nu: c.nu },
    thickness: c.thickness,
    state: 'plane-stress',
  };
}

/** Validates what a template built; a failure here is a fault in the template, not in the input. */
function finish(model: Model): Model {
  const parsed = Model.safeParse(model);
  if (!parsed.success) throw new InternalError(`template output fails the schema: ${JSON.stringify(parsed.error.issues)}`);
  const out = parsed.data as Model; // a template always writes E and nu
  const { errors } = checkModel(out);
  if (errors.length) throw new InternalError(`template output fails the model checks: ${errors.map((e) => e.message).join('; ')}`);
  return out;
}

const GENERATED = 'Generated by the raiser template';

interface PathVertex {
  at: [number, number];
  edge: string;
  arc?: { center: [number, number]; turn: 'cw' | 'ccw' };
}

// ---------------------------------------------------------------------------------------------
// plate-with-hole

export interface PlateWithHoleParams extends CommonParams {
  /** plate width */
  W?: number;
  /** hole diameter */
  d?: number;
  /** plate length (default 4 W) */
  L?: number;
  /** remote tensile stress, gross (on the full width) */
  stress?: number;
}

/**
 * Quarter of a plate W wide and L long with a central hole of diameter d, pulled along x.
 * Modelled: 0 <= x <= L/2, 0 <= y <= W/2, minus the hole quadrant.
 *
 *   y
 *   W/2 +-----------------------+
 *       |        (top, free)    |
 *  sym-x|                       | load (normal traction = stress)
 *       |_                      |
 *   d/2  ) hole                 |
 *       +-+---------------------+-- x
 *         d/2     sym-y         L/2
 */
export function plateWithHole(p: PlateWithHoleParams = {}): Model {
  const c = resolveCommon(p);
  const W = p.W ?? 100;
  const d = p.d ?? 20;
  requirePositive('W', 'plate width', W);
  requirePositive('d', 'hole diameter', d);
  const L = p.L ?? 4 * W;
  requirePositive('L', 'plate length', L);
  const stress = p.stress ?? 100;
  if (d >= W) throw new ModelError('d', `the hole diameter d = ${d} must be less than the plate width W = ${W}`, 'make d smaller or W larger');
  if (d >= L) throw new ModelError('L', `the plate length L = ${L} must be more than the hole diameter d = ${d}`, `the default L = 4 W keeps the ends far from the hole`);
  const a = d / 2;
  const u = c.units;
  const note =
    `${GENERATED} "plate-with-hole" (W = ${fmt(W)}, d = ${fmt(d)}, L = ${fmt(L)} ${u.length}; remote stress ${fmt(stress)} ${u.stress}). ` +
    'Quarter model: the plate is symmetric about x = 0 and y = 0, so only x >= 0, y >= 0 is modelled, with symmetry supports on the edges "sym-x" (on x = 0) and "sym-y" (on y = 0). ' +
    `The remote tensile stress acts along x as a normal traction on the edge "load" at x = L/2${p.L === undefined ? '; L = 4 W keeps the loaded end far from the hole' : ''}. ` +
    `The hole edge is tagged "hole". Nominal stress: gross = ${fmt(stress)}, net = stress W / (W - d) = ${fmt((stress * W) / (W - d))} ${u.stress}.`;
  return finish({
    ...baseModel(c, `Plate with a central hole, d/W = ${fmt(d / W)} (quarter model)`, note),
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [a, 0], edge: 'sym-y' },
          { at: [L / 2, 0], edge: 'load' },
          { at: [L / 2, W / 2], edge: 'top' },
          { at: [0, W / 2], edge: 'sym-x' },
          { at: [0, a], edge: 'hole', arc: { center: [0, 0], turn: 'cw' } },
        ],
      },
    },
    supports: [
      { type: 'symmetry', on: 'sym-x' },
      { type: 'symmetry', on: 'sym-y' },
    ],
    loads: [{ type: 'traction', on: 'load', normal: stress }],
    chart: { family: 'plate-with-hole-tension', dims: { W, d, L, thickness: c.thickness } },
  });
}

// ---------------------------------------------------------------------------------------------
// plate-with-elliptical-hole

export interface PlateWithEllipticalHoleParams extends CommonParams {
  W?: number;
  /** semi-axis across the load (along y) */
  a?: number;
  /** semi-axis along the load (along x) */
  b?: number;
  L?: number;
  stress?: number;
}

/**
 * A plate W wide and L long with a central elliptical hole, semi-axis a across the load (y)
 * and b along it (x), pulled along x. Full model: the format has circular-arc edges but no
 * elliptical-arc edges, so an ellipse can only be a whole hole, and the symmetry lines cannot
 * cut it. Rigid motion is stopped by two pins on the axis y = 0 at the ends: (-L/2, 0) held in
 * x and y, (L/2, 0) held in y. The loads balance, so the pins carry no force.
 */
export function plateWithEllipticalHole(p: PlateWithEllipticalHoleParams = {}): Model {
  const c = resolveCommon(p);
  const W = p.W ?? 100;
  const a = p.a ?? 10;
  const b = p.b ?? 5;
  requirePositive('W', 'plate width', W);
  requirePositive('a', 'semi-axis across the load', a);
  requirePositive('b', 'semi-axis along the load', b);
  const L = p.L ?? 4 * W;
  requirePositive('L', 'plate length', L);
  const stress = p.stress ?? 100;
  if (2 * a >= W) throw new ModelError('a', `the hole width 2a = ${fmt(2 * a)} must be less than the plate width W = ${W}`, 'make a smaller or W larger');
  if (2 * b >= L) throw new ModelError('L', `the plate length L = ${L} must be more than the hole length 2b = ${fmt(2 * b)}`, 'the default L = 4 W keeps the ends far from the hole');
  const u = c.units;
  const note =
    `${GENERATED} "plate-with-elliptical-hole" (W = ${fmt(W)}, a = ${fmt(a)} across the load, b = ${fmt(b)} along it, L = ${fmt(L)} ${u.length}; remote stress ${fmt(stress)} ${u.stress}). ` +
    'Full model: the format has no elliptical-arc edges, so the symmetry lines cannot cut the hole. ' +
    'The remote tensile stress acts along x as a normal traction on both ends (tag "load"); pins at (-L/2, 0) (x and y) and (L/2, 0) (y) stop rigid motion and carry no force. ' +
    `The hole is tagged "hole". Nominal stress: gross = ${fmt(stress)}, net = stress W / (W - 2a) = ${fmt((stress * W) / (W - 2 * a))} ${u.stress}.`;
  return finish({
    ...baseModel(c, `Plate with a central elliptical hole, a/b = ${fmt(a / b)} (full model)`, note),
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [-L / 2, -W / 2], edge: 'bottom' },
          { at: [L / 2, -W / 2], edge: 'load' },
          { at: [L / 2, W / 2], edge: 'top' },
          { at: [-L / 2, W / 2], edge: 'load' },
        ],
      },
      holes: [{ shape: 'ellipse', center: [0, 0], a, b, angle: 90, tag: 'hole', name: 'elliptical hole' }],
    },
    supports: [
      { type: 'pin', at: [-L / 2, 0], fix: 'xy' },
      { type: 'pin', at: [L / 2, 0], fix: 'y' },
    ],
    loads: [{ type: 'traction', on: 'load', normal: stress }],
    chart: { family: 'plate-with-elliptical-hole-tension', dims: { W, a, b, L, thickness: c.thickness } },
  });
}

// ---------------------------------------------------------------------------------------------
// stepped-bar

export interface SteppedBarParams extends CommonParams {
  /** wide width */
  D?: number;
  /** narrow width */
  d?: number;
  /** shoulder fillet radius */
  r?: number;
  /** length of the wide part, from its end to the shoulder (default 2 D) */
  wideLength?: number;
  /** length of the narrow part, from the shoulder to its end (default 2 d + r) */
  narrowLength?: number;
  loading?: 'tension' | 'bending';
  /** nominal stress in the narrow part: P/(d h) in tension, 6M/(h d^2) in bending */
  stress?: number;
}

/**
 * Where the fillet leaves the shoulder. The fillet is a quarter circle of radius r tangent to
 * the narrow edge, centred r beyond the shoulder plane and r outside the narrow edge. When r
 * exceeds the step height t = (D - d)/2 the arc meets the wide edge before it reaches the
 * shoulder plane, at x = r - sqrt(r^2 - (r - t)^2), with a corner there; there is then no
 * straight shoulder face.
 */
function filletMeetsWide(r: number, t: number): number {
  return r <= t ? 0 : r - Math.sqrt(r * r - (r - t) * (r - t));
}

/**
 * A flat bar stepping from width D (x < 0) to width d (x > 0) with shoulder fillets of radius
 * r at x = 0. Tension: the upper half (y >= 0), symmetric about the axis. Bending: the whole
 * bar, since in-plane bending is antisymmetric about the axis (see the note).
 *
 *        D/2 +--------------+  shoulder
 *            |  wide part   |__
 *   end (x   |                 \_ fillet (r)
 *   held)    |                   +-------------------+ d/2
 *            |                     narrow part       | load
 *          0 +---------------------------------------+
 *          -wideLength      0        axis (sym-y)    narrowLength
 */
export function steppedBar(p: SteppedBarParams = {}): Model {
  const c = resolveCommon(p);
  const D = p.D ?? 60;
  const d = p.d ?? 40;
  const r = p.r ?? 4;
  requirePositive('D', 'wide width', D);
  requirePositive('d', 'narrow width', d);
  requirePositive('r', 'fillet radius', r);
  const loading = p.loading ?? 'tension';
  if (loading !== 'tension' && loading !== 'bending') {
    throw new ModelError('loading', `loading "${loading}" is not one of "tension" or "bending"${didYouMean(loading, ['tension', 'bending'])}`);
  }
  if (d >= D) throw new ModelError('d', `the narrow width d = ${d} must be less than the wide width D = ${D}`, 'a stepped bar narrows from D to d');
  const t = (D - d) / 2;
  const Lw = p.wideLength ?? 2 * D;
  const Ln = p.narrowLength ?? 2 * d + r;
  requirePositive('wide-length', 'length of the wide part', Lw);
  requirePositive('narrow-length', 'length of the narrow part', Ln);
  if (Ln <= r) throw new ModelError('narrow-length', `the narrow part (${fmt(Ln)} long) must be longer than the fillet radius r = ${r}`, 'the default is 2 d + r');
  const stress = p.stress ?? 100;
  const xs = filletMeetsWide(r, t);
  const u = c.units;
  const h = c.thickness;

  // The upper contour, travelled from the narrow end back to the wide edge (counter-clockwise
  // in the outline): narrow edge, fillet arc (clockwise about its centre: the material is
  // outside its circle), shoulder face if the fillet leaves one, then the wide edge.
  const upper: PathVertex[] = [
    { at: [Ln, d / 2], edge: 'narrow-edge' },
    { at: [r, d / 2], edge: 'fillet', arc: { center: [r, d / 2 + r], turn: 'cw' } },
  ];
  if (r < t) upper.push({ at: [0, d / 2 + r], edge: 'shoulder' });
  upper.push({ at: [xs, D / 2], edge: 'wide-edge' });

  const dims = { D, d, r, wideLength: Lw, narrowLength: Ln, thickness: h };
  const head = `${GENERATED} "stepped-bar" (D = ${fmt(D)}, d = ${fmt(d)}, r = ${fmt(r)}, wide part ${fmt(Lw)}, narrow part ${fmt(Ln)} ${u.length}; ${loading}). `;
  const shape =
    r <= t
      ? 'The fillet is a quarter circle tangent to the narrow edge and to the shoulder face (tag "fillet"). '
      : `The fillet radius exceeds the step height (D - d)/2 = ${fmt(t)}, so the fillet arc (tag "fillet"), tangent to the narrow edge, meets the wide edge at a corner at x = ${fmt(xs)}. `;
  const ends =
    'Both ends are at least two widths from the shoulder: the disturbance of a shoulder dies out along a strip like exp(-4.21 x / width) ' +
    '(the slowest self-equilibrated end state of a strip, from the root 2.106 + 1.125i of sin 2z + 2z = 0, z in half-widths), so at two widths it is below 0.03 %. ';

  if (loading === 'tension') {
    const note =
      head +
      'Half model: the bar is symmetric about its axis y = 0, so only y >= 0 is modelled, with a symmetry support on the axis (tag "sym-y"). ' +
      'The wide end (tag "end") is held in x and free in y; the narrow end (tag "load") carries a normal traction equal to the nominal stress ' +
      `P/(d h) = ${fmt(stress)} ${u.stress}. ` +
      shape +
      ends;
    return finish({
      ...baseModel(c, `Stepped bar in tension, D/d = ${fmt(D / d)}, r/d = ${fmt(r / d)} (half model)`, note),
      geometry: {
        outline: {
          shape: 'path',
          path: [{ at: [-Lw, 0], edge: 'sym-y' }, { at: [Ln, 0], edge: 'load' }, ...upper, { at: [-Lw, D / 2], edge: 'end' }],
        },
      },
      supports: [
        { type: 'symmetry', on: 'sym-y' },
        { type: 'roller', fix: 'x', on: 'end' },
      ],
      loads: [{ type: 'traction', on: 'load', normal: stress }],
      chart: { family: 'stepped-bar-tension', dims },
    });
  }

  // Bending: the lower contour, the mirror image of the upper one, travelled from the wide end
  // to the narrow end.
  const lower: PathVertex[] = [{ at: [-Lw, -D / 2], edge: 'wide-edge' }];
  if (r < t) lower.push({ at: [0, -D / 2], edge: 'shoulder' });
  lower.push({ at: r < t ? [0, -d / 2 - r] : [xs, -D / 2], edge: 'fillet', arc: { center: [r, -d / 2 - r], turn: 'cw' } });
  lower.push({ at: [r, -d / 2], edge: 'narrow-edge' });
  lower.push({ at: [Ln, -d / 2], edge: 'load' });
  const M = (stress * h * d * d) / 6;
  const note =
    head +
    'Full model: in-plane bending is antisymmetric about the axis, so a mirror support there would be wrong, and the whole bar is modelled. ' +
    'The wide end (tag "end") is held in x and free in y, and a pin at (-wideLength, 0) holds it in y; ' +
    `the narrow end (tag "load") carries the in-plane moment M = ${fmt(M)} ${u.moment}, counter-clockwise, which puts the lower edge in tension; nominal stress 6M/(h d^2) = ${fmt(stress)} ${u.stress}. ` +
    shape +
    ends;
  return finish({
    ...baseModel(c, `Stepped bar in bending, D/d = ${fmt(D / d)}, r/d = ${fmt(r / d)} (full model)`, note),
    geometry: { outline: { shape: 'path', path: [...lower, ...upper, { at: [-Lw, D / 2], edge: 'end' }] } },
    supports: [
      { type: 'roller', fix: 'x', on: 'end' },
      { type: 'pin', at: [-Lw, 0], fix: 'y' },
    ],
    loads: [{ type: 'moment', on: 'load', m: M }],
    chart: { family: 'stepped-bar-bending', dims },
  });
}

// ---------------------------------------------------------------------------------------------
// U-notches

export interface NotchedBarParams extends CommonParams {
  /** full width of the bar */
  H?: number;
  /** notch depth */
  t?: number;
  /** notch root radius */
  r?: number;
  /** bar length (default 4 H) */
  L?: number;
  /** remote tensile stress on the ends, gross (on the full width H) */
  stress?: number;
}

/**
 * The right half of a notch centred on x = 0 that opens from the edge y = edgeY towards -y,
 * from the notch mouth down to (but not including) the root point (0, edgeY - t).
 *
 * t >= r: a U-notch, straight flanks 2r apart ending in a semicircular root of radius r (for
 * t = r the flanks vanish and the notch is a half circle).
 * t < r: a U-notch of that depth cannot have a semicircular root, so the notch is a circular
 * arc of radius r and depth t (a shallow circular notch, continuous with the U-notch at t = r).
 * Returns the vertices and the half-width of the notch mouth.
 */
function notchHalf(edgeY: number, t: number, r: number): { vertices: PathVertex[]; mouth: number } {
  const cy = edgeY - t + r;
  if (t > r) {
    return {
      vertices: [
        { at: [r, edgeY], edge: 'notch' },
        { at: [r, cy], edge: 'notch', arc: { center: [0, cy], turn: 'cw' } },
      ],
      mouth: r,
    };
  }
  const x0 = t === r ? r : Math.sqrt(r * r - (r - t) * (r - t));
  return { vertices: [{ at: [x0, edgeY], edge: 'notch', arc: { center: [0, cy], turn: 'cw' } }], mouth: x0 };
}

function notchShapeWords(t: number, r: number): string {
  if (t > r) return 'U-notch: straight flanks 2r apart ending in a semicircular root of radius r';
  if (t === r) return 'semicircular notch (depth equal to the root radius)';
  return 'shallow circular notch: a circular arc of radius r and depth t (a U-notch needs t >= r)';
}

function notchParams(p: NotchedBarParams) {
  const H = p.H ?? 60;
  const t = p.t ?? 10;
  const r = p.r ?? 2;
  requirePositive('H', 'bar width', H);
  requirePositive('t', 'notch depth', t);
  requirePositive('r', 'notch root radius', r);
  const L = p.L ?? 4 * H;
  requirePositive('L', 'bar length', L);
  return { H, t, r, L, stress: p.stress ?? 100 };
}

/**
 * Quarter of a bar H wide and L long with two opposite notches at x = 0 (on y = +H/2 and
 * y = -H/2), pulled along x. Modelled: 0 <= x <= L/2, 0 <= y <= H/2 minus half of the upper notch.
 *
 *   H/2 +---.  .--------------------+
 *       |   |__| notch (t, r)       |
 *  sym-x|                           | load
 *   0   +---------------------------+
 *                sym-y              L/2
 */
export function uNotchedBar(p: NotchedBarParams = {}): Model {
  const c = resolveCommon(p);
  const { H, t, r, L, stress } = notchParams(p);
  if (2 * t >= H) throw new ModelError('t', `two notches of depth t = ${t} leave no material across the width H = ${H}: 2t must be less than H`, `use t < ${fmt(H / 2)}`);
  const notch = notchHalf(H / 2, t, r);
  if (notch.mouth >= L / 2) throw new ModelError('L', `the bar length L = ${L} is too short for a notch ${fmt(2 * notch.mouth)} wide at its mouth`, 'the default L = 4 H keeps the ends far from the notches');
  const u = c.units;
  const dNet = H - 2 * t;
  const note =
    `${GENERATED} "u-notched-bar" (H = ${fmt(H)}, t = ${fmt(t)}, r = ${fmt(r)}, L = ${fmt(L)} ${u.length}; remote stress ${fmt(stress)} ${u.stress}). ` +
    `Two opposite notches, each a ${notchShapeWords(t, r)}. ` +
    'Quarter model: the bar is symmetric about x = 0 (the notch plane) and y = 0 (the axis), so only x >= 0, y >= 0 is modelled, with symmetry supports on "sym-x" (on x = 0) and "sym-y" (on y = 0). ' +
    `The far end (tag "load", x = L/2) carries a normal traction equal to the remote stress; the notch edge is tagged "notch". ` +
    `Net width d = H - 2t = ${fmt(dNet)}; nominal stress: gross = ${fmt(stress)}, net = stress H / d = ${fmt((stress * H) / dNet)} ${u.stress}.`;
  return finish({
    ...baseModel(c, `Bar with opposite notches, 2t/H = ${fmt((2 * t) / H)}, t/r = ${fmt(t / r)} (quarter model)`, note),
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [0, 0], edge: 'sym-y' },
          { at: [L / 2, 0], edge: 'load' },
          { at: [L / 2, H / 2], edge: 'top' },
          ...notch.vertices,
          { at: [0, H / 2 - t], edge: 'sym-x' },
        ],
      },
    },
    supports: [
      { type: 'symmetry', on: 'sym-x' },
      { type: 'symmetry', on: 'sym-y' },
    ],
    loads: [{ type: 'traction', on: 'load', normal: stress }],
    chart: { family: 'u-notched-bar-tension', dims: { H, t, r, L, thickness: c.thickness } },
  });
}

/**
 * Half of a bar H wide and L long with one notch at x = 0 on the upper edge, pulled along x.
 * Modelled: 0 <= x <= L/2, -H/2 <= y <= H/2 minus half of the notch. The notch plane x = 0 is a
 * mirror (tag "sym-x"); it stops x-motion and rotation, and one pin at (0, -H/2) stops the
 * remaining motion across the bar.
 *
 *   H/2  +---.  .-----------------+
 *        |   |__| notch           |
 *   sym-x|                        | load
 *  -H/2  +------------------------+
 *        pin (y)                  L/2
 */
export function edgeNotchedBar(p: NotchedBarParams = {}): Model {
  const c = resolveCommon(p);
  const { H, t, r, L, stress } = notchParams(p);
  if (t >= H) throw new ModelError('t', `a notch of depth t = ${t} leaves no material across the width H = ${H}`, `use t < ${fmt(H)}`);
  const notch = notchHalf(H / 2, t, r);
  if (notch.mouth >= L / 2) throw new ModelError('L', `the bar length L = ${L} is too short for a notch ${fmt(2 * notch.mouth)} wide at its mouth`, 'the default L = 4 H keeps the ends far from the notch');
  const u = c.units;
  const dNet = H - t;
  const note =
    `${GENERATED} "edge-notched-bar" (H = ${fmt(H)}, t = ${fmt(t)}, r = ${fmt(r)}, L = ${fmt(L)} ${u.length}; remote stress ${fmt(stress)} ${u.stress}). ` +
    `One notch on the upper edge, a ${notchShapeWords(t, r)}. ` +
    'Half model: the bar is symmetric about the notch plane x = 0, so only x >= 0 is modelled, with a symmetry support on "sym-x" and one pin at (0, -H/2) held in y against motion across the bar. ' +
    'The far end (tag "load", x = L/2) carries a uniform normal traction equal to the remote stress and is free to rotate, so the net section carries the load off its centre line and bends as well as stretches. ' +
    `Net width d = H - t = ${fmt(dNet)}; nominal stress: gross = ${fmt(stress)}, net (tension only) = stress H / d = ${fmt((stress * H) / dNet)} ${u.stress}.`;
  return finish({
    ...baseModel(c, `Bar with one edge notch, t/H = ${fmt(t / H)}, t/r = ${fmt(t / r)} (half model)`, note),
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [0, -H / 2], edge: 'bottom' },
          { at: [L / 2, -H / 2], edge: 'load' },
          { at: [L / 2, H / 2], edge: 'top' },
          ...notch.vertices,
          { at: [0, H / 2 - t], edge: 'sym-x' },
        ],
      },
    },
    supports: [
      { type: 'symmetry', on: 'sym-x' },
      { type: 'pin', at: [0, -H / 2], fix: 'y' },
    ],
    loads: [{ type: 'traction', on: 'load', normal: stress }],
    chart: { family: 'edge-notched-bar-tension', dims: { H, t, r, L, thickness: c.thickness } },
  });
}


// ---------------------------------------------------------------------------------------------
// lug and link: parts loaded through pins in holes (src/fem/pins.ts, src/fem/contact.ts)

export interface LugParams extends CommonParams {
  /** width of the shank and the end */
  W?: number;
  /** hole diameter */
  d?: number;
  /** distance from the hole centre to the end of the lug (default W/2: a round end concentric with the hole) */
  e?: number;
  /** shank length from the hole centre to the held end (default 3 W) */
  L?: number;
  end?: 'round' | 'square';
  /** diametral clearance of the pin, hole diameter less pin diameter (default 0) */
  clearance?: number;
  /** direction of the pin force from the lug axis, degrees counter-clockwise (default 0: straight away from the shank) */
  angle?: number;
  /** net-section nominal stress F / ((W - d) t) that sets the pin force (default 100) */
  stress?: number;
  /** 'pin': a rigid pin in frictionless contact (default); 'bearing': the cosine bearing pressure */
  load?: 'pin' | 'bearing';
}

/**
 * A lug: a straight shank of width W along -x, held at x = -L, ending at x = e beyond the
 * centre of a hole of diameter d at the origin, in a round end (a half circle of radius W/2
 * centred at x = e - W/2; e = W/2 makes it concentric with the hole) or a square one. A rigid pin
 * in the hole pulls it with the force F at `angle` from the axis; F = stress (W - d) t, so that
 * the net nominal stress F / ((W - d) t) of an axial pull is `stress`.
 *
 *        +-------------------------.
 *  held  |                   _      \     round end (or square, to x = e)
 *  x=-L  |                  (  )-> F  )
 *        |                            /
 *        +-------------------------'
 *                           0      e
 */
export function lug(p: LugParams = {}): Model {
  const c = resolveCommon(p);
  const W = p.W ?? 40;
  const d = p.d ?? 20;
  requirePositive('W', 'lug width', W);
  requirePositive('d', 'hole diameter', d);
  const e = p.e ?? W / 2;
  const L = p.L ?? 3 * W;
  requirePositive('e', 'distance from the hole centre to the end', e);
  requirePositive('L', 'shank length', L);
  const end = p.end ?? 'round';
  const clearance = p.clearance ?? 0;
  const angle = p.angle ?? 0;
  const stress = p.stress ?? 100;
  const loadKind = p.load ?? 'pin';
  if (d >= W) throw new ModelError('d', `the hole diameter d = ${d} must be less than the lug width W = ${W}`, 'make d smaller or W larger');
  if (e <= d / 2) throw new ModelError('e', `the hole (radius ${fmt(d / 2)}) reaches past the end of the lug at e = ${e}`, `use e > d/2 = ${fmt(d / 2)}`);
  if (end === 'round' && e < W / 2) throw new ModelError('e', `a round end of radius W/2 = ${fmt(W / 2)} needs e >= W/2; found e = ${e}`, 'use --end square for a shorter end, or a larger e');
  if (L <= d / 2) throw new ModelError('L', `the shank length L = ${L} must exceed the hole radius ${fmt(d / 2)}`, 'the default L = 3 W keeps the held end far from the hole');
  if (!(clearance >= 0)) throw new ModelError('clearance', `the clearance ${clearance} must be at least 0`, 'the diametral clearance is the hole diameter less the pin diameter; 0 for a close fit');
  if (clearance >= d) throw new ModelError('clearance', `a clearance of ${clearance} leaves no pin in a hole of diameter ${d}`, 'the clearance is usually a small fraction of d');
  if (loadKind === 'bearing' && clearance > 0) throw new ModelError('clearance', 'a bearing pressure has no clearance: it is the idealised pressure of a close fit', 'use --load pin for a pin with clearance');
  const t = c.thickness;
  const F = stress * (W - d) * t;
  const a = (angle * Math.PI) / 180;
  const force: [number, number] = [F * Math.cos(a), F * Math.sin(a)];
  const u = c.units;
  const path: PathVertex[] =
    end === 'round'
      ? [
          { at: [-L, -W / 2], edge: 'side' },
          { at: [e - W / 2, -W / 2], edge: 'end', arc: { center: [e - W / 2, 0], turn: 'ccw' } },
          { at: [e - W / 2, W / 2], edge: 'side' },
          { at: [-L, W / 2], edge: 'held' },
        ]
      : [
          { at: [-L, -W / 2], edge: 'side' },
          { at: [e, -W / 2], edge: 'end' },
          { at: [e, W / 2], edge: 'side' },
          { at: [-L, W / 2], edge: 'held' },
        ];
  const pinWords = loadKind === 'pin' ? `a rigid pin in frictionless contact (${clearance > 0 ? `diametral clearance ${fmt(clearance)} ${u.length}` : 'close fit'})` : 'the cosine bearing pressure of an idealised close-fitting pin';
  const note =
    `${GENERATED} "lug" (W = ${fmt(W)}, d = ${fmt(d)}, e = ${fmt(e)}, L = ${fmt(L)} ${u.length}, ${end} end; pin force ${fmt(F)} ${u.force} at ${fmt(angle)} deg from the axis, ${pinWords}). ` +
    'Full model: the shank runs along -x and is held fixed at its end x = -L (tag "held"); the hole (named "pin", tag "hole") is centred at the origin. ' +
    `The force is F = stress (W - d) t with stress = ${fmt(stress)} ${u.stress}: the net nominal stress of an axial pull, F / ((W - d) t); the bearing stress is F / (d t) = ${fmt(F / (d * t))} ${u.stress}.` +
    (loadKind === 'pin' && clearance > 0 ? ' With clearance the contact arc, and so Kt, depends on the size of the load.' : '') +
    (angle !== 0 ? ' At an angle the pin bends the shank: the corners of the held end then carry a stress of the clamping, singular in theory and nothing to do with the lug; read the peak on the hole (the pins of the result).' : '');
  const loadItem: Load =
    loadKind === 'pin' ? { type: 'rigid-pin', on: { hole: 'pin' }, force, clearance } : { type: 'bearing', on: { hole: 'pin' }, force };
  return finish({
    ...baseModel(c, `Lug loaded through a pin, d/W = ${fmt(d / W)}, e/W = ${fmt(e / W)}`, note),
    geometry: {
      outline: { shape: 'path', path },
      holes: [{ shape: 'circle', center: [0, 0], diameter: d, name: 'pin', tag: 'hole' }],
    },
    supports: [{ type: 'fixed', on: 'held' }],
    loads: [loadItem],
    chart: {
      family: `${loadKind === 'pin' ? 'pin' : 'bearing'}-loaded-lug${end === 'square' ? '-square' : ''}`,
      dims: { W, d, e, L, thickness: t, clearance, angle, stress },
    },
  });
}

export interface LinkParams extends CommonParams {
  W?: number;
  d?: number;
  /** pitch: distance between the hole centres (default 3 W) */
  p?: number;
  clearance?: number;
  /** net-section nominal stress F / ((W - d) t) that sets the pull (default 100) */
  stress?: number;
}

/**
 * A link plate: width W, round ends concentric with two holes of diameter d a pitch p apart
 * on the x axis. A fixed rigid pin holds hole "A" at the origin; a rigid pin in hole "B" at
 * (p, 0) pulls the link along +x with F = stress (W - d) t. Both pins are frictionless and in
 * contact only where the holes press on them. One point support at the tip (p + W/2, 0), held
 * in y, stops the link turning about pin A; the pull passes through both pin centres, so it
 * carries no force.
 *
 *      .------------------------------.
 *     (  (A)                     (B)-> )  F
 *      '------------------------------'
 *        0                        p
 */
export function link(q: LinkParams = {}): Model {
  const c = resolveCommon(q);
  const W = q.W ?? 40;
  const d = q.d ?? 20;
  requirePositive('W', 'link width', W);
  requirePositive('d', 'hole diameter', d);
  const p = q.p ?? 3 * W;
  requirePositive('p', 'pitch of the holes', p);
  const clearance = q.clearance ?? 0;
  const stress = q.stress ?? 100;
  if (d >= W) throw new ModelError('d', `the hole diameter d = ${d} must be less than the link width W = ${W}`, 'make d smaller or W larger');
  if (p <= d) throw new ModelError('p', `holes ${fmt(p)} apart overlap: the pitch must exceed d = ${d}`, 'use a larger pitch p');
  if (!(clearance >= 0)) throw new ModelError('clearance', `the clearance ${clearance} must be at least 0`, 'the diametral clearance is the hole diameter less the pin diameter; 0 for a close fit');
  if (clearance >= d) throw new ModelError('clearance', `a clearance of ${clearance} leaves no pin in a hole of diameter ${d}`, 'the clearance is usually a small fraction of d');
  const t = c.thickness;
  const F = stress * (W - d) * t;
  const u = c.units;
  const note =
    `${GENERATED} "link" (W = ${fmt(W)}, d = ${fmt(d)}, pitch p = ${fmt(p)} ${u.length}; pull ${fmt(F)} ${u.force}, ${clearance > 0 ? `diametral clearance ${fmt(clearance)} ${u.length}` : 'close-fitting pins'}). ` +
    'Full model: a fixed rigid pin holds hole "A" at the origin, a rigid pin pulls hole "B" at (p, 0) along +x; both frictionless, in contact only where the holes press on them. ' +
    `A point support at (p + W/2, 0) held in y stops the link turning about pin A and carries no force. The pull is F = stress (W - d) t with stress = ${fmt(stress)} ${u.stress}, the net nominal stress F / ((W - d) t) at either hole.`;
  return finish({
    ...baseModel(c, `Link plate pulled through two pins, d/W = ${fmt(d / W)}`, note),
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [0, -W / 2], edge: 'side' },
          { at: [p, -W / 2], edge: 'end', arc: { center: [p, 0], turn: 'ccw' } },
          { at: [p, W / 2], edge: 'side' },
          { at: [0, W / 2], edge: 'end', arc: { center: [0, 0], turn: 'ccw' } },
        ],
      },
      holes: [
        { shape: 'circle', center: [0, 0], diameter: d, name: 'A', tag: 'hole' },
        { shape: 'circle', center: [p, 0], diameter: d, name: 'B', tag: 'hole' },
      ],
    },
    supports: [
      { type: 'rigid-pin', on: { hole: 'A' }, clearance },
      { type: 'pin', at: [p + W / 2, 0], fix: 'y' },
    ],
    loads: [{ type: 'rigid-pin', on: { hole: 'B' }, force: [F, 0], clearance }],
    chart: { family: 'pin-link', dims: { W, d, p, thickness: t, clearance, stress } },
  });
}

// ---------------------------------------------------------------------------------------------
// Registry.

const STRESS = (meaning: string): TemplateParam => ({ name: 'stress', meaning, default: 100, quantity: 'stress', unit: 'MPa' });
const LEN = (name: string, meaning: string, def: number | string, aliases?: string[]): TemplateParam => ({ name, meaning, default: def, quantity: 'length', unit: 'mm', aliases });

interface TemplateEntry extends TemplateInfo {
  build(values: Record<string, number | string>): Model;
}

function common(v: Record<string, number | string>): CommonParams {
  return {
    thickness: v.thickness as number | undefined,
    E: v.E as number | undefined,
    nu: v.nu as number | undefined,
    lengthUnit: v['length-unit'] as LengthUnit | undefined,
    forceUnit: v['force-unit'] as ForceUnit | undefined,
  };
}

const ENTRIES: readonly TemplateEntry[] = [
  {
    name: 'plate-with-hole',
    description: 'central circular hole in a plate under uniaxial tension (quarter model)',
    params: [
      LEN('W', 'plate width', 100, ['width']),
      LEN('d', 'hole diameter', 20, ['diameter']),
      LEN('L', 'plate length', '4 W', ['length']),
      STRESS('remote tensile stress on the plate ends (gross, over the width W)'),
      ...COMMON_PARAMS,
    ],
    build: (v) => plateWithHole({ ...common(v), W: v.W as number, d: v.d as number, L: v.L as number, stress: v.stress as number }),
  },
  {
    name: 'plate-with-elliptical-hole',
    description: 'central elliptical hole in a plate under uniaxial tension (full model)',
    params: [
      LEN('W', 'plate width', 100, ['width']),
      LEN('a', 'semi-axis of the hole across the load', 10),
      LEN('b', 'semi-axis of the hole along the load', 5),
      LEN('L', 'plate length', '4 W', ['length']),
      STRESS('remote tensile stress on the plate ends (gross, over the width W)'),
      ...COMMON_PARAMS,
    ],
    build: (v) => plateWithEllipticalHole({ ...common(v), W: v.W as number, a: v.a as number, b: v.b as number, L: v.L as number, stress: v.stress as number }),
  },
  {
    name: 'stepped-bar',
    description: 'flat bar stepping from width D to d with shoulder fillets, in tension (half model) or in-plane bending (full model)',
    params: [
      LEN('D', 'wide width', 60, ['wide-width']),
      LEN('d', 'narrow width', 40, ['narrow-width']),
      LEN('r', 'shoulder fillet radius', 4, ['radius', 'fillet']),
      LEN('wide-length', 'length of the wide part, end to shoulder', '2 D'),
      LEN('narrow-length', 'length of the narrow part, shoulder to end', '2 d + r'),
      { name: 'loading', meaning: 'tension, or in-plane bending by an end moment', default: 'tension', quantity: 'choice', unit: '', choices: ['tension', 'bending'] },
      STRESS('nominal stress in the narrow part: P/(d h) in tension, 6M/(h d^2) in bending'),
      ...COMMON_PARAMS,
    ],
    build: (v) =>
      steppedBar({
        ...common(v),
        D: v.D as number,
        d: v.d as number,
        r: v.r as number,
        wideLength: v['wide-length'] as number,
        narrowLength: v['narrow-length'] as number,
        loading: v.loading as 'tension' | 'bending',
        stress: v.stress as number,
      }),
  },
  {
    name: 'u-notched-bar',
    description: 'flat bar with two opposite U-notches in tension (quarter model)',
    params: [
      LEN('H', 'full width of the bar', 60, ['width']),
      LEN('t', 'depth of each notch', 10, ['depth']),
      LEN('r', 'notch root radius', 2, ['radius']),
      LEN('L', 'bar length', '4 H', ['length']),
      STRESS('remote tensile stress on the bar ends (gross, over the width H)'),
      ...COMMON_PARAMS,
    ],
    build: (v) => uNotchedBar({ ...common(v), H: v.H as number, t: v.t as number, r: v.r as number, L: v.L as number, stress: v.stress as number }),
  },
  {
    name: 'edge-notched-bar',
    description: 'flat bar with one U-notch on one edge in tension (half model)',
    params: [
      LEN('H', 'full width of the bar', 60, ['width']),
      LEN('t', 'notch depth', 10, ['depth']),
      LEN('r', 'notch root radius', 2, ['radius']),
      LEN('L', 'bar length', '4 H', ['length']),
      STRESS('remote tensile stress on the bar ends (gross, over the width H)'),
      ...COMMON_PARAMS,
    ],
    build: (v) => edgeNotchedBar({ ...common(v), H: v.H as number, t: v.t as number, r: v.r as number, L: v.L as number, stress: v.stress as number }),
  },
  {
    name: 'lug',
    description: 'lug with a straight shank and a round or square end, pulled through a rigid pin in its hole (full model)',
    params: [
      LEN('W', 'width of the shank and end', 40, ['width']),
      LEN('d', 'hole diameter, less than W', 20, ['diameter']),
      LEN('e', 'distance from the hole centre to the end of the lug', 'W/2'),
      LEN('L', 'shank length from the hole centre to the held end', '3 W', ['length']),
      { name: 'end', meaning: 'shape of the end: a half circle of radius W/2, or square', default: 'round', quantity: 'choice', unit: '', choices: ['round', 'square'] },
      LEN('clearance', 'diametral clearance of the pin (hole diameter less pin diameter)', 0),
      { name: 'angle', meaning: 'direction of the pin force from the lug axis, degrees counter-clockwise', default: 0, quantity: 'ratio', unit: 'deg' },
      { name: 'load', meaning: 'a rigid pin in frictionless contact, or the cosine bearing pressure', default: 'pin', quantity: 'choice', unit: '', choices: ['pin', 'bearing'] },
      STRESS('net nominal stress F / ((W - d) t) that sets the pin force'),
      ...COMMON_PARAMS,
    ],
    build: (v) =>
      lug({
        ...common(v),
        W: v.W as number,
        d: v.d as number,
        e: v.e as number,
        L: v.L as number,
        end: v.end as 'round' | 'square',
        clearance: v.clearance as number,
        angle: v.angle as number,
        load: v.load as 'pin' | 'bearing',
        stress: v.stress as number,
      }),
  },
  {
    name: 'link',
    description: 'link plate with two pin holes, held by one pin and pulled by the other (full model)',
    params: [
      LEN('W', 'width of the link', 40, ['width']),
      LEN('d', 'hole diameter, less than W', 20, ['diameter']),
      LEN('p', 'pitch: distance between the hole centres', '3 W', ['pitch']),
      LEN('clearance', 'diametral clearance of the pins', 0),
      STRESS('net nominal stress F / ((W - d) t) that sets the pull'),
      ...COMMON_PARAMS,
    ],
    build: (v) => link({ ...common(v), W: v.W as number, d: v.d as number, p: v.p as number, clearance: v.clearance as number, stress: v.stress as number }),
  },
];

/** Every template with its description and parameters, for listing and for `raiser new`. */
export const TEMPLATES: readonly TemplateInfo[] = ENTRIES.map(({ name, description, params }) => ({ name, description, params }));

/**
 * Builds a model from a template name and parameter values (numbers, or text as typed on a
 * command line). Unknown templates and parameters, text that is not a number, and choices
 * that are not offered give a ModelError naming the parameter, with a suggestion.
 */
export function expandTemplate(name: string, values: Readonly<Record<string, number | string>> = {}, options: { schema?: string } = {}): Model {
  const entry = ENTRIES.find((e) => e.name === name);
  if (!entry) {
    const names = ENTRIES.map((e) => e.name);
    throw new ModelError('', `there is no template "${name}"${didYouMean(name, names)}`, `the templates are ${quoteList(names, 'and')}`);
  }
  const parsed: Record<string, number | string> = {};
  const names = entry.params.map((p) => p.name);
  for (const [given, raw] of Object.entries(values)) {
    const param = entry.params.find((p) => p.name === given || p.aliases?.includes(given));
    const key = param ? param.name : given;
    if (!param) {
      throw new ModelError(key, `the template "${name}" has no parameter "${key}"${didYouMean(key, names)}`, `its parameters are ${quoteList(names, 'and')}`);
    }
    if (param.quantity === 'choice') {
      const text = String(raw);
      if (!param.choices!.includes(text)) {
        throw new ModelError(key, `"${text}" is not one of ${quoteList(param.choices!)}${didYouMean(text, param.choices!)}`, `${key}: ${param.meaning}`);
      }
      parsed[key] = text;
      continue;
    }
    const num = typeof raw === 'number' ? raw : /^\s*[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?\s*$/i.test(raw) ? Number(raw) : NaN;
    if (!Number.isFinite(num)) {
      throw new ModelError(key, `${key} must be a number; found "${raw}"`, `give the number alone, in the model's units (${param.unit ? `${param.unit} unless the unit parameters say otherwise` : 'no unit'})`);
    }
    parsed[key] = num;
  }
  const model = entry.build(parsed);
  return options.schema ? { $schema: options.schema, ...model } : model;
}
