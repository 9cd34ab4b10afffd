import { cornerThermal } from "../checks/corners.js";
import type { CandidateReview } from "../review/candidate-review.js";
import type { StageModel } from "../stages/stage-model.js";
import type { Scope } from "./metrics-of-review-hazards.js";

/**
 * An integrated switch's protections → the rule vocabulary: overvoltageCutoffV (the lowest input
 * at which the switch can be open in service), switchCurrentLimitA and stageCurrentMaxA, and
 * thermalShutdownInService. Out of scope with why for a stage without the protection.
 */
export function switchProtectionMetrics(stage: StageModel, r: CandidateReview, s: Scope): void {
  // The lowest cut-off threshold against the steady supply (what reaches the load is at the highest),
  // or after an excursion above it the level it recloses below (threshold − hysteresis, cutoff-hysteresis.ts).
  const hold = r.loadOvervoltage.hold;
  const cutoffV = hold?.excursion === undefined ? r.switchLimits.overvoltageCutoffV : hold.reclosesBelowV;
  if (cutoffV !== undefined) s.metrics["overvoltageCutoffV"] = cutoffV;
  else s.notRequired["overvoltageCutoffV"] = "the stage has no overvoltage cut-off";
  currentLimitMetrics(r, s);
  thermalShutdownMetrics(stage, r, s);
}

/**
 * An integrated switch's current limit against the highest current of the corners: a load that
 * needs the limit or more is held at it (the forward law limits, integrated-switch.ts), a resistive
 * load then at I_lim·R, a constant-current or constant-power one collapsing at the limit, which
 * counts as the limit reached. Any other corner without an operating point leaves the figure
 * unavailable. The limit is the lowest (datasheetMax.currentLimitMinA, else the typical).
 */
function currentLimitMetrics(r: CandidateReview, s: Scope): void {
  // The lowest limit (datasheet minimum where given) against the corners' highest current.
  const limitA = r.switchLimits.currentLimitA;
  if (limitA === undefined) {
    for (const n of ["stageCurrentMaxA", "switchCurrentLimitA"]) s.notRequired[n] = "the stage has no current limit";
    return;
  }
  s.metrics["switchCurrentLimitA"] = limitA;
  let maxA = 0;
  for (const [i, c] of r.corners.entries()) {
    if (c.result.outcome === "load-collapse" && c.result.currentLimitA !== undefined) {
      maxA = Math.max(maxA, c.result.currentLimitA);
      continue;
    }
    if (!("point" in c.result)) {
      s.unavailable["stageCurrentMaxA"] =
        `corner ${i} has no operating point (${c.result.outcome}: ${c.result.reason})`;
      return;
    }
    maxA = Math.max(maxA, c.result.point.currentA);
  }
  s.metrics["stageCurrentMaxA"] = maxA;
}

/**
 * Whether an integrated switch reaches its thermal shutdown in service: a steady corner of the
 * review with Tj = Ta + Rth·P(Tj) at or above thermalShutdownC (at the current limit P is the drop
 * the load leaves times I_lim, at the limit that heats more: corners.ts cornerThermal), or the
 * start-up profile's junction reaching it (start-up.ts: through the Foster network where given,
 * else each instant's steady Tj, an upper bound). The part then turns its channel off and the
 * load loses its supply: latched off, or cycling on and off when it retries (review-shutdown-cycle.ts),
 * the load interrupted either way. A corner in thermal runaway heats the die until the shutdown
 * trips when the shutdown lies within the search; a corner whose load collapses at the current
 * limit has no figure (the current-limit rule fails it). A point below start (body diode, channel
 * off) is not a shutdown.
 */
function thermalShutdownMetrics(stage: StageModel, r: CandidateReview, s: Scope): void {
  const shutdownC = stage.kind === "integrated-switch" ? stage.thermalShutdownC : undefined;
  if (shutdownC === undefined) {
    s.notRequired["thermalShutdownInService"] = "the stage states no thermal shutdown temperature";
    return;
  }
  const inProfile = r.startUp.profiles.some((p) => p.result.thermalShutdownAtS !== undefined);
  if (inProfile) {
    s.metrics["thermalShutdownInService"] = true;
    return;
  }
  let shutsDown = false;
  for (const [i, c] of r.corners.entries()) {
    // at the current limit that heats the die more (corners.ts: cornerThermal)
    const res = cornerThermal(c);
    if ("point" in res) {
      const mode = res.point.forward.mode;
      if (mode !== "body-diode" && mode !== "junction" && res.point.tjC >= shutdownC) shutsDown = true;
      continue;
    }
    if (res.outcome === "stage-off") continue; // open switch: no current, no heat
    if (res.outcome === "thermal-runaway" && res.evidence.searchedToC >= shutdownC) {
      shutsDown = true;
      continue;
    }
    s.unavailable["thermalShutdownInService"] = `corner ${i} has no operating point (${res.outcome}: ${res.reason})`;
    return;
  }
  s.metrics["thermalShutdownInService"] = shutsDown;
}
