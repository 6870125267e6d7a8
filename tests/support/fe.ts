/**
 * Small helpers shared by the tests: meshes from plain geometry, and (from the library's
 * verification module) the distorted patch and a solve with prescribed degrees of freedom.
 */
import { buildDomain } from '../../src/geometry/domain.js';
import { generateMesh } from '../../src/mesh/generate.js';
import type { Geometry } from '../../src/model/schema.js';

export { boundaryFlags, distortedPatch, rectangleDomain, solveLinear } from '../../src/verify/patch.js';

export function meshGeometry(geometry: Geometry, order: 1 | 2, opts: { size?: number; raiserSize?: number } = {}) {
  const domain = buildDomain(geometry);
  const { mesh, stats } = generateMesh(domain, { order, ...opts });
  return { domain, mesh, stats };
}
