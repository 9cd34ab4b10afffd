import type { BridgeAcOutcome } from "../checks/bridge-ac.js";
import type { BridgeDcResult } from "../checks/bridge-dc-types.js";
import { BRIDGE_POSITIONS, type BridgeElements } from "../checks/bridge-element.js";
import { stagePeakRepetitiveCurrentA } from "../checks/stage-ratings.js";
import type { ElementRuleInput } from "./element-verdicts.js";
import type { LoadModel } from "../solve/load-model.js";
import type { StageModel } from "../stages/stage-model.js";
import { closeScope, draft, putOr, type RuleInputDraft } from "./rule-input-draft.js";
import { partParameters, stageMetrics } from "./metrics-of-operating-point.js";

type Caller = Readonly<Record<string, number | boolean>>;

function elementDraft(e: StageModel, load: LoadModel, caller: Caller): RuleInputDraft {
  const d = draft(e.kind, caller, partParameters(e));
  Object.assign(d.metrics, stageMetrics(e));
  const ifrm = stagePeakRepetitiveCurrentA(e);
  if (ifrm !== undefined) d.part["ifrmA"] = ifrm;
  else
    d.unavailable["part.ifrmA"] =
      "the element gives no repetitive peak current rating: give the diode's (or the mosfet's) peakRepetitiveCurrentA";
  if (load.kind === "constant-power") d.metrics["loadMinV"] = load.minVoltageV;
  return d;
}

export const BRIDGE_DC_COMPUTES = ["tjWorstC", "reverseVMaxV", "loadVMinV"] as const;

/**
 * bridgeDc → rules, one element per position: tjWorstC = the element's junction at the hotter
 * polarity, reverseVMaxV = its reverse voltage when it blocks (the other polarity), and shared:
 * loadVMinV = the lower load voltage of the two polarities. A polarity without a solution makes
 * these unavailable, with its outcome.
 */
export function bridgeDcElementInputs(
  elements: BridgeElements,
  r: BridgeDcResult,
  load: LoadModel,
  caller: Caller,
): ElementRuleInput[] {
  const polarities = [r.positive, r.negative];
  const failed = polarities.find((p) => !("elements" in p));
  const why =
    failed === undefined
      ? "internal: element missing"
      : `${failed.polarity} polarity has no solution (${failed.outcome}: ${"reason" in failed ? failed.reason : ""})`;
  const solved = failed === undefined ? polarities.flatMap((p) => ("elements" in p ? [p] : [])) : [];
  return BRIDGE_POSITIONS.map((pos) => {
    const d = elementDraft(elements[pos], load, caller);
    const states = solved.flatMap((p) => p.elements.filter((e) => e.position === pos));
    const ok = failed === undefined && states.length === 2;
    putOr(d, "tjWorstC", ok ? Math.max(...states.map((s) => s.tjC)) : undefined, why);
    putOr(d, "reverseVMaxV", ok ? Math.max(...states.map((s) => s.reverseV)) : undefined, why);
    putOr(d, "loadVMinV", ok ? Math.min(...solved.map((p) => p.loadV)) : undefined, why);
    return { element: pos, input: closeScope(d, "bridgeDc") };
  });
}

export const BRIDGE_AC_COMPUTES = [
  "tjWorstC",
  "reverseVMaxV",
  "loadVMinV",
  "peakRepetitiveCurrentA",
  "capacitorRippleCurrentA",
  "capacitorRippleRatingA",
] as const;

/**
 * bridgeAc → rules, one element per position: tjWorstC (from the period-average loss),
 * reverseVMaxV = its peak repetitive reverse voltage, peakRepetitiveCurrentA; shared: loadVMinV =
 * the ripple trough, capacitorRippleCurrentA and the capacitor's rating (out of scope when the
 * request does not rate it). Without a periodic steady state these are unavailable.
 */
export function bridgeAcElementInputs(
  elements: BridgeElements,
  r: BridgeAcOutcome,
  load: LoadModel,
  rippleRatingA: number | undefined,
  caller: Caller,
): ElementRuleInput[] {
  const s = "steadyState" in r ? r.steadyState : undefined;
  const why = "reason" in r ? `no periodic steady state (${r.outcome}: ${r.reason})` : "internal: element missing";
  return BRIDGE_POSITIONS.map((pos) => {
    const d = elementDraft(elements[pos], load, caller);
    const e = s?.elements.find((x) => x.position === pos);
    putOr(d, "tjWorstC", e?.tjC, why);
    putOr(d, "reverseVMaxV", e?.maxReverseV, why);
    putOr(d, "peakRepetitiveCurrentA", e?.peakCurrentA, why);
    putOr(d, "loadVMinV", s?.outputMinV, why);
    putOr(d, "capacitorRippleCurrentA", s?.capacitorRippleCurrentRmsA, why);
    if (rippleRatingA !== undefined) d.metrics["capacitorRippleRatingA"] = rippleRatingA;
    else
      d.notRequired["capacitorRippleRatingA"] =
        "capacitorRippleRatingA is not given: the capacitor is not rated in this request";
    return { element: pos, input: closeScope(d, "bridgeAc") };
  });
}
