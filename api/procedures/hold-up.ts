import { behaviourOf } from "../../domain/stages/stage-behaviours.js";
import { type HoldUpOutput, holdUpInput, holdUpOutput } from "../../contracts/hold-up.js";
import { type HoldUpModel, holdUp as holdUpCheck } from "../../domain/checks/hold-up.js";
import { blocksReverseCurrent } from "../../domain/checks/stage-ratings.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { ruleSetForAnalysis } from "../map/analysis-rule-set.js";
import { HOLD_UP_COMPUTES, holdUpRuleInput } from "../../domain/rules/metrics-of-reverse-current.js";
import { controllerTiming, loadMinimumV, gateLagOf, missingQrrSentence, stageLabel } from "../map/reverse-inputs.js";
import { holdUpAgainstRequirement } from "../map/hold-up-requirement.js";
import { resolveStage } from "../map/resolve-stage.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const holdUp = defineProcedure({
  name: "holdUp",
  input: holdUpInput,
  output: holdUpOutput,
  handler: ({ input, ctx }): Answer<HoldUpOutput> => {
    const assumptions: string[] = [];
    const set = ruleSetForAnalysis(input.ruleSet, input.ruleMetrics, HOLD_UP_COMPUTES, "holdUp", ctx);
    const loadMinV = loadMinimumV(input.load, input.loadMinV, ["loadMinV"]);
    const stages = input.stages.map((s, k) => {
      const stage = resolveStage(s, ctx.catalog, ["stages", k], assumptions);
      const inp = input.input;
      let modelInput: HoldUpModel["input"];
      if (inp.kind === "open") modelInput = { kind: "open" };
      else {
        const controller = controllerTiming(stage.spec, stage.model, inp.turnOff, ["input", "turnOff"], assumptions);
        if (inp.reverseRecoveryChargeC === undefined && behaviourOf(stage.model).junctionRecovery) {
          assumptions.push(missingQrrSentence("input.reverseRecoveryChargeC", stage.model.kind));
        }
        const gateLagS = gateLagOf(inp.gateLag, stage.model, "input.gateLag", assumptions);
        modelInput = {
          kind: "falls",
          inputAfterV: inp.inputAfterV,
          ...(inp.inputDecay === undefined
            ? {}
            : { inputDecay: { startV: inp.inputDecay.startV, tauS: inp.inputDecay.timeConstantS } }),
          loopResistanceOhm: inp.loop.resistanceOhm,
          loopInductanceH: inp.loop.inductanceH,
          ...(controller === undefined ? {} : { controller }),
          ...(inp.reverseRecoveryChargeC === undefined ? {} : { reverseRecoveryChargeC: inp.reverseRecoveryChargeC }),
          ...(inp.clampV === undefined ? {} : { clampV: inp.clampV }),
          ...(gateLagS === undefined ? {} : { gateLagS }),
        };
      }
      const result = holdUpCheck({
        stage: stage.model,
        outputV: input.outputV,
        capacitanceF: input.capacitor.capacitanceF,
        esrOhm: input.capacitor.esrOhm,
        load: input.load,
        loadMinV,
        tjC: input.tjC,
        input: modelInput,
      });
      const holdUpS =
        result.outcome === "holds" || result.outcome === "drains-back"
          ? result.holdUpS
          : result.outcome === "no-hold-up"
            ? 0
            : undefined;
      const metrics = {
        blocksReverseCurrent: blocksReverseCurrent(stage.model),
        ...(holdUpS === undefined ? {} : { holdUpS }),
        ...(holdUpS === undefined || input.requiredHoldUpS === undefined
          ? {}
          : { holdUpMarginS: holdUpS - input.requiredHoldUpS }),
        ...(result.outcome === "holds" ? { reverseLeakageA: result.reverseLeakageA } : {}),
      };
      const rules =
        set === undefined
          ? undefined
          : evaluateRuleSet(set, holdUpRuleInput(stage.model, result, input.requiredHoldUpS, input.ruleMetrics ?? {}));
      const req =
        input.requiredHoldUpS === undefined ? undefined : holdUpAgainstRequirement(result, input.requiredHoldUpS);
      return {
        stage: stageLabel(stage.spec, stage.partId),
        result,
        ...(req === undefined ? {} : req),
        metrics,
        ...(rules === undefined ? {} : { rules }),
      };
    });
    return { modelVersion: MODEL_VERSION, caution: CAUTION, assumptions, stages };
  },
});
