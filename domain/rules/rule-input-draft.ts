import type { TurnOffOutcome } from "../checks/turn-off-event.js";
import { avalancheEnergyAtTjJ } from "../checks/avalanche-derating.js";
import { type StageModel, stageTjMaxC } from "../stages/stage-model.js";
import { METRICS } from "./metric-vocabulary.js";
import type { RuleInput } from "./rule-model.js";

/** What an analysis puts into a rule input before its scope is closed. */
export interface RuleInputDraft {
  readonly stageKind: string;
  readonly metrics: Record<string, number | boolean>;
  readonly part: Record<string, number>;
  readonly unavailable: Record<string, string>;
  readonly notRequired: Record<string, string>;
}

export function draft(
  stageKind: string,
  callerMetrics: Readonly<Record<string, number | boolean>>,
  part: Record<string, number>,
): RuleInputDraft {
  return { stageKind, metrics: { ...callerMetrics }, part, unavailable: {}, notRequired: {} };
}

/**
 * Close the scope of an analysis: every vocabulary metric that it did not compute, that the
 * stage does not describe and that the caller did not give in ruleMetrics is out of scope
 * ("not-required", citing the analysis), so the operating-point and design-review rules of a
 * set do not make every verdict of this analysis "incomplete". Names the analysis should have
 * computed but could not are in `unavailable` and stay gaps.
 */
export function closeScope(d: RuleInputDraft, analysis: string): RuleInput {
  const notRequired = { ...d.notRequired };
  for (const m of METRICS) {
    const n = m.name;
    if (Object.hasOwn(d.metrics, n) || Object.hasOwn(d.unavailable, n) || Object.hasOwn(notRequired, n)) continue;
    notRequired[n] = `not computed by ${analysis}; give it in ruleMetrics where it applies`;
  }
  return { stageKind: d.stageKind, metrics: d.metrics, part: d.part, unavailable: d.unavailable, notRequired };
}

/**
 * Metrics that only one analysis computes (with the requirement inputs that only its rules
 * read): the design review's steady-reverse, clamp and start-profile figures, the reverse-current
 * and bridge analyses'. Elsewhere rules on them are out of scope, not gaps.
 */
export const ANALYSIS_ONLY_METRICS: Readonly<Record<string, readonly string[]>> = {
  review: [
    "reverseTjC",
    "reverseLeakageRunaway",
    "controllerReverseVMaxV",
    "clampEnergyJ",
    "clampPeakCurrentA",
    "clampPeakPowerW",
    "clampPeakPowerAllowedW",
    "clampTrainTjC",
    "clampTjMaxC",
    "clampStandoffV",
    "clampEnergyRatingJ",
    "clampPeakCurrentRatingA",
    "jumpStartV",
    "supplyOvervoltageV",
    "startProfileMinV",
    "startProfileDropoutS",
    "vdsBreakdownColdV",
    "gateOverdriveColdV",
    "eventTrainTjC",
    "inrushTjC",
    "inrushCharges",
    "inrushSoaCurrentA",
    "inrushSoaAllowedA",
    "loadTransientVMaxV",
    "loadMaxV",
    "overvoltageCutoffV",
    "stageCurrentMaxA",
    "switchCurrentLimitA",
    "cornersWithoutOperatingPoint",
  ],
  turnOff: [
    "peakReverseCurrentA",
    "absorbedEnergyJ",
    "eventTjC",
    "avalancheEnergyAtTjJ",
    "turnOffRepetitive",
    "loadReverseVMaxV",
    "loadReverseLimitV",
  ],
  holdUp: ["holdUpS", "holdUpRequiredS"],
  oring: ["reverseCurrentA", "reverseCurrentBudgetA"],
  batteryCharge: ["targetCanDrainSource"],
  bridgeAc: ["peakRepetitiveCurrentA", "capacitorRippleCurrentA", "capacitorRippleRatingA"],
};

/** notRequired entries for the analysis-only metrics the caller did not give, naming where each comes from. */
export function otherAnalysesMetrics(
  given: Readonly<Record<string, number | boolean>>,
  here: string,
): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [analysis, names] of Object.entries(ANALYSIS_ONLY_METRICS)) {
    for (const n of names) if (!Object.hasOwn(given, n)) out[n] = `computed by ${analysis}, not by ${here}`;
  }
  return out;
}

/** Put a number, or mark it unavailable with why when the analysis has none. */
export function putOr(d: RuleInputDraft, name: string, value: number | boolean | undefined, whyNot: string): void {
  if (value === undefined) d.unavailable[name] = whyNot;
  else d.metrics[name] = value;
}

/**
 * The event's reverse peak as a rule metric: the value where it is the event's maximum; where it
 * is only a lower bound (the current still rising at the end of the searched span) it is
 * unavailable with the bound in the reason, so that no rule passes on it.
 */
export function putPeakReverse(
  r: { readonly peakReverseCurrentA: number; readonly peakReverseIsLowerBound?: true },
  metrics: Record<string, number | boolean>,
  unavailable: Record<string, string>,
): void {
  if (r.peakReverseIsLowerBound === true)
    unavailable["peakReverseCurrentA"] =
      `the reverse current is still rising at the end of the simulated span: ${r.peakReverseCurrentA.toPrecision(4)} A is only a lower bound of its peak`;
  else metrics["peakReverseCurrentA"] = r.peakReverseCurrentA;
}

/**
 * The turn-off event's starting Tj, whether it repeats, and its avalanche rating for the rules:
 * eventTjC, turnOffRepetitive, the 25 °C rating as part.avalancheEnergyJ and
 * avalancheEnergyAtTjJ, that rating derated to eventTjC (domain/checks/avalanche-derating.ts),
 * which the avalanche-energy rules read. Without a rating both are unavailable with `missing` (a
 * gap: the element is stressed and nothing says it survives).
 */
export function putEventAvalanche(
  stage: StageModel,
  event: { readonly tjC: number; readonly repetitive: boolean },
  ratingJ: number | undefined,
  into: {
    readonly metrics: Record<string, number | boolean>;
    readonly part: Record<string, number>;
    readonly unavailable: Record<string, string>;
  },
  missing: string,
): void {
  const tjC = event.tjC;
  into.metrics["eventTjC"] = tjC;
  into.metrics["turnOffRepetitive"] = event.repetitive;
  if (ratingJ === undefined) {
    into.unavailable["part.avalancheEnergyJ"] = missing;
    into.unavailable["avalancheEnergyAtTjJ"] = missing;
    return;
  }
  into.part["avalancheEnergyJ"] = ratingJ;
  into.metrics["avalancheEnergyAtTjJ"] = avalancheEnergyAtTjJ(ratingJ, stageTjMaxC(stage), tjC);
}

/**
 * A turn-off event's figures for the rules (turnOff and the review's event alike):
 * peakReverseCurrentA, absorbedEnergyJ (the clamp phase's Vcl·∫|i|dt; 0 when the current is back
 * at zero by turn-off or the stage never turns off), and loadReverseVMaxV, the reverse voltage the
 * output reaches (−outputMinV, 0 when it stays at or above 0 V), with loadReverseLimitV where the
 * caller states the load's limit (out of scope otherwise). A P-FET whose gate turned its channel
 * off takes its peak and clamp energy from that turn-off. Outcomes without a response leave them
 * unavailable with why.
 */
export function putEventFigures(
  r: TurnOffOutcome,
  loadReverseLimitV: number | undefined,
  into: {
    readonly metrics: Record<string, number | boolean>;
    readonly unavailable: Record<string, string>;
    readonly notRequired: Record<string, string>;
  },
  label = "",
): void {
  const { metrics, unavailable, notRequired } = into;
  if (loadReverseLimitV !== undefined) metrics["loadReverseLimitV"] = loadReverseLimitV;
  else notRequired["loadReverseLimitV"] = "no load reverse-voltage limit is given (loadReverseLimitV)";
  switch (r.outcome) {
    case "blocks":
      metrics["peakReverseCurrentA"] = r.peakReverseCurrentA;
      metrics["absorbedEnergyJ"] = r.clamp?.absorbedJ ?? 0;
      break;
    case "does-not-block":
    case "stays-on": {
      const gate = r.outcome === "does-not-block" ? r.gateTurnOff : undefined;
      if (gate === undefined) putPeakReverse(r, metrics, unavailable);
      else metrics["peakReverseCurrentA"] = gate.peakReverseCurrentA;
      metrics["absorbedEnergyJ"] = gate?.clamp?.absorbedJ ?? 0;
      break;
    }
    case "clamp-below-drive":
    case "invalid-load-line":
    case "unstable-loop":
      for (const n of ["peakReverseCurrentA", "absorbedEnergyJ", "loadReverseVMaxV"])
        unavailable[n] = `${label}${r.outcome}: ${r.reason}`;
      return;
  }
  metrics["loadReverseVMaxV"] = Math.max(0, -r.outputMinV);
}
