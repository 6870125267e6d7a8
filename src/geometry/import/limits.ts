/**
 * Limits on what a drawing may make raiser do, checked before the work, so that a small
 * hostile or careless file cannot hang the program or exhaust its memory. Every limit is far
 * above what a drawing of one plate needs (a laser-cut profile has hundreds to a few thousand
 * curves) and is listed with its value in the README ("Assumptions and limits").
 *
 * Expansion is counted, not only nested: an SVG `<use>` or a DXF block INSERT copies its content,
 * and ten copies of ten copies of ... grow geometrically while staying shallow. Every item a
 * reader produces, drawn or copied, is charged to one ExpansionBudget.
 */
import { DrawingError } from './types.js';

/** Largest drawing file read, in bytes (64 MiB). */
export const MAX_DRAWING_BYTES = 64 * 2 ** 20;

/** Items (SVG elements, DXF entities, each copy counted) one drawing may expand into. */
export const MAX_EXPANDED_ITEMS = 200_000;

/** Curves (lines, arcs, Bezier pieces) one drawing may give. */
const MAX_CURVES = 200_000;

/** Copies made by one DXF INSERT's column x row array. */
export const MAX_ARRAY_COPIES = 10_000;

/** Depth of nested elements in an SVG document. */
export const MAX_XML_DEPTH = 256;

/** Entity declarations in an SVG document type, and the longest replacement text of one. */
export const MAX_XML_ENTITIES = 256;
export const MAX_XML_ENTITY_LENGTH = 4096;
/** Characters that entity references in an SVG may expand to, in all (1 MiB). */
export const MAX_XML_EXPANSION = 2 ** 20;

/** Highest SPLINE degree, most control points of one SPLINE, and the work of its Bezier pieces (control points x degree^2). */
export const MAX_SPLINE_DEGREE = 25;
export const MAX_SPLINE_POINTS = 50_000;
export const MAX_SPLINE_WORK = 2e7;

/** Counts the items and curves a reader makes, and stops it with a DrawingError past the limits. */
export class ExpansionBudget {
  items = 0;
  curves = 0;
  constructor(
    /** the word for an item in messages: "elements", "entities" */
    private readonly noun: string,
    private readonly how: string,
  ) {}

  /** Charges one item (an element or entity, each copy counted); `where` names it for the message. */
  chargeItem(where: () => string): void {
    if (++this.items > MAX_EXPANDED_ITEMS) {
      throw new DrawingError(
        `the drawing expands into more than ${MAX_EXPANDED_ITEMS.toLocaleString('en-US')} ${this.noun} (counting every copy ${this.how}); the limit was passed at ${where()}`,
        `a plate profile needs far fewer: remove the repeated copies, or explode and simplify the drawing in the drawing program`,
      );
    }
  }

  /** Charges n curves. */
  chargeCurves(n: number, where: () => string): void {
    this.curves += n;
    if (this.curves > MAX_CURVES) {
      throw new DrawingError(
        `the drawing has more than ${MAX_CURVES.toLocaleString('en-US')} lines, arcs and curves; the limit was passed at ${where()}`,
        'a plate profile needs far fewer: simplify the drawing (join short segments into arcs or splines), or leave out what is not the plate with "ignore"',
      );
    }
  }
}

/**
 * The sweep (radians) from angle a counter-clockwise to angle b, in (0, 2 pi], in constant time
 * for any finite angles (a loop that subtracts 2 pi would run 1e299 times for an angle of 1e300).
 * Angles too large to hold a fraction of a turn (beyond 2^52 radians) are refused by the caller.
 */
export function ccwSweep(a: number, b: number): number {
  const turn = 2 * Math.PI;
  const d = b - a;
  // A whole turn written as 0 to 360 degrees stays a whole turn, allowing for its rounding.
  if (d > 0 && d <= turn + 1e-12) return d;
  let s = d % turn; // in (-2 pi, 2 pi), exact
  if (s <= 0) s += turn;
  return s;
}

/** True when an angle (radians) is finite and small enough for its fraction of a turn to mean something. */
export function usableAngle(a: number): boolean {
  return Number.isFinite(a) && Math.abs(a) < 2 ** 40;
}
