import { BRIDGE_AC_COMPUTES, BRIDGE_DC_COMPUTES } from "./metrics-of-bridge.js";
import { OPERATING_POINT_METRICS } from "./metrics-of-operating-point.js";
import { CHARGE_COMPUTES, HOLD_UP_COMPUTES, ORING_COMPUTES, TURN_OFF_COMPUTES } from "./metrics-of-reverse-current.js";
import { REVIEW_COMPUTES } from "./metrics-of-review.js";

/**
 * What each analysis computes for its rules, by procedure: the one list the soundness invariant
 * (test/domain/rules/soundness-invariant.test.ts) walks. A metric an analysis puts into its rule
 * input must be in its list here, or be a requirement or stage metric of the vocabulary.
 */
export const ANALYSIS_COMPUTES: Readonly<Record<string, readonly string[]>> = {
  operatingPoint: OPERATING_POINT_METRICS,
  review: REVIEW_COMPUTES,
  turnOff: TURN_OFF_COMPUTES,
  holdUp: HOLD_UP_COMPUTES,
  oring: ORING_COMPUTES,
  batteryCharge: CHARGE_COMPUTES,
  bridgeDc: BRIDGE_DC_COMPUTES,
  bridgeAc: BRIDGE_AC_COMPUTES,
};

/**
 * Every boolean field of an analysis's result, by its name, and how the verdict reads it: the
 * vocabulary metric that carries the same limit into the rules (so a rule reads it), or why it
 * is not a limit. The soundness test walks the example and known-bad results and fails on a
 * boolean field missing here: a new `within…` flag cannot be added without its metric.
 */
export const RESULT_FLAGS: Readonly<Record<string, { readonly metric: string } | { readonly notALimit: string }>> = {
  withinEnergy: { metric: "clampEnergyJ" },
  withinPeakCurrent: { metric: "clampPeakCurrentA" },
  withinPeakPower: { metric: "clampPeakPowerW" },
  standoffClearsSteady: { metric: "clampStandoffV" },
  exceeds: { metric: "reverseTransientVMaxV" },
  feasible: {
    notALimit:
      "whether a clamp window exists for the parts as they are: the parts' own voltage rules (reverseTransientVMaxV, transientVMaxV, gateSourceVMaxV) fail when a pulse exceeds them",
  },
  needed: { notALimit: "whether a clamp is needed: the parts' own voltage rules decide" },
  conducts: {
    notALimit:
      "whether the clamp conducts in the pulse: its energy and current are ruled (clampEnergyJ, clampPeakCurrentA)",
  },
  reachesLoad: { notALimit: "where a pulse goes, descriptive" },
  withinAvalancheRating: { metric: "absorbedEnergyJ" },
  overTemperature: { metric: "tjWorstC" },
  anyOverTemperature: { metric: "tjWorstC" },
  allReverseBlocked: { metric: "reverseCurrentA" },
  blocks: { metric: "targetCanDrainSource" },
  currentLimited: {
    notALimit: "a source at its current limit is a working mode; the node voltage it gives is ruled through loadVMinV",
  },
  meetsRequirement: { metric: "holdUpS" },
  aboveTjMax: { metric: "reverseTjC" },
  inChatterBand: { metric: "startChatter" },
  cutOff: { metric: "loadTransientVMaxV" },
  assessed: {
    notALimit:
      "whether the inrush is modelled for the candidate: where not, inrushTjC and inrushCharges are a gap or out of scope with the reason",
  },
};
