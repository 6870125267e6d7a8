/** Geometries several tests mesh: invented parts with every kind of curved edge. */
import type { Geometry } from '../../src/model/schema.js';

/** An L-shaped bracket with rounded corners, a slot, a tilted ellipse and a tilted rounded rectangle. */
export const BRACKET: Geometry = {
  outline: {
    shape: 'path',
    path: [{ at: [0, 0], round: 5 }, [120, 0], { at: [120, 30], round: 8 }, { at: [60, 30], round: 6 }, { at: [60, 80], round: 10 }, { at: [0, 80], round: 3 }],
  },
  holes: [
    { shape: 'slot', center: [90, 15], length: 30, width: 8 },
    { shape: 'ellipse', center: [30, 55], a: 12, b: 4, angle: 30 },
    { shape: 'rounded-rect', center: [30, 20], width: 20, height: 12, radius: 2, angle: -15 },
  ],
};
