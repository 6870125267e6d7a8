/**
 * Model builders for the pin tests: a lug (a straight shank of width W held at its far end,
 * with a round end concentric with a hole of diameter d) loaded through the hole. Invented
 * test parts.
 */
import type { Load, Model } from '../../src/model/schema.js';

export interface LugOptions {
  W: number;
  d: number;
  /** shank length from the hole centre to the held end (default 2 W) */
  L?: number;
  thickness?: number;
  nu?: number;
  /** the load on the hole */
  load: Load;
  mesh?: Model['mesh'];
}

/** A round-ended lug, hole centre at the origin, shank along -x held at x = -L. */
export function roundLug(o: LugOptions): Model {
  const { W, d } = o;
  const L = o.L ?? 2 * W;
  return {
    title: 'round-ended lug (invented test part)',
    material: { E: 210000, nu: o.nu ?? 0.3 },
    thickness: o.thickness ?? 10,
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [-L, -W / 2], edge: 'side' },
          { at: [0, -W / 2], edge: 'end', arc: { center: [0, 0], turn: 'ccw' } },
          { at: [0, W / 2], edge: 'side' },
          { at: [-L, W / 2], edge: 'held' },
        ],
      },
      holes: [{ shape: 'circle', center: [0, 0], diameter: d, name: 'pin' }],
    },
    supports: [{ type: 'fixed', on: 'held' }],
    loads: [o.load],
    ...(o.mesh ? { mesh: o.mesh } : {}),
  };
}
