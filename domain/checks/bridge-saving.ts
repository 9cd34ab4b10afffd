import type { BridgeAcOutcome } from "./bridge-ac.js";
import type { DcPolarityOutcome } from "./bridge-dc-types.js";

/** What a bridge saves against another: loss (W) and hottest junction (K); positive = it saves. */
export interface BridgeSaving {
  readonly lossSavingW: number;
  readonly hottestTjReductionK: number;
}

/** Saving of the DC bridge against compareTo at one polarity; undefined unless both have numbers. */
export function dcSaving(bridge: DcPolarityOutcome, compareTo: DcPolarityOutcome): BridgeSaving | undefined {
  if (!("elements" in bridge) || !("elements" in compareTo)) return undefined;
  return {
    lossSavingW: compareTo.totalLossW - bridge.totalLossW,
    hottestTjReductionK: hottest(compareTo.elements) - hottest(bridge.elements),
  };
}

/** Saving of the AC bridge against compareTo; undefined unless both reached a steady state. */
export function acSaving(bridge: BridgeAcOutcome, compareTo: BridgeAcOutcome): BridgeSaving | undefined {
  if (!("steadyState" in bridge) || !("steadyState" in compareTo)) return undefined;
  return {
    lossSavingW: compareTo.steadyState.totalElementLossW - bridge.steadyState.totalElementLossW,
    hottestTjReductionK: hottest(compareTo.steadyState.elements) - hottest(bridge.steadyState.elements),
  };
}

function hottest(elements: readonly { readonly tjC: number }[]): number {
  return elements.reduce((m, e) => Math.max(m, e.tjC), Number.NEGATIVE_INFINITY);
}
