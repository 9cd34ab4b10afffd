import type { z } from "zod";
import {
  operatingPointInput,
  operatingPointOutput,
  type OperatingPointOutput,
  type SolvedPointOutput,
} from "../../contracts/operating-point.js";
import type { RuleSetResult } from "../../domain/rules/rule-model.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import type { Context } from "../context.js";
import { totalRthKPerW } from "../../domain/physics/thermal-path.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import {
  type OperatingPointOutcome,
  type SolvedPoint,
  type StartChatter,
  solveOperatingPoint,
} from "../../domain/solve/electrothermal-point.js";
import { controllerLossW } from "../../domain/stages/stage-behaviours.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { inputProblem } from "../input-problem.js";
import { OPERATING_POINT_METRICS, operatingPointRuleInput } from "../../domain/rules/metrics-of-operating-point.js";
import { resolveRuleSet } from "../map/rule-set.js";
import { resolveStage } from "../map/resolve-stage.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const operatingPoint = defineProcedure({
  name: "operatingPoint",
  input: operatingPointInput,
  output: operatingPointOutput,
  handler: ({ input, ctx }): Answer<OperatingPointOutput> => {
    const assumptions: string[] = [];
    const stage = resolveStage(input.stage, ctx.catalog, ["stage"], assumptions, input.thermal);
    const rthKPerW = totalRthKPerW(stage.model.thermal);
    const sourceResistanceOhm = input.sourceResistanceOhm ?? 0;
    if (input.sourceResistanceOhm === undefined)
      assumptions.push("sourceResistanceOhm: 0 ohm (default: no source or wiring resistance)");
    const outcome = solveOperatingPoint({
      stage: stage.model,
      supplyV: input.supplyV,
      sourceResistanceOhm,
      load: input.load,
      ambientC: input.ambientC,
      rthKPerW,
    });
    if ("point" in outcome && outcome.point.startChatter !== undefined) {
      const c = outcome.point.startChatter;
      assumptions.push(
        `point.startChatter: the supply lies in the chatter band at the ${c.startV} V start threshold (running, the input falls to ${c.runningInputV.toPrecision(4)} V; below start it is ${c.belowStartInputV.toPrecision(4)} V): the controller would toggle between the two states; the point below start, the lossier, is reported`,
      );
    }
    const rules = verdicts(input, stage.model, outcome, ctx);
    // Fields written one by one, no spread (V8 11 takes a slow clone path for a literal that spreads
    // and then adds fields; this runs once per /v1 call and batch line). Same keys, same order.
    const stageOut: { kind: StageModel["kind"]; name?: string; partId?: string } = { kind: stage.model.kind };
    if (stage.spec.name !== undefined) stageOut.name = stage.spec.name;
    if (stage.partId !== undefined) stageOut.partId = stage.partId;
    const head: Head = { modelVersion: MODEL_VERSION, caution: CAUTION, stage: stageOut, assumptions };
    if (rules !== undefined) head.rules = rules;
    const toPoint = (p: SolvedPoint): SolvedPointOutput => pointOutput(p, input.ambientC, rthKPerW, stage.model);
    return withHead(head, outcome, toPoint);
  },
});

/** The named rule set's verdicts on this point, with the caller's requirement metrics. */
function verdicts(
  input: OperatingPointInputParsed,
  stage: StageModel,
  outcome: OperatingPointOutcome,
  ctx: Context,
): RuleSetResult | undefined {
  if (input.ruleSet === undefined) return undefined;
  const set = resolveRuleSet(input.ruleSet, ctx, ["ruleSet"]);
  const callerMetrics = input.ruleMetrics ?? {};
  for (const n of OPERATING_POINT_METRICS) {
    if (Object.hasOwn(callerMetrics, n))
      throw inputProblem(
        "invalid-input",
        ["ruleMetrics", n],
        `${n} is computed by the operating point; leave it out of ruleMetrics`,
      );
  }
  return evaluateRuleSet(set, operatingPointRuleInput(stage, input.load, outcome, callerMetrics));
}

type OperatingPointInputParsed = z.output<typeof operatingPointInput>;

type Head = {
  -readonly [K in keyof Omit<
    Extract<OperatingPointOutput, { outcome: "solved" }>,
    "outcome" | "point" | "record"
  >]: Omit<Extract<OperatingPointOutput, { outcome: "solved" }>, "outcome" | "point" | "record">[K];
};

/** `{ outcome, ...head, ...fields }` in that key order, built without a spread literal. */
function headed<O extends OperatingPointOutcome["outcome"], T extends object>(
  outcome: O,
  head: Head,
  fields: T,
): { outcome: O } & Head & T {
  const out = { outcome } as { outcome: O } & Head & T;
  Object.assign(out, head, fields);
  return out;
}

function withHead(
  head: Head,
  o: OperatingPointOutcome,
  toPoint: (p: SolvedPoint) => SolvedPointOutput,
): Answer<OperatingPointOutput> {
  switch (o.outcome) {
    case "solved":
      return headed(o.outcome, head, { point: toPoint(o.point) });
    case "over-temperature":
      return headed(o.outcome, head, { reason: o.reason, tjMaxC: o.tjMaxC, point: toPoint(o.point) });
    case "load-undervoltage":
      return headed(o.outcome, head, { reason: o.reason, minVoltageV: o.minVoltageV, point: toPoint(o.point) });
    case "thermal-runaway":
      return headed(o.outcome, head, { reason: o.reason, evidence: o.evidence });
    case "load-collapse":
      return headed(o.outcome, head, {
        reason: o.reason,
        atJunctionC: o.atJunctionC,
        ...(o.maxDeliverablePowerW === undefined ? {} : { maxDeliverablePowerW: o.maxDeliverablePowerW }),
        ...(o.currentLimitA === undefined ? {} : { currentLimitA: o.currentLimitA }),
      });
    case "stage-off":
      return headed(o.outcome, head, { reason: o.reason, stageInputV: o.stageInputV });
  }
}

function pointOutput(p: SolvedPoint, ambientC: number, rthKPerW: number, stage: StageModel): SolvedPointOutput {
  const f = p.forward;
  // thermalLoopGain last, after the optional gate fields (the key order of the output)
  const out: Omit<SolvedPointOutput, "thermalLoopGain"> & {
    -readonly [K in "gateSourceV" | "channelResistanceOhm" | "thermalLoopGain"]?: number;
  } = {
    mode: f.mode,
    currentA: p.currentA,
    sourceCurrentA: p.sourceCurrentA,
    stageInputV: p.stageInputV,
    dropV: f.dropV,
    loadV: p.loadV,
    loadPowerW: p.loadV * p.currentA,
    stageLossW: p.dieLossW,
    controllerLossW: controllerLossW(stage, p.stageInputV),
    tjC: p.tjC,
    ambientC,
    rthKPerW,
    channelCurrentA: f.channelCurrentA,
    bodyDiodeCurrentA: f.bodyDiodeCurrentA,
    bodyDiodeTimeFraction: f.bodyDiodeTimeFraction,
  };
  if (f.gateSourceV !== undefined) out.gateSourceV = f.gateSourceV;
  if (f.channelResistanceOhm !== undefined) out.channelResistanceOhm = f.channelResistanceOhm;
  out.thermalLoopGain = p.thermalLoopGain;
  if (p.startChatter !== undefined) (out as { startChatter?: StartChatter }).startChatter = p.startChatter;
  return out as SolvedPointOutput;
}
