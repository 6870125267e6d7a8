/**
 * Adaptive against uniform refinement, for the standard cases: the degrees of freedom and the
 * time needed for the peak stress (and so Kt) to come within 1% and 0.5% of the reference.
 *
 * Adaptive: the certified series of raiser (graded size field, error-indicator adaptation,
 * stopped by the grid convergence index). Uniform: meshes with one element size everywhere
 * (mesh.size = mesh.raiserSize = h, no grading toward the raisers), h shrinking by sqrt(2),
 * until the true error is within the target. The reference is exact where a closed form holds
 * (Kirsch), otherwise a single mesh five times finer than the default in every size.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseModelText } from '../model/load.js';
import type { Model } from '../model/schema.js';
import { analyseOnMesh, prepareModel, type Analysis, type PreparedModel } from '../pipeline/analyse.js';
import { certifyPrepared, governingKt } from '../pipeline/certify.js';
import { kirschField } from '../verify/exact.js';
import { exactTractionPrepared, quarterHolePlate } from '../verify/suite.js';

interface Case {
  name: string;
  /** builds the prepared model with the given mesh settings */
  prepare: (mesh?: Model['mesh']) => PreparedModel;
  /** exact peak / nominal, when a closed form holds */
  exact?: number;
  /** a length for the uniform series to start from */
  h0: number;
}

function meshFile(name: string): Model {
  const path = fileURLToPath(new URL(`../../meshes/${name}`, import.meta.url));
  return parseModelText(readFileSync(path, 'utf8'), name);
}

function fromFile(name: string) {
  const model = meshFile(name);
  return (mesh?: Model['mesh']) => prepareModel(mesh ? { ...model, mesh } : model);
}

function cases(): Case[] {
  return [
    {
      name: 'Kirsch plate, exact tractions (quarter)',
      prepare: (mesh) => {
        const m = quarterHolePlate();
        return exactTractionPrepared(mesh ? { ...m, mesh } : m, kirschField(1, 100, 0, 0));
      },
      exact: 3,
      h0: 2,
    },
    { name: 'plate with a central hole, d/W = 0.2', prepare: fromFile('hole-dW-0p2.json'), h0: 8 },
    { name: 'shoulder fillets in tension, D/d = 2, r/d = 0.1', prepare: fromFile('stepped-bar-Dd-2-rd-0p1.json'), h0: 4 },
    { name: 'opposite U-notches, t/r = 4', prepare: fromFile('u-notches-opposite-tr-4.json'), h0: 4 },
  ];
}

/** Peak over nominal: Kt net, or for the exact-traction case the peak over the remote stress. */
function ratio(c: Case, a: Analysis): number {
  return c.exact !== undefined ? Math.abs(a.peak.stress) / 100 : (governingKt(a).net ?? NaN);
}

export function runAdaptiveBench(log: (s: string) => void = console.log): void {
  log('| case | target | uniform: DOF to reach it | uniform: time | adaptive: DOF to reach it | uniform / adaptive DOF | certified: final DOF | certified: band | certified: true error | certified: time |');
  log('|---|---|---|---|---|---|---|---|---|---|');
  for (const c of cases()) {
    // Without a closed form, the reference is a single mesh five times finer than the default.
    const reference = c.exact ?? ratio(c, analyseOnMesh(c.prepare(), { sizeFactor: 0.2 }));
    for (const target of [0.01, 0.005]) {
      certifyPrepared(c.prepare(), { target }); // warm-up
      const t0 = performance.now();
      const cert = certifyPrepared(c.prepare(), { target });
      const tAdapt = performance.now() - t0;
      const finalDofs = cert.meshes[cert.meshes.length - 1].dofs;
      const trueError = Math.abs(ratio(c, cert.analysis) / reference - 1);
      // The first mesh of the adaptive series whose true error is within the target.
      const within = cert.meshes.find((m) => Math.abs((c.exact !== undefined ? Math.abs(m.peak) / 100 : (m.raisers[0]?.kt.net ?? NaN)) / reference - 1) <= target);
      // Uniform series: shrink h until the true error is within the target.
      let h = c.h0;
      let uDofs = NaN;
      let uTime = 0;
      for (let k = 0; k < 14; k++) {
        const t1 = performance.now();
        const a = analyseOnMesh(c.prepare({ size: h, raiserSize: h }));
        uTime += performance.now() - t1;
        if (Math.abs(ratio(c, a) / reference - 1) <= target) {
          uDofs = 2 * a.mesh.nNodes;
          break;
        }
        if (2 * a.mesh.nNodes > 2e6) break;
        h /= Math.SQRT2;
      }
      const aDofs = within ? within.dofs : NaN;
      log(
        `| ${c.name} | ${100 * target}% | ${Number.isFinite(uDofs) ? uDofs : '> 2e6'} | ${uTime.toFixed(0)} ms | ${Number.isFinite(aDofs) ? aDofs : '-'} | ${Number.isFinite(uDofs) && Number.isFinite(aDofs) ? (uDofs / aDofs).toFixed(1) : '-'} | ${finalDofs} | ${(100 * (cert.gci?.gci ?? NaN)).toFixed(2)}% | ${(100 * trueError).toFixed(3)}% | ${tAdapt.toFixed(0)} ms |`,
      );
    }
  }
}
