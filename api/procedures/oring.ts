import { type OringOutput, oringInput, oringOutput } from "../../contracts/oring.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { evaluateRuleSetOverElements } from "../../domain/rules/element-verdicts.js";
import { ruleSetForAnalysis } from "../map/analysis-rule-set.js";
import { ORING_COMPUTES, oringElementInputs } from "../../domain/rules/metrics-of-reverse-current.js";
import { solveOring } from "../../domain/solve/oring-network.js";
import { stageTjMaxC } from "../../domain/stages/stage-model.js";
import { stageLabel } from "../map/reverse-inputs.js";
import { resolveStage } from "../map/resolve-stage.js";
import { inputProblem } from "../input-problem.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const oring = defineProcedure({
  name: "oring",
  input: oringInput,
  output: oringOutput,
  handler: ({ input, ctx }): Answer<OringOutput> => {
    const assumptions: string[] = ["sources sink reverse current (a battery does; many bench supplies do not)"];
    const set = ruleSetForAnalysis(input.ruleSet, input.ruleMetrics, ORING_COMPUTES, "oring", ctx);
    const resolved = input.sources.map((s, k) =>
      resolveStage(s.stage, ctx.catalog, ["sources", k, "stage"], assumptions),
    );
    const r = solveOring({
      sources: input.sources.map((s, k) => ({
        openCircuitV: s.openCircuitV,
        internalResistanceOhm: s.internalResistanceOhm,
        ...(s.currentLimitA === undefined ? {} : { currentLimitA: s.currentLimitA }),
        stage: (resolved[k] ?? unreachable()).model,
      })),
      load: input.load,
      ambientC: input.ambientC,
    });
    const rules =
      set === undefined || r.outcome === "no-sources"
        ? undefined
        : evaluateRuleSetOverElements(
            set,
            oringElementInputs(
              resolved.map((s) => s.model),
              input.sources.map((s) => s.name),
              input.load,
              r,
              input.ruleMetrics ?? {},
            ),
          );
    const head = {
      modelVersion: MODEL_VERSION,
      caution: CAUTION,
      assumptions,
      ...(rules === undefined ? {} : { rules }),
    };
    switch (r.outcome) {
      case "no-sources":
        throw inputProblem("invalid-input", [r.path], r.reason);
      case "load-collapse":
        return { outcome: r.outcome, ...head, reason: r.reason };
      case "thermal-runaway":
        return { outcome: r.outcome, ...head, reason: r.reason, lastTjC: [...r.lastTjC] };
      case "solved": {
        const branches = r.branches.map((b, k) => {
          const src = input.sources[k];
          const st = resolved[k] ?? unreachable();
          return {
            ...(src?.name === undefined ? {} : { name: src.name }),
            stage: stageLabel(st.spec, st.partId),
            currentA: b.currentA,
            mode: b.mode,
            ...(b.forwardMode === undefined ? {} : { forwardMode: b.forwardMode }),
            blocks: b.blocks,
            reverseCurrentA: Math.max(0, -b.currentA),
            stageV: b.stageV,
            stageLossW: b.stageLossW,
            resistanceLossW: b.resistanceLossW,
            limiterLossW: b.limiterLossW,
            currentLimited: b.currentLimited,
            tjC: b.tjC,
            tjMaxC: stageTjMaxC(st.model),
            share: b.share,
          };
        });
        const forward = branches.filter((b) => b.currentA > 0);
        return {
          outcome: "solved",
          ...head,
          nodeV: r.nodeV,
          loadCurrentA: r.loadCurrentA,
          kclResidualA: r.kclResidualA,
          totalStageLossW: r.totalStageLossW,
          totalResistanceLossW: r.totalResistanceLossW,
          thermalIterations: r.thermalIterations,
          branches,
          metrics: {
            maxReverseCurrentA: Math.max(0, ...branches.map((b) => b.reverseCurrentA)),
            allReverseBlocked: branches.every((b) => b.currentA >= 0 || b.blocks),
            maxStageTjC: Math.max(...branches.map((b) => b.tjC)),
            anyOverTemperature: branches.some((b) => b.tjC > b.tjMaxC),
            minShare: forward.length === 0 ? 0 : Math.min(...forward.map((b) => b.share)),
          },
        };
      }
    }
  },
});

function unreachable(): never {
  throw new Error("unreachable: one resolved stage per source");
}
