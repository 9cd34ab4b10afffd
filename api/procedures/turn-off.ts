import { behaviourOf } from "../../domain/stages/stage-behaviours.js";
import { type TurnOffOutput, turnOffInput, turnOffOutput } from "../../contracts/turn-off.js";
import { turnOffEventFields } from "../map/turn-off-output.js";
import { type TurnOffModel, turnOffEvent } from "../../domain/checks/turn-off-event.js";
import { turnOffWaveform } from "../../domain/checks/turn-off-waveform.js";
import { stageAvalancheEnergyJ } from "../../domain/checks/stage-ratings.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { ruleSetForAnalysis } from "../map/analysis-rule-set.js";
import { TURN_OFF_COMPUTES, turnOffRuleInput } from "../../domain/rules/metrics-of-reverse-current.js";
import {
  controllerTiming,
  loadMinimumV,
  gateLagOf,
  missingQrrSentence,
  ONE_OFF_EVENT,
  stageLabel,
} from "../map/reverse-inputs.js";
import { resolveStage } from "../map/resolve-stage.js";
import { decayingInput } from "../map/turn-off-requirement.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const turnOff = defineProcedure({
  name: "turnOff",
  input: turnOffInput,
  output: turnOffOutput,
  handler: ({ input, ctx }): Answer<TurnOffOutput> => {
    const assumptions: string[] = [];
    const set = ruleSetForAnalysis(input.ruleSet, input.ruleMetrics, TURN_OFF_COMPUTES, "turnOff", ctx);
    const stage = resolveStage(input.stage, ctx.catalog, ["stage"], assumptions);
    const partRatingJ = stageAvalancheEnergyJ(stage.model);
    const avalancheRatingJ = input.avalancheRatingJ ?? partRatingJ;
    if (input.avalancheRatingJ === undefined && partRatingJ !== undefined)
      assumptions.push(`avalancheRatingJ: the part's avalancheEnergyJ (${partRatingJ} J at 25 °C starting Tj)`);
    if (input.repetitive === undefined) assumptions.push(ONE_OFF_EVENT("repetitive"));
    const controller = controllerTiming(stage.spec, stage.model, input.turnOff, ["turnOff"], assumptions);
    if (input.clampV === undefined)
      assumptions.push(
        "clampV: the blocking element's rated voltage (a lower bound of its breakdown: the energy estimate is conservative)",
      );
    if (behaviourOf(stage.model).junctionRecovery) {
      if (input.reverseRecoveryChargeC === undefined)
        assumptions.push(missingQrrSentence("reverseRecoveryChargeC", stage.model.kind));
    }
    const gateLagS = gateLagOf(input.gateLag, stage.model, "gateLag", assumptions);
    const model: TurnOffModel = {
      stage: stage.model,
      outputV: input.outputV,
      inputAfterV: input.inputAfterV,
      ...decayingInput(input.inputDecay),
      loopResistanceOhm: input.loop.resistanceOhm,
      loopInductanceH: input.loop.inductanceH,
      capacitanceF: input.capacitor.capacitanceF,
      esrOhm: input.capacitor.esrOhm,
      load: input.load,
      loadMinV: loadMinimumV(input.load, input.loadMinV, ["loadMinV"]),
      tjC: input.tjC,
      ...(controller === undefined ? {} : { controller }),
      ...(input.reverseRecoveryChargeC === undefined ? {} : { reverseRecoveryChargeC: input.reverseRecoveryChargeC }),
      ...(input.clampV === undefined ? {} : { clampV: input.clampV }),
      ...(avalancheRatingJ === undefined ? {} : { avalancheRatingJ }),
      ...(gateLagS === undefined ? {} : { gateLagS }),
    };
    const r = turnOffEvent(model);
    const waveform = input.waveform ? turnOffWaveform(model, r) : undefined;
    const rules =
      set === undefined
        ? undefined
        : evaluateRuleSet(
            set,
            turnOffRuleInput(
              stage.model,
              r,
              {
                tjC: input.tjC,
                repetitive: input.repetitive ?? false,
                ...(input.loadReverseLimitV === undefined ? {} : { loadReverseLimitV: input.loadReverseLimitV }),
              },
              avalancheRatingJ,
              input.ruleMetrics ?? {},
            ),
          );
    const head = {
      modelVersion: MODEL_VERSION,
      caution: CAUTION,
      stage: stageLabel(stage.spec, stage.partId),
      assumptions,
      ...(rules === undefined ? {} : { rules }),
    };
    return { ...head, ...turnOffEventFields(r, input.outputV, waveform) };
  },
});
