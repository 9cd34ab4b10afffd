import type { z } from "zod";
import type { monteCarloResult, monteCarloSpec } from "../../contracts/review.js";
import { gateThresholdColdV, withThresholdShift } from "../../domain/checks/gate-threshold.js";
import { distributionOf, monteCarlo } from "../../domain/checks/monte-carlo.js";
import type { ReviewRequirement } from "../../domain/review/candidate-review.js";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import { evaluateRule } from "../../domain/rules/evaluate-rules.js";
import type { RuleInput } from "../../domain/rules/rule-model.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import { type DatasheetMaxSpec, datasheetMaxScale, mosfetThresholdV, thresholdMinShiftV } from "./datasheet-max.js";

/**
 * Monte Carlo of one candidate at one condition (default: lowest supply, highest ambient, full
 * load): percentiles of junction temperature, loss, drop and load voltage, and the share of
 * samples each rule fails or warns on, with the sample's point standing in for the worst corner,
 * its start voltage for the candidate's, and its gate threshold (with the part's coefficient, at
 * the coldest ambient) in the cold gate overdrive. Where the candidate's datasheet gives a minimum
 * or maximum Vth, the sampled Vth spans that range (datasheetThresholdRange).
 */
export function reviewMonteCarlo(
  spec: z.output<typeof monteCarloSpec>,
  stage: StageModel,
  req: ReviewRequirement,
  base: RuleInput,
  set: CompiledRuleSet,
  datasheetMax?: DatasheetMaxSpec,
  path: (string | number)[] = [],
  assumptions: string[] = [],
): z.output<typeof monteCarloResult> {
  const tj: number[] = [];
  const loss: number[] = [];
  const drop: number[] = [];
  const loadV: number[] = [];
  const fails = new Map<string, number>();
  const warns = new Map<string, number>();
  let unsolved = 0;
  // Only the rules that read a sampled figure can change from sample to sample: the point's
  // figures and the sample's start voltage (the start checks read it).
  const sampled = new Set(["tjWorstC", "lossWorstW", "dropWorstV", "loadVMinV", "startVoltageV", "gateOverdriveColdV"]);
  const varying = set.rules.filter((r) => r.names.some((n) => sampled.has(n)));
  // One metrics record, its sampled figures overwritten per sample (read synchronously by the rules).
  const metrics: Record<string, number | boolean> = { ...base.metrics };
  const input = { ...base, metrics, unavailable: {} };
  // The cold gate overdrive with the sample's threshold: the drive at the lowest supply (the
  // candidate's) less the sampled Vth(25 °C) moved to the coldest ambient by the part's coefficient.
  const drive = base.metrics["gateDriveMinV"];
  const overdriveOf =
    typeof drive === "number" && typeof base.metrics["gateOverdriveColdV"] === "number"
      ? (shiftV: number) => drive - (gateThresholdColdV(withThresholdShift(stage, shiftV), req.ambientMinC) ?? 0)
      : undefined;
  const thresholdRangeV = datasheetThresholdRange(stage, datasheetMax, path, assumptions);
  const supplyV = spec.supplyV ?? req.supplyMinV;
  const ambientC = spec.ambientC ?? req.ambientMaxC;
  monteCarlo(
    {
      stage,
      supplyV,
      ambientC,
      sourceResistanceOhm: req.sourceResistanceOhm,
      load: req.load,
      tolerances: spec.tolerances,
      ...(thresholdRangeV === undefined ? {} : { thresholdRangeV }),
      samples: spec.samples,
      seed: spec.seed,
    },
    (s) => {
      if (!("point" in s.result)) {
        unsolved += 1;
        return;
      }
      const p = s.result.point;
      tj.push(p.tjC);
      loss.push(p.dieLossW);
      drop.push(p.forward.dropV);
      loadV.push(p.loadV);
      metrics["tjWorstC"] = p.tjC;
      metrics["lossWorstW"] = p.dieLossW;
      metrics["dropWorstV"] = p.forward.dropV;
      metrics["loadVMinV"] = p.loadV;
      if (s.startVoltageV !== undefined) metrics["startVoltageV"] = s.startVoltageV;
      if (overdriveOf !== undefined) metrics["gateOverdriveColdV"] = overdriveOf(s.draws.thresholdV);
      for (const rule of varying) {
        const v = evaluateRule(rule, input, set.stamp);
        if (v.outcome === "fail") fails.set(v.ruleId, (fails.get(v.ruleId) ?? 0) + 1);
        else if (v.outcome === "warn") warns.set(v.ruleId, (warns.get(v.ruleId) ?? 0) + 1);
      }
    },
  );
  const share = (m: Map<string, number>) =>
    Object.fromEntries([...m.entries()].sort(([a], [b]) => (a < b ? -1 : 1)).map(([k, v]) => [k, v / spec.samples]));
  return {
    candidate: spec.candidate ?? 0,
    samples: spec.samples,
    seed: spec.seed,
    supplyV,
    ambientC,
    shareWithoutOperatingPoint: unsolved / spec.samples,
    ...present("tjC", distributionOf(tj)),
    ...present("lossW", distributionOf(loss)),
    ...present("dropV", distributionOf(drop)),
    ...present("loadV", distributionOf(loadV)),
    shareFailingByRule: share(fails),
    shareWarningByRule: share(warns),
  };
}

/** `{ [key]: value }` when there is a value (no sample had a point: the key is left out). */
function present<K extends string, V>(key: K, value: V | undefined): { [k in K]?: V } {
  return value === undefined ? {} : ({ [key]: value } as { [k in K]?: V });
}

/**
 * The datasheet's Vth range as shifts from the typical (datasheetMax.thresholdMinV and
 * thresholdV; a bound not given: the typical), said in `assumptions`; undefined where neither is
 * given. The shifts are the review's own (thresholdMinShiftV, datasheetMaxScale), so the same
 * fields are refused for the same reasons.
 */
function datasheetThresholdRange(
  stage: StageModel,
  dm: DatasheetMaxSpec | undefined,
  path: (string | number)[],
  assumptions: string[],
): { minShiftV: number; maxShiftV: number } | undefined {
  if (dm === undefined || (dm.thresholdV === undefined && dm.thresholdMinV === undefined)) return undefined;
  const minShiftV = thresholdMinShiftV(dm, stage, path);
  const maxShiftV = datasheetMaxScale(dm, stage, path).thresholdShiftV ?? 0;
  const typical = mosfetThresholdV(stage) ?? 0;
  assumptions.push(
    `monteCarlo: the MOSFET's gate threshold drawn uniform over the datasheet's ${typical + minShiftV}–${typical + maxShiftV} V at 25 °C (${path.join(".")}.thresholdMinV/thresholdV; a bound not given: the typical ${typical} V), in place of any thresholdV tolerance`,
  );
  return { minShiftV, maxShiftV };
}
