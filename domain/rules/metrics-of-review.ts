import { behaviourOf } from "../stages/stage-behaviours.js";
import { type CandidateReview, type ReviewRequirement, steadyOvervoltageV } from "../review/candidate-review.js";
import type { ReviewTurnOffResult } from "../review/review-turn-off.js";
import { mosfetBreakdownColdV } from "../checks/breakdown-temperature.js";
import { cornerUnsolved } from "../checks/corners.js";
import type { RuleInput } from "./rule-model.js";
import type { StageModel } from "../stages/stage-model.js";
import { otherAnalysesMetrics, putEventAvalanche, putEventFigures } from "./rule-input-draft.js";
import { missingRatings, partParameters, stageMetrics } from "./metrics-of-operating-point.js";
import { reviewHazardMetrics } from "./metrics-of-review-hazards.js";

/** What the design review computes for its rules (the soundness invariant reads it: domain/rules/computed-metrics.ts). */
export const REVIEW_COMPUTES = [
  "tjWorstC",
  "lossWorstW",
  "dropWorstV",
  "loadVMinV",
  "gateDriveMinV",
  "gateSourceVMaxV",
  // The steady reversed supply the blocking element sees (the requirement's reverse voltage).
  "reverseVMaxV",
  "reverseTransientVMaxV",
  "transientVMaxV",
  "reverseTjC",
  "reverseLeakageRunaway",
  "controllerReverseVMaxV",
  "clampEnergyJ",
  "clampPeakCurrentA",
  "clampPeakPowerW",
  "clampPeakPowerAllowedW",
  "clampTrainTjC",
  "startProfileDropoutS",
  "peakReverseCurrentA",
  "absorbedEnergyJ",
  "eventTjC",
  "avalancheEnergyAtTjJ",
  "loadReverseVMaxV",
  "eventTrainTjC",
  "vdsBreakdownColdV",
  "startChatter",
  "gateOverdriveColdV",
  "inrushTjC",
  "inrushCharges",
  "inrushSoaCurrentA",
  "inrushSoaAllowedA",
  "loadTransientVMaxV",
  "stageCurrentMaxA",
  "thermalShutdownInService",
  "cornersWithoutOperatingPoint",
] as const;

export interface RequirementFlags {
  readonly standbyBudgetA?: number;
  readonly lossBudgetW?: number;
  readonly parallelSources: boolean;
  readonly holdUpRequired: boolean;
}

/**
 * A candidate's review → the rule vocabulary. The worst-corner figures come from the corners that
 * have an operating point; when any corner has none, they are marked unavailable (with the
 * corner's outcome), so their rules cannot pass, and cornersWithoutOperatingPoint counts them, so
 * that the rule reading it fails.
 */
export function reviewRuleInput(
  stage: StageModel,
  req: ReviewRequirement,
  flags: RequirementFlags,
  r: CandidateReview,
): RuleInput {
  // stageMetrics returns a fresh record: filled in place (the keys in the order a spread would give).
  const metrics = stageMetrics(stage);
  // The start checks' start voltage: the datasheet maximum where the candidate gives one.
  if (r.startVoltageV !== undefined) metrics["startVoltageV"] = r.startVoltageV;
  metrics["supplyMinV"] = req.supplyMinV;
  metrics["supplyMaxV"] = req.supplyMaxV;
  metrics["reverseVMaxV"] = req.reverseV;
  metrics["parallelSources"] = flags.parallelSources;
  metrics["holdUpRequired"] = flags.holdUpRequired;
  metrics["blocksReverseCurrent"] = r.blocksReverseCurrent;
  const unavailable: Record<string, string> = {};
  const notRequired: Record<string, string> = {};
  if (req.loadMinV !== undefined) metrics["loadMinV"] = req.loadMinV;
  else notRequired["loadMinV"] = "the requirement states no minimum load voltage";
  if (flags.standbyBudgetA !== undefined) metrics["standbyBudgetA"] = flags.standbyBudgetA;
  else notRequired["standbyBudgetA"] = "the requirement sets no standby budget";
  if (flags.lossBudgetW !== undefined) metrics["lossBudgetW"] = flags.lossBudgetW;
  else notRequired["lossBudgetW"] = "the requirement sets no loss budget";

  const unsolved = r.worst.unsolvedCornerIndexes;
  // Counted, so that a rule fails by name (corner-solves) where the corner figures below cannot be read.
  metrics["cornersWithoutOperatingPoint"] = unsolved.length;
  const firstCorner = unsolved[0] === undefined ? undefined : r.corners[unsolved[0]];
  const firstUnsolved = firstCorner === undefined ? undefined : cornerUnsolved(firstCorner);
  const why = firstUnsolved
    ? `corner ${unsolved[0]} has no operating point (${firstUnsolved.outcome}: ${firstUnsolved.reason})`
    : undefined;
  const put = (name: string, v: number | undefined) => {
    if (why !== undefined) unavailable[name] = why;
    else if (v !== undefined) metrics[name] = v;
  };
  put("tjWorstC", r.worst.tjC?.value);
  put("lossWorstW", r.worst.lossW?.value);
  put("dropWorstV", r.worst.dropV?.value);
  put("loadVMinV", r.worst.loadMinV?.value);
  // A stage with a start voltage: whether a corner sits in its chatter band (a corner without a
  // point cannot say, so the figure is unavailable with it).
  if (r.startVoltageV !== undefined) {
    if (why !== undefined) unavailable["startChatter"] = why;
    else metrics["startChatter"] = r.startUp.inChatterBand;
  }
  for (const p of r.startUp.profiles) {
    // A start-up profile lowers the load voltage and raises the junction: the worst of both counts.
    if (why === undefined && typeof metrics["loadVMinV"] === "number")
      metrics["loadVMinV"] = Math.min(metrics["loadVMinV"], p.result.minLoadV);
    if (why === undefined && typeof metrics["tjWorstC"] === "number")
      metrics["tjWorstC"] = Math.max(metrics["tjWorstC"], p.result.maxTjC);
  }

  const behaviour = behaviourOf(stage);
  if (behaviour.gateDriveMetric) {
    const drive = r.startUp.atMinSupply.gateSourceV;
    if (drive !== undefined) {
      metrics["gateDriveMinV"] = drive;
      // The same drive against the threshold at the coldest ambient, where Vth is highest.
      if (r.gateThresholdColdV !== undefined) metrics["gateOverdriveColdV"] = drive - r.gateThresholdColdV;
    }
  }
  const gate = behaviour.gateSourceClampV(stage);
  if (gate !== undefined) {
    const clamp = gate.clampV;
    const peaks = [
      req.supplyMaxV,
      steadyOvervoltageV(req) ?? 0,
      ...r.transients.filter((t) => t.polarity === "positive").map((t) => t.inputPeakV),
    ];
    metrics["gateSourceVMaxV"] = Math.max(...peaks.map((v) => (clamp === undefined ? v : Math.min(v, clamp))));
  }
  const negative = r.transients.filter((t) => t.polarity === "negative").map((t) => t.stresses[0]?.seenV ?? 0);
  metrics["reverseTransientVMaxV"] = Math.max(req.reverseV, ...negative);
  const coldV = mosfetBreakdownColdV(stage, req.ambientMinC);
  if (coldV !== undefined) metrics["vdsBreakdownColdV"] = coldV;
  const positive = r.transients.filter((t) => t.polarity === "positive").map((t) => t.inputPeakV);
  // Jump start, long-term overvoltage and the abnormal limit are steady for a minute or more: the input-side ratings see them too.
  metrics["transientVMaxV"] = Math.max(req.supplyMaxV, steadyOvervoltageV(req) ?? 0, ...positive);
  reviewHazardMetrics(stage, req, r, { metrics, unavailable, notRequired });
  Object.assign(unavailable, missingRatings(stage));
  const part = partParameters(stage);
  if (r.turnOff !== undefined) turnOffMetrics(stage, r.turnOff, metrics, part, unavailable, notRequired);
  pulseMetrics(r, metrics, unavailable);
  const elsewhere = otherAnalysesMetrics(metrics, "review");
  for (const n of Object.keys(unavailable)) delete elsewhere[n];
  return { stageKind: stage.kind, metrics, part, unavailable, notRequired: Object.assign(elsewhere, notRequired) };
}

/**
 * The negative pulses through a P-FET's or low-side N-FET's back-conducting channel (review-pulse-back-conduction.ts)
 * join the turn-off event's figures: loadReverseVMaxV and peakReverseCurrentA are the largest of
 * the event and every pulse (applied with the supply disconnected or riding on it); a pulse without
 * a response leaves both unavailable with why, and a reverse peak that is only a lower bound (the
 * channel conducting throughout, the current still rising at the span's end) leaves
 * peakReverseCurrentA unavailable so that no rule passes on it. A pulse not assessed (no
 * requirement.turnOff) leaves both unavailable with what to add, and the load's limit with them.
 */
function pulseMetrics(
  r: CandidateReview,
  metrics: Record<string, number | boolean>,
  unavailable: Record<string, string>,
): void {
  for (const p of r.pulseBackConduction ?? []) {
    if (p.outcome === "not-assessed") {
      // A gap, never out of scope: without the turn-off event the load's limit is not stated either,
      // so the load-reverse-voltage rule is missing its values (incomplete), not "not required".
      const why = `pulse ${p.pulseId} through the P-FET: ${p.reason}`;
      for (const n of ["peakReverseCurrentA", "loadReverseVMaxV"]) {
        unavailable[n] = why;
        delete metrics[n];
      }
      if (!Object.hasOwn(metrics, "loadReverseLimitV")) unavailable["loadReverseLimitV"] = why;
      continue;
    }
    if (p.outcome === "no-response") {
      for (const n of ["peakReverseCurrentA", "loadReverseVMaxV"]) {
        unavailable[n] = `pulse ${p.pulseId} through the channel: ${p.reason}`;
        delete metrics[n];
      }
      continue;
    }
    if (p.peakReverseIsLowerBound === true) {
      unavailable["peakReverseCurrentA"] =
        `pulse ${p.pulseId} through the channel: the reverse current is still rising at the end of the simulated span: ${p.peakReverseCurrentA.toPrecision(4)} A is only a lower bound of its peak`;
      delete metrics["peakReverseCurrentA"];
    }
    for (const [n, v] of [
      ["loadReverseVMaxV", Math.max(0, -p.outputMinV)],
      ["peakReverseCurrentA", p.peakReverseCurrentA],
    ] as const) {
      if (n in unavailable) continue;
      const had = metrics[n];
      metrics[n] = typeof had === "number" ? Math.max(had, v) : v;
    }
  }
}

/**
 * The requirement's turn-off event → the turnOff analysis's metrics (as turnOffRuleInput reads
 * them): peakReverseCurrentA, absorbedEnergyJ (the clamp phase's Vcl·∫|i|dt; 0 when the current
 * is back at zero by turn-off or the stage never turns off), eventTjC and the part's avalanche
 * rating; an absorbed energy without a rating is a gap, not out of scope.
 */
function turnOffMetrics(
  stage: StageModel,
  t: ReviewTurnOffResult,
  metrics: Record<string, number | boolean>,
  part: Record<string, number>,
  unavailable: Record<string, string>,
  notRequired: Record<string, string>,
): void {
  putEventAvalanche(
    stage,
    t,
    t.avalancheRatingJ,
    { metrics, part, unavailable },
    "the stage gives no avalanche energy rating (the part's avalancheEnergyJ)",
  );
  putEventFigures(t.result, t.loadReverseLimitV, { metrics, unavailable, notRequired }, "turn-off event ");
  const train = t.train;
  if (train === undefined)
    notRequired["eventTrainTjC"] = t.repetition
      ? "the candidate gives no transient thermal network (transientThermal) or the event has no response: the train is not assessed"
      : "the requirement's turn-off event states no repetition (turnOff.repetition)";
  else if (train.outcome === "overlapping") unavailable["eventTrainTjC"] = `turn-off event train: ${train.reason}`;
  else metrics["eventTrainTjC"] = train.trainTjC;
}
