import type { TransientContext } from "../checks/transient-stress.js";
import { type SweptTransientResult, sweptTransientStress } from "../checks/transient-sweep.js";
import type { StageModel } from "../stages/stage-model.js";
import type { PulseBackConduction } from "./review-pulse-back-conduction.js";
import type { TransientPulse } from "./transient-library.js";

/**
 * The negative pulses' element stresses and the back-conduction model telling one story: where a
 * supply-gated FET's channel let go with the output still above 0 V (review-pulse-back-conduction.ts),
 * that pulse's stresses again with the output its body diode then holds (transient-stress.ts
 * letGoOutputV: |peak| + V_out, the conservative figure); every other pulse as it was, in order.
 */
export function stressAfterLetGo(
  stage: StageModel,
  pulses: readonly TransientPulse[],
  transients: readonly SweptTransientResult[],
  backConduction: readonly PulseBackConduction[],
  ctx: TransientContext,
): readonly SweptTransientResult[] {
  const held = new Map<string, number>();
  for (const b of backConduction)
    if (b.outcome === "assessed" && b.outputAtLetGoV !== undefined && b.outputAtLetGoV > 0)
      held.set(b.pulseId, b.outputAtLetGoV);
  if (held.size === 0) return transients;
  return pulses.flatMap((p) => {
    const v = held.get(p.id);
    if (v === undefined) return transients.filter((t) => t.pulseId === p.id);
    return sweptTransientStress(stage, p, Object.assign({}, ctx, { letGoOutputV: v }));
  });
}
