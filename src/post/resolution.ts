/**
 * Warnings about the mesh where it matters for the result: a raiser's ligament under two elements
 * wide (the stress across it is then poorly resolved), and badly shaped elements at the peak.
 */
import { triangleMinAngle } from '../mesh/generate.js';
import { findElementsAtNode } from '../mesh/topology.js';
import type { SizeField } from '../mesh/sizefield.js';
import type { Mesh } from '../mesh/types.js';
import type { MeshEvaluation } from './evaluate.js';
import type { Peak } from './peak.js';
import { pointOnCut } from './section.js';

/** The resolution warnings of one mesh, in plain words, each with its fix. */
export function checkResolution(mesh: Mesh, size: SizeField, evaluation: MeshEvaluation, peak: Peak): string[] {
  const out: string[] = [];
  for (const ev of evaluation.raisers) {
    const c = ev.section;
    if (!c) continue;
    for (let k = 0; k < c.ligaments.length; k += 2) {
      const [x0, y0] = pointOnCut(c, c.ligaments[k]);
      const [x1, y1] = pointOnCut(c, c.ligaments[k + 1]);
      const L = c.ligaments[k + 1] - c.ligaments[k];
      const h = size.at(0.5 * (x0 + x1), 0.5 * (y0 + y1));
      if (L > 0 && L / h < 2) {
        out.push(`the ligament from (${x0.toPrecision(4)}, ${y0.toPrecision(4)}) to (${x1.toPrecision(4)}, ${y1.toPrecision(4)}) at ${ev.raiser.name} is only about ${(L / h).toFixed(1)} elements wide; give mesh.size or mesh.raiserSize a smaller value`);
      }
    }
  }
  const per = mesh.order === 2 ? 6 : 3;
  let worst = 180;
  for (const e of findElementsAtNode(mesh, peak.node)) worst = Math.min(worst, triangleMinAngle(mesh, per, e));
  if (worst < 20 && !peak.atSharpCorner) out.push(`an element at the peak has an angle of only ${worst.toFixed(1)} degrees; the peak stress there is less reliable`);
  return out;
}
