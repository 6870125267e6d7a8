/**
 * The declared shape of result.json (and of `raiser solve --json`, and of the result inside a
 * saved solution). report/result.ts builds it and the compiler holds the builder to this type;
 * the README ("Result fields") describes every field for people: keep the three in step.
 *
 * Lengths are in the model's length unit, stresses in its stress unit, forces and moments in its
 * force and moment units (`units`). A null means "not defined here", and where a number is
 * withheld a `withheld` or `reason` string says why.
 */
import type { PlaneState } from '../fem/material.js';
import type { MaterialFamily } from '../model/materials.js';
import type { StressMeasure } from '../model/schema.js';
import type { CertifyStatus } from '../pipeline/certify.js';
import type { KtKind } from '../post/kt.js';
import type { RaiserShape } from '../post/raisers.js';
import type { RaiserStatus } from '../post/settle.js';
import type { SingularKind } from '../post/singular.js';
import type { OrderingMethod, SolveMethod } from '../solve/index.js';

type Point = [number, number];

/** The Kt of the governing raiser, the headline of the result. */
export interface ResultKt {
  raiser: string | null;
  kind: KtKind | null;
  value: number | null;
  /** estimated relative error of the value (from the mesh series) */
  error: number | null;
  band: [number, number] | null;
  extrapolated: number | null;
  definition: string | null;
  withheld: string | null;
  net: number | null;
  gross: number | null;
}

/** A cut across the part: a raiser's net section or the gross section beside it. */
export interface ResultCut {
  from: Point;
  to: Point;
  normal: Point;
  length: number;
  area: number;
  centroid: Point;
  inertia: number;
  /** the cut ends on a mirror plane of a half or quarter model */
  mirror: boolean;
  ligaments: { from: Point; to: Point }[];
}

/** A net section with what it carries (N normal force, V shear, M bending moment). */
export interface ResultSection extends ResultCut {
  /** given in the model rather than found */
  given: boolean;
  raiserPoint: Point;
  N: number | null;
  V: number | null;
  M: number | null;
}

/** One Kt of a raiser (net, gross, remote, given nominal...), or why it is withheld. */
export interface ResultKtEntry {
  value: number | null;
  nominal: number | null;
  definition: string;
  withheld: string | null;
  error: number | null;
  band: [number, number] | null;
  extrapolated: number | null;
  /** the membrane (N / A) part of the nominal stress, where bending adds to it */
  membrane?: number | null;
}

/** A published chart's Kt beside the computed one. */
export interface ResultChart {
  value: number | null;
  computed: number | null;
  difference: number | null;
  id: string;
  title: string;
  source: string;
  provenance: string;
  nominal: 'net' | 'gross' | 'bearing';
  spread: number;
  outside: string[];
}

export interface ResultPeakStresses {
  stress: number;
  x: number;
  y: number;
  sxx: number;
  syy: number;
  sxy: number;
}

/** One stress raiser (hole, notch, fillet...) with its peak, sections and Kt. */
export interface ResultRaiser {
  index: number;
  name: string;
  kind: 'hole' | 'outline';
  governing: boolean;
  status: RaiserStatus;
  reason: string | null;
  radius: number | null;
  shape: RaiserShape;
  peak: ResultPeakStresses;
  peakError: number | null;
  section: ResultSection | null;
  gross: ResultCut | null;
  headline: KtKind | null;
  kt: Partial<Record<KtKind, ResultKtEntry>>;
  chart: ResultChart | null;
  warnings: string[];
}

/** A point where the elastic stress may be unbounded (a sharp re-entrant corner, a point load...). */
export interface ResultSingularPoint {
  kind: SingularKind;
  x: number;
  y: number;
  what: string;
  fix: string;
  stresses: number[];
  grows: boolean | null;
}

export interface ResultPeak extends ResultPeakStresses {
  measure: StressMeasure;
  feature: string;
  onBoundary: boolean;
  atSharpCorner: boolean;
}

export interface ResultResultant {
  fx: number;
  fy: number;
  m: number;
}

/** The boundary edges each load and support acts on, as the finite element stage applied them. */
export interface ResultBoundaryConditions {
  loads: { index: number; type: 'force' | 'rigid-pin' | 'traction' | 'moment' | 'pressure' | 'remote' | 'bearing'; edges: number[] }[];
  supports: { index: number; type: 'fixed' | 'roller' | 'symmetry' | 'pin' | 'rigid-pin'; edges: number[] }[];
}

/** One mesh of the convergence series. */
export interface ResultMeshRecord {
  elements: number;
  nodes: number;
  dofs: number;
  relativeSize: number;
  peak: number;
  peakX: number;
  peakY: number;
  raiserPeak: number | null;
  kt: number | null;
  timeMs: number;
}

/** A single mesh: no error estimate. */
export interface ResultSingleMesh {
  status: 'single-mesh';
  target: null;
  estimatedError: null;
  observedOrder: null;
  theoreticalOrder: null;
  orderUsed: null;
  safetyFactor: null;
  behaviour: null;
  asymptoticRatio: null;
  quantity: null;
  meshes: ResultMeshRecord[];
  adaptation: null;
  notes: string[];
  timeMs: null;
}

/** A certified series of meshes and what it says about the error. */
export interface ResultSeries {
  status: CertifyStatus;
  target: number;
  estimatedError: number | null;
  observedOrder: number | null;
  theoreticalOrder: number;
  orderUsed: number | null;
  safetyFactor: number | null;
  behaviour: 'monotone' | 'oscillating' | 'diverging' | 'two-meshes' | 'unchanged' | null;
  asymptoticRatio: number | null;
  quantity: string;
  meshes: ResultMeshRecord[];
  adaptation: { marked: number; of: number };
  notes: string[];
  timeMs: number;
}

export interface ResultMaterialGrade {
  grade: string;
  family: MaterialFamily;
  form: 'plate' | 'sheet' | 'strip' | 'extrusion' | 'bar' | 'section';
  formGiven: boolean;
  thicknessMm: number;
  band: { over: number; upTo: number } | null;
  standard: string | null;
  /** V: read in a stored copy of the standard; M: recalled, to be checked */
  provenance: 'V' | 'M' | null;
  checkedIn: string | null;
  elasticSource: string;
  tableYieldMPa: number | null;
  tableUltimateMPa: number | null;
  tableUltimateMaxMPa: number | null;
  unsetWhy: string | null;
  description: string;
}

export interface ResultMaterial {
  name: string | null;
  E: number;
  nu: number;
  yield: number | null;
  ultimate: number | null;
  grade: ResultMaterialGrade | null;
}

/** The fatigue notch factor estimates at the governing raiser, or why there are none. */
export interface ResultFatigue {
  radius: number;
  kt: KtKind | null;
  raiser: string;
  methods: { name: string; q: number; kf: number; source: string }[];
  notes: string[];
  withheld: string | null;
}

/** Neuber's rule at the peak, where the elastic peak is above yield. */
export interface ResultPlasticity {
  elasticPeak: number;
  localStress: number;
  localStrain: number;
  elasticStrain: number;
  source: string;
}

export interface ResultPinContact {
  arcs: { from: number; to: number; endSpacing: number }[];
  nodesInContact: number;
  peakPressure: number;
  peakPressureAngle: number;
  pinDisplacement: number[] | null;
  pressure: { angle: number[]; value: number[] };
}

/** A pin or bolt in a hole: what it carries, the bearing stress and the hole's peak. */
export interface ResultPin {
  item: string;
  kind: 'rigid-pin' | 'bearing';
  role: 'load' | 'support';
  hole: { number: number; label: string; center: Point; diameter: number };
  clearance: number | null;
  force: Point;
  bearingStress: number;
  bearingPressurePeak: number | null;
  holePeak: { stress: number; x: number; y: number; angle: number; overBearingStress: number | null } | null;
  contact: ResultPinContact | null;
}

export interface ResultPins {
  items: ResultPin[];
  bearingStressDefinition: string;
  contactIterations: number | null;
  contactTolerance: { force: number; gap: number } | null;
  notes: string[];
}

/**
 * One load case of a model with loadCases: its headline Kt, every raiser's peak and Kt (each
 * with its band, or why it is withheld, as in the top-level fields), its peak, its loads and
 * reactions, and how its series ended. The top-level fields describe the governing case.
 */
export interface ResultCase {
  name: string;
  /** the case with the highest peak stress (|peak|): the one the top-level fields and the pictures show */
  governing: boolean;
  kt: ResultKt;
  raisers: { name: string; governing: boolean; status: RaiserStatus; reason: string | null; peak: ResultPeakStresses; headline: KtKind | null; kt: Partial<Record<KtKind, ResultKtEntry>> }[];
  peak: ResultPeak;
  load: ResultJson['load'];
  convergence: { status: CertifyStatus | 'single-mesh'; target: number | null; estimatedError: number | null; quantity: string | null; meshes: number; dofs: number };
  /** the last mesh of this case: how many cases were solved on it and the factorisations of its stiffness they shared */
  solve: { casesOnMesh: number; factorisations: number };
  warnings: string[];
}

/** result.json. */
export interface ResultJson {
  tool: { name: string; version: string };
  model: { title: string | null; file: string | null; chart: { family: string; dims: Record<string, number> } | null };
  geometry: { extent: [number, number, number, number]; area: number; holes: number; raisers: number };
  units: { length: 'in' | 'mm' | 'cm' | 'm' | 'ft'; force: 'N' | 'kN' | 'MN' | 'lbf' | 'kip'; stress: string; moment: string };
  analysis: { state: PlaneState; measure: StressMeasure; thickness: number; E: number; nu: number };
  kt: ResultKt;
  raisers: ResultRaiser[];
  singularPoints: ResultSingularPoint[];
  peak: ResultPeak;
  load: { resultant: ResultResultant; remote: { sxx: number; syy: number; sxy: number } | null; reaction: ResultResultant; equilibriumError: number };
  boundaryConditions: ResultBoundaryConditions;
  mesh: { nodes: number; elements: number; dofs: number; elementType: string; nodesPerElement: number; minAngleDeg: number; maxAngleDeg: number };
  solver: {
    ordering: OrderingMethod;
    equations: number;
    factorNonzeros: number;
    relativeResidual: number;
    backwardError: number;
    method: SolveMethod;
    iterations: number;
    preconditioner: string | null;
  };
  timeMs: { mesh: number; assemble: number; solve: number; recover: number; total: number };
  convergence: ResultSingleMesh | ResultSeries;
  chart: ResultChart | null;
  material: ResultMaterial;
  fatigue: ResultFatigue | null;
  plasticity: ResultPlasticity | null;
  safety: { yield: number | null; ultimate: number | null; peakOverYield: number | null; localPlasticity: boolean | null };
  pins: ResultPins | null;
  mirrorPlanes: { axis: 'x' | 'y'; at: number; edges: number[] }[];
  warnings: string[];
  cautions: string[];
  /** with loadCases: the name of the case the fields above describe (the governing one) */
  loadCase?: string;
  /** with loadCases: every case, in the model's order */
  cases?: ResultCase[];
}
