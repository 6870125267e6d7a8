/** The warning that the elastic peak is above the yield strength (local plastic flow). */
import type { Peak } from './peak.js';

/** The warning, or none when no yield strength is given or the peak is below it; stress in the model's unit. */
export function checkYield(peak: Peak, yieldStrength: number | undefined, stressUnit: string): string[] {
  if (yieldStrength === undefined || !(Math.abs(peak.stress) > yieldStrength)) return [];
  return [`the elastic peak stress ${peak.stress.toPrecision(4)} ${stressUnit} exceeds the yield strength ${yieldStrength} ${stressUnit}: local plastic flow is expected there and the linear result overstates the real peak stress`];
}
