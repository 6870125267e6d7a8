/**
 * The model file format: one schema, used both to validate model files at run time and to
 * generate the JSON Schema that editors use (schema/raiser-model.schema.json, written by
 * `node dist/model/write-schema.js` after a build; a test checks the committed file is current).
 * Every field carries its description here, so the generated schema and the validation
 * messages never drift apart.
 *
 * Conventions: y points up; lengths, forces and stresses are in the units the file declares
 * (default mm, N, MPa). Indices shown to people (hole 2, corner 5) count from 1.
 */
import { STRESS_MEASURES, type StressMeasure } from './measures.js';
import { z } from 'zod';
import { PRODUCT_FORMS, type MaterialBasis } from './materials.js';

const finite = () => z.number();
const positive = () => z.number().positive();
const Point = z.tuple([finite(), finite()]).describe('a point [x, y] in model length units');

// ---------------------------------------------------------------------------------------------
// Boundary selectors: how loads and supports find the part of the boundary they act on.

export const Selector = z
  .union([
    z.string().min(1).describe('a tag name given to edges in the geometry'),
    z.strictObject({ x: finite().describe('edges lying on the line x = value') }),
    z.strictObject({ y: finite().describe('edges lying on the line y = value') }),
    z.strictObject({
      line: z.tuple([Point, Point]).describe('edges lying on the infinite line through these two points'),
    }),
    z.strictObject({
      hole: z.union([z.number().int().positive(), z.string().min(1)]).describe('every edge of a hole, by its number (from 1) or name'),
    }),
    z.strictObject({ outline: z.literal(true).describe('every edge of the outline') }),
    z.strictObject({
      box: z.tuple([Point, Point]).describe('edges lying wholly inside the box [[xmin, ymin], [xmax, ymax]]'),
    }),
  ])
  .describe('which boundary edges: a tag name, or a geometric selector');
export type Selector = z.infer<typeof Selector>;

export const Target = z.union([Selector, z.array(Selector).min(1)]).describe('one selector or a list of them (their union)');
export type Target = z.infer<typeof Target>;

// ---------------------------------------------------------------------------------------------
// Geometry.

export const ArcSpec = z
  .union([
    z.strictObject({
      radius: positive().describe('arc radius'),
      turn: z.enum(['ccw', 'cw']).describe('direction of travel around the arc centre, from this vertex to the next'),
      large: z.boolean().optional().describe('take the arc longer than a half circle (default false)'),
    }),
    z.strictObject({
      center: Point.describe('arc centre; its distance to both end points must agree'),
      turn: z.enum(['ccw', 'cw']).describe('direction of travel around the centre, from this vertex to the next'),
    }),
    z.strictObject({ through: Point.describe('a third point the arc passes through, between its ends') }),
    z.strictObject({
      ellipse: z
        .strictObject({
          center: Point.describe('centre of the ellipse'),
          rx: positive().describe('semi-axis along the rotated x direction'),
          ry: positive().describe('semi-axis along the rotated y direction'),
          rotation: finite().optional().describe('rotation of the rx axis from +x, degrees counter-clockwise (default 0)'),
          turn: z.enum(['ccw', 'cw']).describe('direction of travel around the centre, from this vertex to the next'),
        })
        .describe('an elliptical arc: both end points must lie on this ellipse'),
    }),
  ])
  .describe('makes the edge from this vertex to the next a circular arc, or an elliptical one');
export type ArcSpec = z.infer<typeof ArcSpec>;

export const Vertex = z
  .union([
    Point,
    z.strictObject({
      at: Point.describe('vertex position'),
      round: positive().optional().describe('round this corner with a fillet of this radius (both neighbouring edges straight)'),
      edge: z.string().min(1).optional().describe('tag for the edge from this vertex to the next one'),
      arc: ArcSpec.optional(),
    }),
  ])
  .describe('a loop vertex: [x, y], or an object with the edge that leaves it');
export type Vertex = z.infer<typeof Vertex>;

const loopCommon = {
  name: z.string().min(1).optional().describe('a name used in messages and results (for example "bolt hole")'),
  tag: z.string().min(1).optional().describe('tag given to every edge of this loop'),
};

export const PathLoop = z.strictObject({
  shape: z.literal('path').describe('a loop drawn vertex by vertex, with straight, arc and rounded edges'),
  path: z.array(Vertex).min(2).describe('vertices in order; the loop closes itself from the last vertex back to the first (two vertices make a loop when at least one of its edges is an arc: a hole of two half circles)'),
  ...loopCommon,
});
const CircleLoop = z.strictObject({
  shape: z.literal('circle').describe('a circle'),
  center: Point.describe('centre of the circle'),
  radius: positive().optional().describe('radius (give radius or diameter)'),
  diameter: positive().optional().describe('diameter (give radius or diameter)'),
  ...loopCommon,
});
const EllipseLoop = z.strictObject({
  shape: z.literal('ellipse').describe('an ellipse'),
  center: Point.describe('centre of the ellipse'),
  a: positive().describe('semi-axis along the direction given by angle'),
  b: positive().describe('semi-axis across it'),
  angle: finite().optional().describe('rotation of the a axis from +x, degrees counter-clockwise (default 0)'),
  ...loopCommon,
});
const SlotLoop = z.strictObject({
  shape: z.literal('slot').describe('a straight slot with half-circle ends'),
  center: Point.describe('centre of the slot'),
  length: positive().describe('overall length, end to end, including the round ends'),
  width: positive().describe('width; the ends are half circles of diameter width'),
  angle: finite().optional().describe('rotation of the length direction from +x, degrees counter-clockwise (default 0)'),
  ...loopCommon,
});
const RoundedRectLoop = z.strictObject({
  shape: z.literal('rounded-rect').describe('a rectangle with rounded corners'),
  center: Point.describe('centre of the rectangle'),
  width: positive().describe('size along the rotated x direction'),
  height: positive().describe('size along the rotated y direction'),
  radius: z.number().nonnegative().describe('corner radius; 0 gives sharp corners'),
  angle: finite().optional().describe('rotation from +x, degrees counter-clockwise (default 0)'),
  ...loopCommon,
});

export const Loop = z
  .discriminatedUnion('shape', [PathLoop, CircleLoop, EllipseLoop, SlotLoop, RoundedRectLoop])
  .describe('a closed boundary loop');
export type Loop = z.infer<typeof Loop>;
export type PathLoop = z.infer<typeof PathLoop>;

export const TypedGeometry = z.strictObject({
  outline: Loop.describe('the outer boundary of the plate'),
  holes: z.array(Loop).optional().describe('holes and cutouts, each wholly inside the outline and apart from the others'),
});
export type TypedGeometry = z.infer<typeof TypedGeometry>;

/** The length units a drawing may be in (src/geometry/import/types.ts gives their sizes). */
const DRAWING_UNIT_NAMES = ['mm', 'cm', 'm', 'in', 'ft', 'px', 'pt'] as const;

export const DrawingGeometry = z.strictObject({
  from: z
    .string()
    .min(1)
    .describe('the drawing of the plate, an SVG or DXF file, relative to the folder of the model file; its closed loops become the outline and the holes'),
  unit: z
    .enum(DRAWING_UNIT_NAMES)
    .optional()
    .describe(
      'the length of one drawing unit (px = 1/96 in, pt = 1/72 in); default: what the drawing declares (SVG width and height over its viewBox, DXF $INSUNITS), else px for SVG and the model length unit for DXF',
    ),
  scale: positive().optional().describe('factor applied to the drawing after the unit conversion (default 1; 2 for a drawing at 1:2)'),
  outline: z
    .string()
    .min(1)
    .optional()
    .describe('the DXF layer, or the SVG element id, class or layer label, of the outline loop (default: the largest closed loop); the closed loops inside it become holes'),
  ignore: z.array(z.string().min(1)).optional().describe('DXF layers, or SVG ids, classes or layer labels, to leave out (title blocks, dimensions, centre lines)'),
  join: positive()
    .optional()
    .describe('loose ends closer than this are joined, model length unit (default a millionth of the diagonal of the drawing)'),
});
export type DrawingGeometry = z.infer<typeof DrawingGeometry>;

export const Geometry = z
  .union([TypedGeometry, DrawingGeometry])
  .describe('the plate: an outline and holes written in the file, or a drawing to read them from');
/**
 * Either form. The drawing form is typed with `holes?: undefined` so that code reading
 * `geometry.holes` of a typed model needs no narrowing. The drawing is read by
 * src/geometry/import and returned beside the model (src/pipeline/load.ts), never stored in it.
 */
export type Geometry = TypedGeometry | (DrawingGeometry & { holes?: undefined });

// ---------------------------------------------------------------------------------------------
// Material, units, supports, loads.

export const LENGTH_UNITS = ['mm', 'cm', 'm', 'in', 'ft'] as const;
export const FORCE_UNITS = ['N', 'kN', 'MN', 'lbf', 'kip'] as const;

const Units = z
  .strictObject({
    length: z.enum(LENGTH_UNITS).optional().describe('length unit (default mm)'),
    force: z.enum(FORCE_UNITS).optional().describe('force unit (default N); stress is force / length^2'),
  })
  .describe('a consistent unit set; stresses and E are in force/length^2 (N and mm give MPa)');

export const Material = z.strictObject({
  name: z.string().optional().describe('material name, for reports'),
  grade: z
    .string()
    .min(1)
    .optional()
    .describe('a bundled grade (S235JR, S275JR, S355JR, S355J2, A36, A572-50, 304, 316L, 6082-T6, 6061-T6, 5083-O, 7075-T6, 2024-T3; case and spaces ignored): E, nu, yield and ultimate from its standard, for the form and the model thickness; fields given here override them'),
  form: z
    .enum(PRODUCT_FORMS)
    .optional()
    .describe('the product form, to pick the standard table of the grade (default plate, sheet for 2024-T3); the model thickness picks the band'),
  E: positive().optional().describe("Young's modulus, in stress units (required unless a grade gives it)"),
  nu: z.number().min(0).lt(0.5).optional().describe("Poisson's ratio, 0 <= nu < 0.5 (required unless a grade gives it)"),
  yield: positive().optional().describe('yield strength, for the safety summary'),
  ultimate: positive().optional().describe('ultimate tensile strength, for the safety summary and notch sensitivity'),
  notchSensitivity: z
    .strictObject({
      neuberSqrtA: z.number().nonnegative().optional().describe("square root of Neuber's material length, in sqrt(length unit)"),
      petersonA: z.number().nonnegative().optional().describe("Peterson's material length, in length units"),
    })
    .optional()
    .describe('material constants for the notch sensitivity q; without them q is estimated from the ultimate strength by the fits for steels'),
  stressStrain: z
    .strictObject({
      law: z.literal('ramberg-osgood').describe('strain = stress / E + (stress / K)^(1/n)'),
      K: positive().describe('strength coefficient, stress units'),
      n: positive().describe('strain hardening exponent'),
    })
    .optional()
    .describe("a stress-strain law for the Neuber-rule estimate of the local stress and strain at the peak"),
});
/**
 * After loading, E and nu are always set (given, or from the grade), and `basis` says where the
 * values of a grade came from (src/model/materials.ts); it is not a field of the file.
 */
export type Material = Omit<z.infer<typeof Material>, 'E' | 'nu'> & { E: number; nu: number; basis?: MaterialBasis };

const itemNote = () => z.string().optional().describe('free text about this item');

// Pins in holes (src/fem/pins.ts): the hole is named as in a "hole" selector; it must be circular.
const HoleOnly = z
  .strictObject({
    hole: z.union([z.number().int().positive(), z.string().min(1)]).describe('the hole, by its number (from 1) or name; it must be circular'),
  })
  .describe('the circular hole the pin sits in');
const PinForce = z.tuple([finite(), finite()]).describe('the force [fx, fy] the pin puts on the part, force units');
const pinFit = {
  clearance: z
    .number()
    .nonnegative()
    .optional()
    .describe('diametral clearance: hole diameter minus pin diameter, length units (default 0, a close fit); give clearance or diameter'),
  diameter: positive().optional().describe('the pin diameter, length units, at most the hole diameter (instead of clearance)'),
};

export const Support = z.discriminatedUnion('type', [
  z.strictObject({ type: z.literal('fixed').describe('held in x and in y'), on: Target, note: itemNote() }).describe('both displacement components zero'),
  z.strictObject({
    type: z.literal('roller').describe('held in one direction, free in the other'),
    fix: z.enum(['x', 'y']).describe('the displacement component held at zero; the other is free'),
    on: Target,
    note: itemNote(),
  }),
  z.strictObject({ type: z.literal('symmetry').describe('a mirror plane of the part and its loads'), on: Target, note: itemNote() }).describe(
    'a mirror plane: the displacement normal to the edge is zero (edges must be straight and axis-parallel)',
  ),
  z.strictObject({
    type: z.literal('pin').describe('one boundary point held'),
    at: Point.describe('the boundary node nearest this point is held'),
    fix: z.enum(['x', 'y', 'xy']).optional().describe('components held (default xy)'),
    note: itemNote(),
  }),
  z.strictObject({
    type: z.literal('rigid-pin').describe('a fixed rigid round pin in a circular hole: it holds the part only where the hole presses on it, without friction'),
    on: HoleOnly,
    ...pinFit,
    note: itemNote(),
  }),
]).describe('how part of the boundary is held, chosen by "type"');
export type Support = z.infer<typeof Support>;

export const Load = z.discriminatedUnion('type', [
  z.strictObject({
    type: z.literal('traction').describe('force per area on edges: normal and shear components'),
    on: Target,
    normal: finite().optional().describe('normal traction, positive pulling outward (tension), stress units'),
    shear: finite().optional().describe('tangential traction, positive along the edge direction with the material on the left, stress units'),
    note: itemNote(),
  }),
  z.strictObject({
    type: z.literal('force').describe('a total force spread uniformly over edges'),
    on: Target,
    fx: finite().optional().describe('total force in x, spread uniformly over the edges, force units'),
    fy: finite().optional().describe('total force in y, spread uniformly over the edges, force units'),
    note: itemNote(),
  }),
  z.strictObject({
    type: z.literal('moment').describe('an in-plane bending moment on straight collinear edges'),
    on: Target,
    m: finite().describe('in-plane bending moment, counter-clockwise positive, force x length; applied as a linearly varying normal traction on straight collinear edges'),
    note: itemNote(),
  }),
  z.strictObject({
    type: z.literal('pressure').describe('a pressure on straight or curved edges'),
    on: Target,
    p: finite().describe('pressure pushing on the surface (into the material), stress units; straight or curved edges'),
    note: itemNote(),
  }),
  z.strictObject({
    type: z.literal('remote').describe('a remote plane stress state on outer edges'),
    sxx: finite().optional().describe('remote normal stress along x, stress units'),
    syy: finite().optional().describe('remote normal stress along y, stress units'),
    sxy: finite().optional().describe('remote shear stress, stress units'),
    on: Target.optional().describe('edges it acts on (default: every outline edge without a support)'),
    note: itemNote(),
  }).describe('a remote plane stress state, applied as traction sigma . n on the outer edges'),
  z.strictObject({
    type: z.literal('bearing').describe('a pin bearing on a circular hole, as a pressure p0 cos(phi) on the half of the hole facing the force'),
    on: HoleOnly,
    force: PinForce,
    note: itemNote(),
  }),
  z.strictObject({
    type: z.literal('rigid-pin').describe('a rigid round pin in a circular hole, pushed with a force: it presses on the hole without friction where contact is found'),
    on: HoleOnly,
    force: PinForce,
    ...pinFit,
    note: itemNote(),
  }),
]).describe('a load on part of the boundary, chosen by "type"');
export type Load = z.infer<typeof Load>;

/** One named load case: the loads that act together (the supports are the model's, shared by every case). */
export const LoadCase = z
  .strictObject({
    name: z.string().trim().min(1).describe('the name of the case, unique in the model, printed with its results (for example "pull" or "side")'),
    loads: z.array(Load).min(1).describe('the loads of this case; at least one'),
    note: itemNote(),
  })
  .describe('a named load case: loads that act together, solved on the same mesh as the other cases');
export type LoadCase = z.infer<typeof LoadCase>;

export const MeshSettings = z.strictObject({
  element: z.enum(['quadratic', 'linear']).optional().describe('6-node (default) or 3-node triangles'),
  size: positive().optional().describe('target element edge length away from stress raisers (default: from the part size)'),
  raiserSize: positive().optional().describe('target element edge length at stress raisers (default: from the radii found)'),
  grading: z.number().min(0.05).max(1).optional().describe('how fast the element size may grow away from a raiser, per unit distance (default 0.25 for quadratic, 0.15 for linear elements)'),
  minAngle: z.number().min(10).max(30).optional().describe('minimum triangle angle, degrees (default 25)'),
});
export type MeshSettings = z.infer<typeof MeshSettings>;

export type { StressMeasure };

export const ResultSettings = z.strictObject({
  measure: z.enum(STRESS_MEASURES).optional().describe('the stress measure for the peak and Kt (default max-principal)'),
  section: z
    .union([
      z.literal('auto'),
      z.strictObject({ from: Point, to: Point }).describe('a user-given straight cut for the nominal stress'),
    ])
    .optional()
    .describe('the nominal section: auto (each raiser\'s least net section across the flow) or a cut, which applies to the raiser nearest it'),
  direction: Point.optional().describe('the direction of the flow of stress at the raisers, across which their sections are cut, when it should not be taken from the stress at each peak'),
  raiser: z.string().optional().describe('the stress raiser whose Kt is the headline (a hole name, "hole 2", an edge tag or a printed raiser name); default: the one with the highest peak'),
  raisers: z.array(z.string()).optional().describe('the stress raisers to report (default: all)'),
  nominal: z
    .record(
      z.string(),
      z.strictObject({
        section: z.strictObject({ from: Point, to: Point }).optional().describe('a straight cut for this raiser\'s nominal stress'),
        stress: finite().optional().describe('a nominal stress for this raiser, stress units'),
      }),
    )
    .optional()
    .describe('per stress raiser (by name): a given section or a given nominal stress for its Kt'),
});
export type ResultSettings = z.infer<typeof ResultSettings>;

const ChartLink = z.strictObject({
  family: z.string().describe('the published chart family this model was built for'),
  dims: z.record(z.string(), z.number()).describe('the family\'s dimensions, in model length units'),
});

/** Who made, checked and approved the analysis, for the sign-off block of the report (all optional; a missing name leaves an empty signature line). */
export const ReportInfo = z.strictObject({
  project: z.string().optional().describe('the project the part belongs to'),
  part: z.string().optional().describe('the part or drawing number'),
  revision: z.string().optional().describe('the revision of this analysis, for example "A" or "2"'),
  date: z.string().optional().describe('the date of this revision as it should be printed (default: the date the analysis ran)'),
  preparedBy: z.string().optional().describe('the name of the engineer who prepared the analysis'),
  checkedBy: z.string().optional().describe('the name of the engineer who checked it'),
  approvedBy: z.string().optional().describe('the name of the person who approved it (the line is shown only when given)'),
});
export type ReportInfo = z.infer<typeof ReportInfo>;

export const Model = z.strictObject({
  $schema: z.string().optional().describe('path or address of the JSON Schema, for editors; ignored by raiser'),
  title: z.string().optional().describe('shown in results and reports'),
  parameters: z
    .record(z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/), z.number())
    .optional()
    .describe('named numbers; any number in the file may be written as an expression of them, "=W/2 - r"'),
  note: z.string().optional().describe('free text: where the model comes from, what it is for'),
  units: Units.optional(),
  material: Material.describe('isotropic linear elastic material'),
  thickness: positive().describe('plate thickness, length units'),
  state: z.enum(['plane-stress', 'plane-strain']).optional().describe('plane-stress (thin plates; the default) or plane-strain (thick parts, no strain through the thickness)'),
  geometry: Geometry,
  supports: z.array(Support).min(1).describe('at least enough to stop rigid motion'),
  loads: z.array(Load).min(1).optional().describe('the loads; at least one. Give either "loads" (one load case) or "loadCases", not both'),
  loadCases: z
    .array(LoadCase)
    .min(1)
    .optional()
    .describe('named load cases on the same part and supports, each with its own loads: every mesh is factorised once and solved for each case, and each case gets its own Kt; instead of "loads"'),
  mesh: MeshSettings.optional().describe('mesh settings; all optional'),
  results: ResultSettings.optional().describe('how the peak stress and the nominal stress for Kt are taken'),
  chart: ChartLink.optional().describe('the published chart family and dimensions a generated model was built for'),
  report: ReportInfo.optional().describe('project, part number, revision and the names for the sign-off block of the report; the options of raiser solve and raiser report override them'),
});
export type Model = Omit<z.infer<typeof Model>, 'geometry' | 'material'> & { geometry: Geometry; material: Material };

// Names for the pieces used in several places, so the JSON Schema refers to one definition
// ($defs) instead of repeating it: about a fifth of the size, and readable. Registering an
// id on the same schema objects keeps their descriptions and changes nothing in validation.
for (const [schema, id] of [
  [Selector, 'Selector'],
  [Target, 'Target'],
  [ArcSpec, 'ArcSpec'],
  [Vertex, 'Vertex'],
  [Loop, 'Loop'],
  [Support, 'Support'],
  [Load, 'Load'],
  [LoadCase, 'LoadCase'],
] as const) {
  z.globalRegistry.add(schema, { ...z.globalRegistry.get(schema), id });
}

/** Every number may also be written as an "=expression" of the parameters (src/model/params.ts). */
function allowExpressions(node: unknown): unknown {
  if (Array.isArray(node)) return node.map(allowExpressions);
  if (!node || typeof node !== 'object') return node;
  const o = node as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(o)) out[k] = allowExpressions(v);
  if (o.type === 'number' || o.type === 'integer') {
    const { description, ...rest } = out;
    return {
      ...(description !== undefined ? { description } : {}),
      anyOf: [rest, { type: 'string', pattern: '^=', description: 'an expression of the model parameters, such as "=W/2 - r"' }],
    };
  }
  return out;
}

/** The JSON Schema for editors, generated from the schema above. */
export function modelJsonSchema(): object {
  const schema = allowExpressions(z.toJSONSchema(Model, { target: 'draft-2020-12' })) as Record<string, unknown>;
  return {
    ...schema,
    $id: 'https://raiser.invalid/schema/raiser-model.schema.json',
    title: 'raiser model file',
    description: 'A flat part for stress-concentration analysis: geometry, material, supports, loads.',
  };
}
