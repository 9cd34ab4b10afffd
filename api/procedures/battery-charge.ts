import { type BatteryChargeOutput, batteryChargeInput, batteryChargeOutput } from "../../contracts/battery-charge.js";
import { chargeBattery } from "../../domain/checks/battery-charging.js";
import type { BatteryModel } from "../../domain/physics/battery-ocv.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { ruleSetForAnalysis } from "../map/analysis-rule-set.js";
import { batteryChargeRuleInput, CHARGE_COMPUTES } from "../../domain/rules/metrics-of-reverse-current.js";
import { stageLabel } from "../map/reverse-inputs.js";
import { resolveStage } from "../map/resolve-stage.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

const SECONDS_PER_HOUR = 3600;
const DEFAULT_MAX_TIME_S = 7 * 24 * 3600;

type BatteryIn = {
  capacityAh: number;
  ocvPoints: { soc: number; voltageV: number }[];
  internalResistanceOhm: number;
  initialSoc: number;
};
const toBattery = (b: BatteryIn): BatteryModel => ({
  capacityC: b.capacityAh * SECONDS_PER_HOUR,
  ocvPoints: b.ocvPoints,
  internalResistanceOhm: b.internalResistanceOhm,
  initialSoc: b.initialSoc,
});

export const batteryCharge = defineProcedure({
  name: "batteryCharge",
  input: batteryChargeInput,
  output: batteryChargeOutput,
  handler: ({ input, ctx }): Answer<BatteryChargeOutput> => {
    const assumptions: string[] = [
      "stage junction temperature quasi-static (thermal time constants ≪ charge time)",
      "stage quiescent current not drawn from the source",
    ];
    const stop = {
      targetSoc: input.stop?.targetSoc ?? 1,
      minCurrentA: input.stop?.minCurrentA ?? 1e-3 * input.target.capacityAh,
      sourceMinSoc: input.stop?.sourceMinSoc ?? 0,
      maxTimeS: input.stop?.maxTimeS ?? DEFAULT_MAX_TIME_S,
    };
    if (input.stop?.targetSoc === undefined) assumptions.push("stop.targetSoc: 1 (default: charge to full)");
    if (input.stop?.minCurrentA === undefined)
      assumptions.push(`stop.minCurrentA: ${stop.minCurrentA} A (1e-3 of the target's capacity per hour)`);
    if (input.stop?.maxTimeS === undefined) assumptions.push("stop.maxTimeS: 7 days");
    const rtol = input.relativeTolerance ?? 1e-7;
    const set = ruleSetForAnalysis(input.ruleSet, input.ruleMetrics, CHARGE_COMPUTES, "batteryCharge", ctx);
    const stages = input.stages.map((s, k) => {
      const stage = resolveStage(s, ctx.catalog, ["stages", k], assumptions);
      const result = chargeBattery({
        source: toBattery(input.source),
        target: toBattery(input.target),
        stage: stage.model,
        ...(input.currentLimitA === undefined ? {} : { currentLimitA: input.currentLimitA }),
        ambientC: input.ambientC,
        stop,
        rtol,
      });
      const rev = result.outcome === "charged" || result.outcome === "no-charge" ? result.reverse : undefined;
      const metrics = {
        targetCanDrainSource: rev === undefined ? false : !rev.blocks,
        backCurrentA: rev?.backCurrentA ?? 0,
        ...(result.outcome === "charged"
          ? {
              finalTargetSoc: result.finalTargetSoc,
              chargeTimeS: result.timeS,
              stageLossJ: result.energy.stageLossJ,
              peakStageTjC: result.peakStageTjC,
              overTemperature: result.overTemperature,
            }
          : {}),
      };
      const rules =
        set === undefined
          ? undefined
          : evaluateRuleSet(set, batteryChargeRuleInput(stage.model, result, input.ruleMetrics ?? {}));
      return {
        stage: stageLabel(stage.spec, stage.partId),
        result,
        metrics,
        ...(rules === undefined ? {} : { rules }),
      };
    });
    return { modelVersion: MODEL_VERSION, caution: CAUTION, assumptions, stages };
  },
});
