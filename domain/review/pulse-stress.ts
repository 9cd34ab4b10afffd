import type { TransientContext } from "../checks/transient-stress.js";
import { type SweptTransientResult, sweptTransientStress } from "../checks/transient-sweep.js";
import type { StageModel } from "../stages/stage-model.js";
import type { PulseBackConduction } from "./review-pulse-back-conduction.js";
import type { TransientPulse } from "./transient-library.js";

/**
 * The negative pulses' element stresses and the back-conduction model telling one story: where a
 * supply-gated FET's channel let go with the output still above 0 V (review-pulse-back-conduction.ts),
 * that pulse's stresses again with the output its body diode then holds (transient-stress.ts
 * letGoOutputV: |peak| + V_out, the conservative figure), or where it let go with more than the
 * element's breakdown across it (driveV, below); every other pulse as it was, in order.
 */
export function stressAfterLetGo(
  stage: StageModel,
  pulses: readonly TransientPulse[],
  transients: readonly SweptTransientResult[],
  backConduction: readonly PulseBackConduction[],
  ctx: TransientContext,
): readonly SweptTransientResult[] {
  const held = new Map<string, number>();
  for (const b of backConduction) {
    if (b.outcome === "assessed" && b.outputAtLetGoV !== undefined && b.outputAtLetGoV > 0)
      held.set(b.pulseId, b.outputAtLetGoV);
    // The channel let go with more across the element than its breakdown (clamp-below-drive): the
    // output then is at least driveV − |peak| (driveV = V_out + |V_in| at the let-go, |V_in| ≤ |peak|),
    // so the stress figure |peak| + V_out is at least driveV, the element's avalanche.
    if (b.outcome === "no-response" && b.driveV !== undefined) {
      const peakV = Math.max(0, ...transients.filter((t) => t.pulseId === b.pulseId).map((t) => -t.inputPeakV));
      if (b.driveV - peakV > 0) held.set(b.pulseId, b.driveV - peakV);
    }
  }
  if (held.size === 0) return transients;
  return pulses.flatMap((p) => {
    const v = held.get(p.id);
    if (v === undefined) return transients.filter((t) => t.pulseId === p.id);
    return sweptTransientStress(stage, p, Object.assign({}, ctx, { letGoOutputV: v }));
  });
}
