import {
  type BridgeDcOutput,
  type BridgeElementsInput,
  bridgeDcInput,
  bridgeDcOutput,
} from "../../contracts/bridge.js";
import { analyseBridgeDc } from "../../domain/checks/bridge-dc.js";
import type { BridgeDcResult } from "../../domain/checks/bridge-dc-types.js";
import { dcSaving } from "../../domain/checks/bridge-saving.js";
import { evaluateRuleSetOverElements } from "../../domain/rules/element-verdicts.js";
import { ruleSetForAnalysis } from "../map/analysis-rule-set.js";
import { bridgeComparison } from "../map/bridge-comparison.js";
import { BRIDGE_DC_COMPUTES, bridgeDcElementInputs } from "../../domain/rules/metrics-of-bridge.js";
import { toBridgeElements } from "../map/bridge-elements.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const bridgeDc = defineProcedure({
  name: "bridgeDc",
  input: bridgeDcInput,
  output: bridgeDcOutput,
  handler: ({ input, ctx }): Answer<BridgeDcOutput> => {
    const assumptions: string[] = [];
    const sourceResistanceOhm = input.sourceResistanceOhm ?? 0;
    if (input.sourceResistanceOhm === undefined) assumptions.push("sourceResistanceOhm: 0 (default)");
    const set = ruleSetForAnalysis(input.ruleSet, input.ruleMetrics, BRIDGE_DC_COMPUTES, "bridgeDc", ctx);
    const run = (spec: BridgeElementsInput, path: string) => {
      const elements = toBridgeElements(spec, ctx.catalog, [path], assumptions);
      const result = analyseBridgeDc({
        elements,
        supplyV: input.supplyV,
        sourceResistanceOhm,
        load: input.load,
        ambientC: input.ambientC,
      });
      const rules =
        set === undefined
          ? undefined
          : evaluateRuleSetOverElements(
              set,
              bridgeDcElementInputs(elements, result, input.load, input.ruleMetrics ?? {}),
            );
      return { result, rules };
    };
    const main = run(input.bridge, "bridge");
    const other = input.compareTo === undefined ? undefined : run(input.compareTo, "compareTo");
    const bridge = main.result;
    const compareTo = other?.result;
    const metrics: Record<string, number> = {};
    addMetrics(metrics, "", bridge);
    if (compareTo !== undefined) addMetrics(metrics, "compareTo.", compareTo);
    const saving =
      compareTo === undefined
        ? undefined
        : (() => {
            const positive = dcSaving(bridge.positive, compareTo.positive);
            const negative = dcSaving(bridge.negative, compareTo.negative);
            return { ...(positive === undefined ? {} : { positive }), ...(negative === undefined ? {} : { negative }) };
          })();
    return bridgeComparison(assumptions, metrics, main, other, saving);
  },
});

/** Per polarity: load voltage, total loss; per element: current, reverse voltage, Tj and their limits. */
function addMetrics(out: Record<string, number>, prefix: string, r: BridgeDcResult): void {
  for (const p of [r.positive, r.negative]) {
    if (!("elements" in p)) continue;
    out[`${prefix}${p.polarity}.loadV`] = p.loadV;
    out[`${prefix}${p.polarity}.totalLossW`] = p.totalLossW;
    for (const e of p.elements) {
      const base = `${prefix}${p.polarity}.element.${e.position}.`;
      out[`${base}currentA`] = e.currentA;
      out[`${base}lossW`] = e.lossW;
      out[`${base}tjC`] = e.tjC;
      out[`${base}tjMaxC`] = e.tjMaxC;
      out[`${base}reverseV`] = e.reverseV;
      out[`${base}reverseRatingV`] = e.reverseRatingV;
    }
  }
}
