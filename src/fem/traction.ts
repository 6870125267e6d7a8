/**
 * Consistent nodal forces of a traction on boundary edges: 4-point Gauss-Legendre along each
 * 2- or 3-node edge (exact for the cosine bearing pressure's polynomial part on a straight edge,
 * and for a quadratic edge's geometry to the order the elements need). Used by the loads
 * (boundary-conditions.ts) and the pins' bearing pressure (bearing.ts).
 */
import type { Mesh } from '../mesh/types.js';

const GL4_S = [0.5 - 0.5 * 0.8611363115940526, 0.5 - 0.5 * 0.3399810435848563, 0.5 + 0.5 * 0.3399810435848563, 0.5 + 0.5 * 0.8611363115940526];
const GL4_W = [0.5 * 0.3478548451374538, 0.5 * 0.6521451548625461, 0.5 * 0.6521451548625461, 0.5 * 0.3478548451374538];

/** q(x, y, nx, ny, out): writes the traction (stress units) at a boundary point with outward normal n. */
export type TractionField = (x: number, y: number, nx: number, ny: number, out: number[]) => void;

/** Adds the consistent nodal forces of a traction field on the chosen domain edges into f. */
export function addEdgeTraction(mesh: Mesh, onDomainEdge: Uint8Array, q: TractionField, thickness: number, f: Float64Array): void {
  const nodes = mesh.nodes;
  const t = [0, 0];
  for (let s = 0; s < mesh.nBEdges; s++) {
    if (!onDomainEdge[mesh.bEdgeDomain[s]]) continue;
    const a = mesh.bEdges[3 * s];
    const b = mesh.bEdges[3 * s + 1];
    const m = mesh.bEdges[3 * s + 2];
    for (let g = 0; g < 4; g++) {
      const u = GL4_S[g];
      let x: number, y: number, dx: number, dy: number;
      let na: number, nb: number, nm = 0;
      if (m >= 0) {
        na = (1 - u) * (1 - 2 * u);
        nm = 4 * u * (1 - u);
        nb = u * (2 * u - 1);
        const da = 4 * u - 3;
        const dm = 4 - 8 * u;
        const db = 4 * u - 1;
        x = na * nodes[2 * a] + nm * nodes[2 * m] + nb * nodes[2 * b];
        y = na * nodes[2 * a + 1] + nm * nodes[2 * m + 1] + nb * nodes[2 * b + 1];
        dx = da * nodes[2 * a] + dm * nodes[2 * m] + db * nodes[2 * b];
        dy = da * nodes[2 * a + 1] + dm * nodes[2 * m + 1] + db * nodes[2 * b + 1];
      } else {
        na = 1 - u;
        nb = u;
        x = na * nodes[2 * a] + nb * nodes[2 * b];
        y = na * nodes[2 * a + 1] + nb * nodes[2 * b + 1];
        dx = nodes[2 * b] - nodes[2 * a];
        dy = nodes[2 * b + 1] - nodes[2 * a + 1];
      }
      const js = Math.hypot(dx, dy);
      q(x, y, dy / js, -dx / js, t);
      const w = GL4_W[g] * js * thickness;
      f[2 * a] += w * na * t[0];
      f[2 * a + 1] += w * na * t[1];
      f[2 * b] += w * nb * t[0];
      f[2 * b + 1] += w * nb * t[1];
      if (m >= 0) {
        f[2 * m] += w * nm * t[0];
        f[2 * m + 1] += w * nm * t[1];
      }
    }
  }
}

