/**
 * Geometric predicates with the project's sign convention: y up, positive = counter-clockwise.
 * robust-predicates (Shewchuk's adaptive-precision arithmetic, J. R. Shewchuk, "Adaptive
 * Precision Floating-Point Arithmetic and Fast Robust Geometric Predicates", Discrete Comput.
 * Geom. 18, 1997) returns a negative orient2d for a counter-clockwise triangle in y-up axes, so
 * it is wrapped here once and nowhere else.
 */
import { incircle, orient2d } from 'robust-predicates';

/** Twice the signed area of (a, b, c): > 0 when counter-clockwise, exact in sign. */
export function orientCcw(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return -orient2d(ax, ay, bx, by, cx, cy);
}

/** > 0 when d lies strictly inside the circle through the counter-clockwise triangle (a, b, c); exact in sign. */
export function inCircleCcw(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): number {
  return incircle(ax, ay, bx, by, cx, cy, dx, dy);
}
