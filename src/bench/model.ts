/** The bench model, shared by the bench scripts. */
import type { Model } from '../model/schema.js';

/** An invented perforated strap: holes, a slot and fillets, so the size field has many raisers. */
export function benchModel(sizeFactor: number): Model {
  return {
    title: 'bench strap (invented)',
    material: { E: 210000, nu: 0.3 },
    thickness: 5,
    geometry: {
      outline: { shape: 'path', path: [{ at: [0, 0], round: 4 }, { at: [240, 0], round: 4 }, { at: [240, 60], round: 4 }, { at: [0, 60], round: 4 }] },
      holes: [
        { shape: 'circle', center: [40, 30], radius: 8 },
        { shape: 'circle', center: [90, 22], radius: 5 },
        { shape: 'slot', center: [150, 30], length: 40, width: 10, angle: 20 },
        { shape: 'ellipse', center: [205, 32], a: 10, b: 4, angle: 90 },
      ],
    },
    supports: [{ type: 'fixed', on: { x: 0 } }],
    loads: [{ type: 'force', on: { x: 240 }, fx: 20000 }],
    mesh: { size: 6 * sizeFactor, raiserSize: 0.6 * sizeFactor },
  };
}
