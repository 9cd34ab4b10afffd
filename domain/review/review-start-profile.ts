import { alongProfile, type ProfileResult } from "../checks/start-up.js";
import type { StageModel } from "../stages/stage-model.js";
import type { ReviewCandidate, ReviewRequirement } from "./candidate-review.js";
import { atLowestCurrentLimit } from "./switch-tolerance.js";

/**
 * The start-up profile (start-up.ts), for an integrated switch with a minimum current limit at
 * the worst limit for each figure, as the corners: the samples, the load's supply and dropout at
 * the minimum; the junction's peak and the thermal shutdown's first instant at whichever limit
 * heats more (the limiting loss is not monotonic in I_lim).
 */
export function profileAtWorstLimit(
  stage: StageModel,
  req: ReviewRequirement,
  profile: readonly { readonly timeS: number; readonly voltageV: number }[],
  ambientC: number,
  cand: ReviewCandidate,
): ProfileResult {
  const run = (s: StageModel) =>
    alongProfile(s, profile, req.load, req.sourceResistanceOhm, ambientC, cand.transientThermal);
  const atMin = atLowestCurrentLimit(stage, cand.switchTolerance);
  if (atMin === stage) return run(stage);
  const low = run(atMin);
  const typical = run(stage);
  const trips = [low.thermalShutdownAtS, typical.thermalShutdownAtS].filter((t): t is number => t !== undefined);
  return {
    ...low,
    maxTjC: Math.max(low.maxTjC, typical.maxTjC),
    ...(trips.length === 0 ? {} : { thermalShutdownAtS: Math.min(...trips) }),
  };
}
