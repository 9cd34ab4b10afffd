import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import type { RuleSetResult } from "../../domain/rules/rule-model.js";

/** One bridge analysed: its result and, when a rule set was named, the verdicts on it. */
export interface BridgeRun<R> {
  readonly result: R;
  readonly rules: RuleSetResult | undefined;
}

/**
 * The answer of a bridge procedure (DC or AC): provenance, assumptions and metrics, then the bridge
 * and, when one was given, the bridge it is compared to and the saving, in that key order.
 */
export function bridgeComparison<R, S>(
  assumptions: string[],
  metrics: Record<string, number>,
  main: BridgeRun<R>,
  other: BridgeRun<R> | undefined,
  saving: S | undefined,
) {
  return {
    modelVersion: MODEL_VERSION,
    caution: CAUTION,
    assumptions,
    metrics,
    ...(main.rules === undefined ? {} : { rules: main.rules }),
    ...(other?.rules === undefined ? {} : { compareToRules: other.rules }),
    bridge: main.result,
    ...(other === undefined ? {} : { compareTo: other.result }),
    ...(saving === undefined ? {} : { saving }),
  };
}
