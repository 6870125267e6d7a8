/**
 * What the model file asks of the mesh before it is made: the points it must have (pins sit on
 * a node) and sizes it can have (none below the geometric tolerance).
 */
import type { Domain } from '../geometry/domain.js';
import { nearestBoundaryPoint } from '../geometry/project.js';
import { ModelError } from '../model/errors.js';
import type { Model } from '../model/schema.js';
import type { HardPoint } from './boundary.js';

/** Pins must sit on a node: each becomes a hard point of the boundary discretisation. */
export function placePinHardPoints(domain: Domain, supports: Model['supports']): HardPoint[] {
  return supports.flatMap((s, i) => {
    if (s.type !== 'pin') return [];
    const b = nearestBoundaryPoint(domain, s.at[0], s.at[1]);
    if (b.distance > 1e-3 * domain.scale) {
      throw new ModelError(`supports[${i}].at`, `the pin at (${s.at.join(', ')}) is ${b.distance.toPrecision(3)} from the boundary; pins must lie on it`, `the nearest boundary point is (${b.x.toPrecision(6)}, ${b.y.toPrecision(6)}) on ${domain.edges[b.edge].label}`);
    }
    return [{ edge: b.edge, t: b.t }];
  });
}

/** Sizes below the geometric tolerance cannot be meshed (points would merge): a ModelError naming the field. */
export function checkMeshSizes(domain: Domain, mesh: Model['mesh']): void {
  for (const key of ['size', 'raiserSize'] as const) {
    const v = mesh?.[key];
    if (v !== undefined && v < 1e-6 * domain.scale) {
      throw new ModelError(`mesh.${key}`, `mesh.${key} = ${v} is below a millionth of the part size (${domain.scale.toPrecision(4)}): it cannot be meshed`, `use a size of at least ${(1e-4 * domain.scale).toPrecision(2)}`);
    }
  }
}
