/**
 * The plain data that the drawing readers (svg.ts, dxf.ts) hand to the joiner and the loop
 * classifier (join.ts, index.ts). Coordinates are already in the model's length unit with y up.
 */
import type { Curve } from '../curve.js';

/** One curve as drawn, with the tags it takes from the drawing and where it comes from. */
export interface DrawnCurve {
  curve: Curve;
  tags: string[];
  /** what a person finds in the drawing: `<path id="outline"> (line 12)`, `LINE on layer "0" (handle 2F)` */
  origin: string;
}

/** A run of curves drawn as one item: a closed shape, or an open chain to be joined with others. */
export interface Piece {
  curves: DrawnCurve[];
  closed: boolean;
  origin: string;
  /** names that select or leave out the piece: DXF layer; SVG ids, classes and layer labels of the element and its groups */
  keys: string[];
  /** a name for the hole it makes, when the drawing gives one (an SVG element id) */
  name?: string;
}

/** What a reader found, besides the pieces. */
export interface ReadDrawing {
  pieces: Piece[];
  /** the drawing unit used, in words: "mm (from $INSUNITS)", "px = 1/96 in (SVG rules, no physical size given)" */
  unit: string;
  /** things that were skipped or assumed, for the report and the load warnings */
  notes: string[];
  /** notes that the user should see as warnings (an assumed unit) */
  warnings: string[];
  /** every key (layer, id, class) met in the drawing, for "did you mean" */
  keys: string[];
}

export interface ReadOptions {
  /** the model file's `unit` for the drawing, if given */
  unit?: DrawingUnitName;
  /** metres per model length unit */
  modelUnitMetres: number;
  /** the model length unit's name */
  modelUnitName: string;
  /** factor applied after the unit conversion */
  scale: number;
  /** keys to leave out */
  ignore: readonly string[];
  /** the file name as written in the model, for messages */
  file: string;
}

const DRAWING_UNITS = ['mm', 'cm', 'm', 'in', 'ft', 'px', 'pt'] as const;
export type DrawingUnitName = (typeof DRAWING_UNITS)[number];

/** Metres per drawing unit. px and pt are the CSS units: 1 px = 1/96 in, 1 pt = 1/72 in (CSS Values and Units Level 3, section 6.2 [M]). */
export const DRAWING_UNIT_METRES: Record<DrawingUnitName, number> = {
  mm: 0.001,
  cm: 0.01,
  m: 1,
  in: 0.0254,
  ft: 0.3048,
  px: 0.0254 / 96,
  pt: 0.0254 / 72,
};

/** A problem with the drawing itself; index.ts turns it into a ModelError at geometry.from. */
export class DrawingError extends Error {
  constructor(
    message: string,
    readonly hint?: string,
  ) {
    super(message);
  }
}
