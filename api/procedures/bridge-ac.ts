import {
  type BridgeAcOutput,
  type BridgeElementsInput,
  bridgeAcInput,
  bridgeAcOutput,
} from "../../contracts/bridge.js";
import { analyseBridgeAc, type BridgeAcOutcome } from "../../domain/checks/bridge-ac.js";
import { AC_WAVEFORM_POINTS } from "../../domain/checks/bridge-ac-waveform.js";
import { acSaving } from "../../domain/checks/bridge-saving.js";
import type { RuleSetResult } from "../../domain/rules/rule-model.js";
import { evaluateRuleSetOverElements } from "../../domain/rules/element-verdicts.js";
import { ruleSetForAnalysis } from "../map/analysis-rule-set.js";
import { bridgeComparison } from "../map/bridge-comparison.js";
import { BRIDGE_AC_COMPUTES, bridgeAcElementInputs } from "../../domain/rules/metrics-of-bridge.js";
import { toBridgeElements } from "../map/bridge-elements.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const bridgeAc = defineProcedure({
  name: "bridgeAc",
  input: bridgeAcInput,
  output: bridgeAcOutput,
  handler: ({ input, ctx }): Answer<BridgeAcOutput> => {
    const assumptions: string[] = [];
    const orZero = (v: number | undefined, name: string): number => {
      if (v === undefined) assumptions.push(`${name}: 0 (default)`);
      return v ?? 0;
    };
    const sourceResistanceOhm = orZero(input.sourceResistanceOhm, "sourceResistanceOhm");
    const leakageInductanceH = orZero(input.leakageInductanceH, "leakageInductanceH");
    const esrOhm = orZero(input.esrOhm, "esrOhm");
    assumptions.push(
      "MOSFET controllers run from the reservoir voltage and switch quasi-statically (turn-on/off delays neglected against the period)",
    );
    assumptions.push(
      "junction temperatures from the period-average loss (thermal time constants long against the period)",
    );
    const set = ruleSetForAnalysis(input.ruleSet, input.ruleMetrics, BRIDGE_AC_COMPUTES, "bridgeAc", ctx);
    const run = (
      spec: BridgeElementsInput,
      path: string,
    ): { result: BridgeAcOutcome; rules: RuleSetResult | undefined } => {
      const elements = toBridgeElements(spec, ctx.catalog, [path], assumptions);
      const result = analyseBridgeAc(
        {
          elements,
          sourceRmsV: input.sourceRmsV,
          frequencyHz: input.frequencyHz,
          sourceResistanceOhm,
          leakageInductanceH,
          capacitanceF: input.capacitanceF,
          esrOhm,
          load: input.load,
          ambientC: input.ambientC,
        },
        input.waveform ? { waveformPoints: AC_WAVEFORM_POINTS } : {},
      );
      const rules =
        set === undefined
          ? undefined
          : evaluateRuleSetOverElements(
              set,
              bridgeAcElementInputs(
                elements,
                result,
                input.load,
                input.capacitorRippleRatingA,
                input.ruleMetrics ?? {},
              ),
            );
      return { result, rules };
    };
    const main = run(input.bridge, "bridge");
    const other = input.compareTo === undefined ? undefined : run(input.compareTo, "compareTo");
    const bridge = main.result;
    const compareTo = other?.result;
    const metrics: Record<string, number> = {};
    addMetrics(metrics, "", bridge, input.capacitorRippleRatingA);
    if (compareTo !== undefined) addMetrics(metrics, "compareTo.", compareTo, input.capacitorRippleRatingA);
    const saving = compareTo === undefined ? undefined : acSaving(bridge, compareTo);
    return bridgeComparison(assumptions, metrics, main, other, saving);
  },
});

/**
 * Rule metrics: per element the peak repetitive current, RMS current, reverse voltage and its
 * rating, loss, Tj and its limit; the capacitor's RMS ripple current (and rating when given).
 */
function addMetrics(
  out: Record<string, number>,
  prefix: string,
  r: BridgeAcOutcome,
  rippleRatingA: number | undefined,
): void {
  if (!("steadyState" in r)) return;
  const s = r.steadyState;
  out[`${prefix}dcOutputV`] = s.dcOutputV;
  out[`${prefix}rippleVpp`] = s.rippleVpp;
  out[`${prefix}totalElementLossW`] = s.totalElementLossW;
  out[`${prefix}capacitor.rippleCurrentRmsA`] = s.capacitorRippleCurrentRmsA;
  if (rippleRatingA !== undefined) out[`${prefix}capacitor.rippleRatingA`] = rippleRatingA;
  for (const e of s.elements) {
    const base = `${prefix}element.${e.position}.`;
    out[`${base}peakRepetitiveCurrentA`] = e.peakCurrentA;
    out[`${base}rmsCurrentA`] = e.rmsCurrentA;
    out[`${base}reverseV`] = e.maxReverseV;
    out[`${base}reverseRatingV`] = e.reverseRatingV;
    out[`${base}lossW`] = e.lossW;
    out[`${base}tjC`] = e.tjC;
    out[`${base}tjMaxC`] = e.tjMaxC;
  }
}
