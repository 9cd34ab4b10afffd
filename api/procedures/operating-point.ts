import type { z } from "zod";
import { operatingPointInput, type OperatingPointOutput, type SolvedPointOutput } from "../../contracts/operating-point.js";
import type { RuleSetResult } from "../../domain/rules/rule-model.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import type { Context } from "../context.js";
import { totalRthKPerW } from "../../domain/physics/thermal-path.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { type OperatingPointOutcome, type SolvedPoint, solveOperatingPoint } from "../../domain/solve/electrothermal-point.js";
import { stageQuiescentA } from "../../domain/stages/stage-model.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { inputProblem } from "../input-problem.js";
import { OPERATING_POINT_METRICS, operatingPointRuleInput } from "../map/operating-point-metrics.js";
import { resolveRuleSet } from "../map/rule-set.js";
import { resolveStage } from "../map/resolve-stage.js";
import { publicProcedure } from "../trpc.js";

export const operatingPoint = publicProcedure.input(operatingPointInput).query(({ input, ctx }): OperatingPointOutput => {
  const assumptions: string[] = [];
  const stage = resolveStage(input.stage, ctx.catalog, ["stage"], assumptions, input.thermal);
  const rthKPerW = totalRthKPerW(stage.model.thermal);
  const sourceResistanceOhm = input.sourceResistanceOhm ?? 0;
  const outcome = solveOperatingPoint({ stage: stage.model, supplyV: input.supplyV, sourceResistanceOhm, load: input.load, ambientC: input.ambientC, rthKPerW });
  const rules = verdicts(input, stage.model, outcome, ctx);
  const head = {
    modelVersion: MODEL_VERSION,
    caution: CAUTION,
    stage: { kind: stage.model.kind, ...(stage.spec.name === undefined ? {} : { name: stage.spec.name }), ...(stage.partId === undefined ? {} : { partId: stage.partId }) },
    assumptions,
    ...(rules === undefined ? {} : { rules }),
  };
  const toPoint = (p: SolvedPoint): SolvedPointOutput => pointOutput(p, input.ambientC, rthKPerW, stageQuiescentA(stage.model), stage.model.kind);
  return withHead(head, outcome, toPoint);
});

/** The named rule set's verdicts on this point, with the caller's requirement metrics. */
function verdicts(input: OperatingPointInputParsed, stage: StageModel, outcome: OperatingPointOutcome, ctx: Context): RuleSetResult | undefined {
  if (input.ruleSet === undefined) return undefined;
  const set = resolveRuleSet(input.ruleSet, ctx, ["ruleSet"]);
  const callerMetrics = input.ruleMetrics ?? {};
  for (const n of OPERATING_POINT_METRICS) {
    if (Object.hasOwn(callerMetrics, n)) throw inputProblem("invalid-input", ["ruleMetrics", n], `${n} is computed by the operating point; leave it out of ruleMetrics`);
  }
  return evaluateRuleSet(set, operatingPointRuleInput(stage, input.load, outcome, callerMetrics));
}

type OperatingPointInputParsed = z.output<typeof operatingPointInput>;

function withHead(
  head: Omit<Extract<OperatingPointOutput, { outcome: "solved" }>, "outcome" | "point">,
  o: OperatingPointOutcome,
  toPoint: (p: SolvedPoint) => SolvedPointOutput,
): OperatingPointOutput {
  switch (o.outcome) {
    case "solved":
      return { outcome: o.outcome, ...head, point: toPoint(o.point) };
    case "over-temperature":
      return { outcome: o.outcome, ...head, reason: o.reason, tjMaxC: o.tjMaxC, point: toPoint(o.point) };
    case "load-undervoltage":
      return { outcome: o.outcome, ...head, reason: o.reason, minVoltageV: o.minVoltageV, point: toPoint(o.point) };
    case "thermal-runaway":
      return { outcome: o.outcome, ...head, reason: o.reason, evidence: o.evidence };
    case "load-collapse":
      return {
        outcome: o.outcome,
        ...head,
        reason: o.reason,
        atJunctionC: o.atJunctionC,
        ...(o.maxDeliverablePowerW === undefined ? {} : { maxDeliverablePowerW: o.maxDeliverablePowerW }),
      };
    case "stage-off":
      return { outcome: o.outcome, ...head, reason: o.reason, stageInputV: o.stageInputV };
  }
}

function pointOutput(p: SolvedPoint, ambientC: number, rthKPerW: number, quiescentA: number, kind: string): SolvedPointOutput {
  const f = p.forward;
  return {
    mode: f.mode,
    currentA: p.currentA,
    sourceCurrentA: p.sourceCurrentA,
    stageInputV: p.stageInputV,
    dropV: f.dropV,
    loadV: p.loadV,
    loadPowerW: p.loadV * p.currentA,
    stageLossW: p.dieLossW,
    controllerLossW: kind === "nfet-ideal-diode" ? quiescentA * Math.max(p.stageInputV, 0) : 0,
    tjC: p.tjC,
    ambientC,
    rthKPerW,
    channelCurrentA: f.channelCurrentA,
    bodyDiodeCurrentA: f.bodyDiodeCurrentA,
    bodyDiodeTimeFraction: f.bodyDiodeTimeFraction,
    ...(f.gateSourceV === undefined ? {} : { gateSourceV: f.gateSourceV }),
    ...(f.channelResistanceOhm === undefined ? {} : { channelResistanceOhm: f.channelResistanceOhm }),
    thermalLoopGain: p.thermalLoopGain,
  };
}
