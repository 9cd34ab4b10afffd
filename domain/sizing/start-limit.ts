import { cToK } from "../physics/constants.js";
import { solveElectrical } from "../solve/electrical-point.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";
import type { SizingContext } from "./assessment.js";
import { fmt, limitItem, type SpecItem } from "./spec-item.js";

/** The stage with its control starting at startV (its kind's own, domain/stages/). */
export function withStartV<S extends StageModel>(stage: S, startV: number): S {
  return behaviourOf(stage).withStartV(stage, startV);
}

/**
 * The highest start voltage at which the controller runs all along the start-up profile: the
 * controller runs while its input (the supply less the source drop) is at or above its start
 * voltage, so the limit is the lowest stage-input voltage of the profile with the controller
 * running. The profile is replayed exactly as the review does (start-up.ts, every ambient, the
 * same samples and junction temperatures) on the part with the controller always running;
 * samples where the load has no operating point even then do not count (no start voltage helps).
 */
export function startAlongProfileLimit(ctx: SizingContext, stage: StageModel, startV: number): SpecItem {
  const base = {
    id: "startAlongProfileMaxV",
    title: "highest start voltage that keeps the controller running along the start-up profile",
    unit: "V",
    bound: "at-most" as const,
  };
  const req = ctx.requirement;
  if (req.startProfile === undefined)
    return { ...base, outcome: "not-required", reason: "the requirement gives no start-up profile" };
  const running = withStartV(stage, 0);
  const review = ctx.assess(running).review;
  let lowest: { v: number; t: number; ambientC: number; supplyV: number } | undefined;
  let skipped = 0;
  for (const p of review.startUp.profiles) {
    for (const s of p.result.samples) {
      const e = solveElectrical(
        { stage: running, supplyV: s.supplyV, sourceResistanceOhm: req.sourceResistanceOhm, load: req.load },
        cToK(s.tjC),
      );
      if (!e.ok || (req.load.kind === "constant-power" && e.point.loadV < req.load.minVoltageV)) {
        skipped += 1;
        continue;
      }
      if (lowest === undefined || e.point.stageInputV < lowest.v)
        lowest = { v: e.point.stageInputV, t: s.timeS, ambientC: p.ambientC, supplyV: s.supplyV };
    }
  }
  const source = { kind: "requirement" as const, field: "startProfile", severity: "fail" as const };
  if (lowest === undefined)
    return {
      ...base,
      outcome: "impossible",
      source,
      reason: "the load has no operating point anywhere along the profile, whatever the start voltage",
    };
  return limitItem(base, lowest.v, startV, {
    corner: `start-up profile at t = ${fmt(lowest.t)} s (supply ${fmt(lowest.supplyV)} V, ${lowest.ambientC} °C ambient)`,
    conditions: { timeS: lowest.t, supplyV: lowest.supplyV, ambientC: lowest.ambientC },
    source,
    reason: `the controller's input falls to ${fmt(lowest.v)} V along the profile${skipped > 0 ? ` (${skipped} samples where the load drops out even with the controller running are not counted)` : ""}: a higher start voltage hands the load to the body diode (or blocks it) there`,
  });
}
