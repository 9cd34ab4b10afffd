import { describe, expect, it } from "vitest";
import { builtInRuleSets } from "../../../domain/rules/built-in-sets.js";
import type { CompiledRuleSet } from "../../../domain/rules/compile-rule-set.js";
import { evaluateRule } from "../../../domain/rules/evaluate-rules.js";
import type { VerdictOutcome } from "../../../domain/rules/rule-model.js";

// Every built-in rule on hand-computed metrics. Each expected threshold and margin below is
// worked by hand from the rule's expression (a closed form: threshold = the right-hand side,
// margin = rhs − lhs for <=, lhs − rhs for >=); the numbers are invented test inputs, not data.
type Vals = Record<string, number | boolean>;
interface Case {
  readonly kind: string;
  readonly metrics: Vals;
  readonly part?: Vals;
  readonly threshold?: number;
  readonly margin?: number;
}
interface RuleCases {
  readonly pass: Case;
  readonly violate: Case & { readonly outcome: VerdictOutcome };
  /** For a rule with its own precondition: a case where it is false. */
  readonly off?: Case;
}

const p = (kind: string, metrics: Vals, part: Vals, threshold?: number, margin?: number): Case => ({
  kind,
  metrics,
  part,
  ...(threshold === undefined ? {} : { threshold }),
  ...(margin === undefined ? {} : { margin }),
});
const v = (outcome: VerdictOutcome, c: Case) => ({ ...c, outcome });

// The avalanche rules read the rating at the event's Tj (avalancheEnergyAtTjJ, computed in
// domain/checks/avalanche-derating.ts): EAS 100 mJ at 25 °C, Tj(max) 175 °C, event at 85 °C →
// 0.1·(175 − 85)/(175 − 25) = 0.06 J (closed form, test/domain/checks/avalanche-derating.test.ts).
const AT_85C = 0.06;
const NO_ENERGY = p("pn-diode", { absorbedEnergyJ: 0, avalancheEnergyAtTjJ: AT_85C }, {});

const DEFAULT: Record<string, RuleCases> = {
  // A count of corners without an operating point: 0 passes (threshold 0, margin 0); two fail (margin 0 − 2 = −2).
  "corner-solves": {
    pass: p("pn-diode", { cornersWithoutOperatingPoint: 0 }, {}, 0, 0),
    violate: v("fail", p("integrated-switch", { cornersWithoutOperatingPoint: 2 }, {}, 0, -2)),
  },
  "tj-limit": {
    pass: p("schottky-diode", { tjWorstC: 140 }, { tjMaxC: 150 }, 150, 10),
    violate: v("fail", p("schottky-diode", { tjWorstC: 151 }, { tjMaxC: 150 }, 150, -1)),
  },
  "tj-margin": {
    pass: p("pfet-high-side", { tjWorstC: 120 }, { tjMaxC: 150 }, 125, 5),
    violate: v("warn", p("pfet-high-side", { tjWorstC: 130 }, { tjMaxC: 150 }, 125, -5)),
  },
  "load-voltage-min": {
    pass: p("pn-diode", { loadVMinV: 11, loadMinV: 10 }, {}, 10, 1),
    violate: v("fail", p("pn-diode", { loadVMinV: 9.5, loadMinV: 10 }, {}, 10, -0.5)),
  },
  "load-voltage-headroom": {
    pass: p("pn-diode", { loadVMinV: 11, loadMinV: 10 }, {}, 10.5, 0.5),
    violate: v("warn", p("pn-diode", { loadVMinV: 10.2, loadMinV: 10 }, {}, 10.5, -0.3)),
  },
  "diode-reverse-steady": {
    pass: p("schottky-diode", { reverseVMaxV: 14 }, { vrrmV: 40 }, 32, 18),
    violate: v("fail", p("schottky-diode", { reverseVMaxV: 35 }, { vrrmV: 40 }, 32, -3)),
  },
  "diode-reverse-transient": {
    pass: p("pn-diode", { reverseTransientVMaxV: 36 }, { vrrmV: 40 }, 40, 4),
    violate: v("fail", p("pn-diode", { reverseTransientVMaxV: 45 }, { vrrmV: 40 }, 40, -5)),
  },
  "fet-vds-reverse-steady": {
    pass: p("pfet-high-side", { reverseVMaxV: 14 }, { vdsMaxV: 40 }, 32, 18),
    violate: v("fail", p("pfet-high-side", { reverseVMaxV: 33 }, { vdsMaxV: 40 }, 32, -1)),
  },
  "fet-vds-reverse-transient": {
    pass: p("nfet-ideal-diode", { reverseTransientVMaxV: 38 }, { vdsMaxV: 40 }, 40, 2),
    violate: v("fail", p("nfet-ideal-diode", { reverseTransientVMaxV: 50 }, { vdsMaxV: 40 }, 40, -10)),
  },
  "pair-forward-blocking": {
    pass: p("nfet-back-to-back", { supplyMaxV: 16, transientVMaxV: 36 }, { vdsMaxV: 40 }, 40, 4),
    violate: v("fail", p("nfet-back-to-back", { supplyMaxV: 16, transientVMaxV: 42 }, { vdsMaxV: 40 }, 40, -2)),
  },
  // The cold breakdown of a 60 V MOSFET at −40 °C, +0.1 %/K: 60·(1 − 0.001·65) = 56.1 V.
  "fet-vds-reverse-transient-cold": {
    pass: p("nfet-ideal-diode", { reverseTransientVMaxV: 50, vdsBreakdownColdV: 56.1 }, {}, 56.1, 6.1),
    violate: v("fail", p("pfet-high-side", { reverseTransientVMaxV: 58, vdsBreakdownColdV: 56.1 }, {}, 56.1, -1.9)),
  },
  "fet-vgs-limit": {
    pass: p("pfet-high-side", { gateSourceVMaxV: 16 }, { vgsMaxV: 20 }, 20, 4),
    violate: v("fail", p("pfet-high-side", { gateSourceVMaxV: 24 }, { vgsMaxV: 20 }, 20, -4)),
  },
  "fet-vgs-derated": {
    pass: p("nfet-low-side", { gateSourceVMaxV: 15 }, { vgsMaxV: 20 }, 16, 1),
    violate: v("warn", p("nfet-low-side", { gateSourceVMaxV: 18 }, { vgsMaxV: 20 }, 16, -2)),
  },
  "controller-input-max": {
    pass: p("nfet-ideal-diode", { supplyMaxV: 16, transientVMaxV: 35 }, { maxInputV: 60 }, 60, 25),
    violate: v("fail", p("nfet-ideal-diode", { supplyMaxV: 16, transientVMaxV: 65 }, { maxInputV: 60 }, 60, -5)),
  },
  "controller-input-derated": {
    pass: p("integrated-switch", { supplyMaxV: 16 }, { maxInputV: 60 }, 48, 32),
    violate: v("warn", p("integrated-switch", { supplyMaxV: 50 }, { maxInputV: 60 }, 48, -2)),
  },
  "start-at-min-supply": {
    pass: p("nfet-ideal-diode", { startVoltageV: 2.5, supplyMinV: 6 }, {}, 6, 3.5),
    violate: v("fail", p("nfet-ideal-diode", { startVoltageV: 9, supplyMinV: 6 }, {}, 6, -3)),
  },
  "gate-overdrive-cold": {
    pass: p("pfet-high-side", { gateOverdriveColdV: 0.4 }, {}, 0, 0.4),
    violate: v("fail", p("nfet-ideal-diode", { gateOverdriveColdV: -0.1 }, {}, 0, -0.1)),
  },
  "start-no-chatter": {
    pass: p("nfet-ideal-diode", { startChatter: false }, {}),
    violate: v("fail", p("nfet-back-to-back", { startChatter: true }, {})),
  },
  "gate-drive-at-min-supply": {
    pass: p("pfet-high-side", { gateDriveMinV: 6 }, { vgsOnV: 4.5 }, 4.5, 1.5),
    violate: v("warn", p("pfet-high-side", { gateDriveMinV: 3.5 }, { vgsOnV: 4.5 }, 4.5, -1)),
  },
  "reverse-current-blocking": {
    pass: p("nfet-ideal-diode", { parallelSources: true, holdUpRequired: false, blocksReverseCurrent: true }, {}),
    violate: v("fail", p("pfet-high-side", { parallelSources: 0, holdUpRequired: 1, blocksReverseCurrent: 0 }, {})),
  },
  "standby-quiescent": {
    pass: p("integrated-switch", { quiescentA: 50e-6, standbyBudgetA: 100e-6 }, {}, 100e-6, 50e-6),
    violate: v("fail", p("integrated-switch", { quiescentA: 150e-6, standbyBudgetA: 100e-6 }, {}, 100e-6, -50e-6)),
  },
  "loss-budget": {
    pass: p("schottky-diode", { lossWorstW: 0.75, lossBudgetW: 1 }, {}, 1, 0.25),
    violate: v("fail", p("schottky-diode", { lossWorstW: 1.5, lossBudgetW: 1 }, {}, 1, -0.5)),
  },
  // Avalanche: EAS 100 mJ at 25 °C, Tj(max) 175 °C, event at 85 °C → derated 0.1·(175 − 85)/(175 − 25) = 0.06 J.
  "turn-off-train-tj": {
    pass: p("nfet-ideal-diode", { eventTrainTjC: 160 }, { tjMaxC: 175 }, 175, 15),
    violate: v("fail", p("pfet-high-side", { eventTrainTjC: 180 }, { tjMaxC: 175 }, 175, -5)),
  },
  // The output pulled to −1.2 V against a load that tolerates 0.5 V reversed (a low-side N-FET's
  // gate sees the output as a P-FET's does: the same rule for both).
  "load-reverse-voltage": {
    pass: p("pfet-high-side", { loadReverseVMaxV: 0.3, loadReverseLimitV: 0.5 }, {}, 0.5, 0.2),
    violate: v("fail", p("nfet-low-side", { loadReverseVMaxV: 1.2, loadReverseLimitV: 0.5 }, {}, 0.5, -0.7)),
  },
  "avalanche-energy": {
    pass: p("nfet-ideal-diode", { absorbedEnergyJ: 0.05, avalancheEnergyAtTjJ: AT_85C }, {}, 0.06, 0.01),
    violate: v("fail", p("nfet-ideal-diode", { absorbedEnergyJ: 0.07, avalancheEnergyAtTjJ: AT_85C }, {}, 0.06, -0.01)),
    off: NO_ENERGY,
  },
  // 0.8 · 0.06 = 0.048 J.
  "avalanche-energy-margin": {
    pass: p("schottky-diode", { absorbedEnergyJ: 0.04, avalancheEnergyAtTjJ: AT_85C }, {}, 0.048, 0.008),
    violate: v("warn", p("schottky-diode", { absorbedEnergyJ: 0.05, avalancheEnergyAtTjJ: AT_85C }, {}, 0.048, -0.002)),
    off: NO_ENERGY,
  },
  "hold-up-time": {
    pass: p("schottky-diode", { holdUpS: 0.003, holdUpRequiredS: 0.002 }, {}, 0.002, 0.001),
    violate: v("fail", p("pfet-high-side", { holdUpS: 0.0015, holdUpRequiredS: 0.002 }, {}, 0.002, -0.0005)),
  },
  // 1.25 · 2 ms = 2.5 ms.
  "hold-up-margin": {
    pass: p("nfet-ideal-diode", { holdUpS: 0.003, holdUpRequiredS: 0.002 }, {}, 0.0025, 0.0005),
    violate: v("warn", p("nfet-ideal-diode", { holdUpS: 0.0022, holdUpRequiredS: 0.002 }, {}, 0.0025, -0.0003)),
  },
  "reverse-current-budget": {
    pass: p("schottky-diode", { reverseCurrentA: 1e-3, reverseCurrentBudgetA: 5e-3 }, {}, 5e-3, 4e-3),
    violate: v("fail", p("schottky-diode", { reverseCurrentA: 8e-3, reverseCurrentBudgetA: 5e-3 }, {}, 5e-3, -3e-3)),
  },
  "battery-back-drain": {
    pass: p("nfet-ideal-diode", { targetCanDrainSource: false }, {}),
    violate: v("fail", p("pfet-high-side", { targetCanDrainSource: true }, {})),
  },
  "element-peak-current": {
    pass: p("pn-diode", { peakRepetitiveCurrentA: 8 }, { ifrmA: 10 }, 10, 2),
    violate: v("fail", p("pn-diode", { peakRepetitiveCurrentA: 12 }, { ifrmA: 10 }, 10, -2)),
  },
  "element-peak-current-derated": {
    pass: p("nfet-ideal-diode", { peakRepetitiveCurrentA: 7 }, { ifrmA: 10 }, 8, 1),
    violate: v("warn", p("nfet-ideal-diode", { peakRepetitiveCurrentA: 9 }, { ifrmA: 10 }, 8, -1)),
  },
  "capacitor-ripple": {
    pass: p("pn-diode", { capacitorRippleCurrentA: 2, capacitorRippleRatingA: 2.5 }, {}, 2.5, 0.5),
    violate: v("fail", p("pn-diode", { capacitorRippleCurrentA: 3, capacitorRippleRatingA: 2.5 }, {}, 2.5, -0.5)),
  },
  "reverse-leakage-runaway": {
    pass: p("schottky-diode", { reverseLeakageRunaway: false }, {}),
    violate: v("fail", p("schottky-diode", { reverseLeakageRunaway: true }, {})),
  },
  "reverse-tj-limit": {
    pass: p("schottky-diode", { reverseTjC: 140 }, { tjMaxC: 150 }, 150, 10),
    violate: v("fail", p("schottky-diode", { reverseTjC: 155 }, { tjMaxC: 150 }, 150, -5)),
  },
  // lhs = Tj(max) − reverse Tj: 150 − 120 = 30 against 25 (margin 5); 150 − 130 = 20 (margin −5).
  "reverse-tj-margin": {
    pass: p("pn-diode", { reverseTjC: 120 }, { tjMaxC: 150 }, 25, 5),
    violate: v("warn", p("pn-diode", { reverseTjC: 130 }, { tjMaxC: 150 }, 25, -5)),
  },
  // 0.8 · 40 V = 32 V.
  "switch-reverse-steady": {
    pass: p("integrated-switch", { reverseVMaxV: 28 }, { switchReverseRatingV: 40 }, 32, 4),
    violate: v("fail", p("integrated-switch", { reverseVMaxV: 34 }, { switchReverseRatingV: 40 }, 32, -2)),
  },
  "switch-reverse-transient": {
    pass: p("integrated-switch", { reverseTransientVMaxV: 36 }, { switchReverseRatingV: 40 }, 40, 4),
    violate: v("fail", p("integrated-switch", { reverseTransientVMaxV: 45 }, { switchReverseRatingV: 40 }, 40, -5)),
  },
  "controller-reverse-max": {
    pass: p("nfet-ideal-diode", { controllerReverseVMaxV: 28 }, { controllerReverseRatingV: 40 }, 40, 12),
    violate: v("fail", p("nfet-ideal-diode", { controllerReverseVMaxV: 28 }, { controllerReverseRatingV: 20 }, 20, -8)),
  },
  "controller-reverse-derated": {
    pass: p("nfet-ideal-diode", { reverseVMaxV: 28 }, { controllerReverseRatingV: 40 }, 32, 4),
    violate: v("warn", p("nfet-ideal-diode", { reverseVMaxV: 34 }, { controllerReverseRatingV: 40 }, 32, -2)),
  },
  // max(16 V, 14 V) = 16 V.
  "clamp-standoff": {
    pass: p("pn-diode", { clampStandoffV: 26, supplyMaxV: 16, reverseVMaxV: 14 }, {}, 16, 10),
    violate: v("fail", p("nfet-ideal-diode", { clampStandoffV: 14, supplyMaxV: 16, reverseVMaxV: 14 }, {}, 16, -2)),
  },
  "clamp-standoff-jump-start": {
    pass: p("pn-diode", { clampStandoffV: 26, jumpStartV: 24 }, {}, 24, 2),
    violate: v("fail", p("pfet-high-side", { clampStandoffV: 18, jumpStartV: 24 }, {}, 24, -6)),
  },
  "clamp-standoff-overvoltage": {
    pass: p("nfet-ideal-diode", { clampStandoffV: 64, supplyOvervoltageV: 60 }, {}, 60, 4),
    violate: v("fail", p("schottky-diode", { clampStandoffV: 58, supplyOvervoltageV: 60 }, {}, 60, -2)),
  },
  "clamp-energy": {
    pass: p("nfet-ideal-diode", { clampEnergyJ: 3, clampEnergyRatingJ: 5 }, {}, 5, 2),
    violate: v("fail", p("nfet-ideal-diode", { clampEnergyJ: 51, clampEnergyRatingJ: 5 }, {}, 5, -46)),
    off: p("pn-diode", { clampEnergyJ: 0, clampEnergyRatingJ: 5 }, {}),
  },
  "clamp-peak-current": {
    pass: p("nfet-ideal-diode", { clampPeakCurrentA: 20, clampPeakCurrentRatingA: 30 }, {}, 30, 10),
    violate: v("fail", p("nfet-ideal-diode", { clampPeakCurrentA: 43, clampPeakCurrentRatingA: 30 }, {}, 30, -13)),
    off: p("pn-diode", { clampPeakCurrentA: 0, clampPeakCurrentRatingA: 30 }, {}),
  },
  // The clamp's junction at the end of its hottest pulse train against its Tj(max) 150 °C.
  "clamp-train-tj": {
    pass: p("schottky-diode", { clampTrainTjC: 138, clampTjMaxC: 150 }, {}, 150, 12),
    violate: v("fail", p("nfet-ideal-diode", { clampTrainTjC: 153, clampTjMaxC: 150 }, {}, 150, -3)),
  },
  "clamp-peak-power": {
    pass: p("schottky-diode", { clampPeakPowerW: 2500, clampPeakPowerAllowedW: 3000 }, {}, 3000, 500),
    violate: v("fail", p("nfet-ideal-diode", { clampPeakPowerW: 3400, clampPeakPowerAllowedW: 3000 }, {}, 3000, -400)),
    off: p("pn-diode", { clampPeakPowerW: 0, clampPeakPowerAllowedW: 3000 }, {}),
  },
  "avalanche-current": {
    pass: p("nfet-ideal-diode", { absorbedEnergyJ: 0.01, peakReverseCurrentA: 30 }, { avalancheCurrentA: 40 }, 40, 10),
    violate: v(
      "fail",
      p("pfet-high-side", { absorbedEnergyJ: 0.01, peakReverseCurrentA: 50 }, { avalancheCurrentA: 40 }, 40, -10),
    ),
  },
  // A repeating event's energy against EAR 1 mJ: 0.6 mJ passes (margin 0.4 mJ), 1.2 mJ fails; a one-off event is off.
  "avalanche-energy-repetitive": {
    pass: p(
      "nfet-ideal-diode",
      { turnOffRepetitive: true, absorbedEnergyJ: 0.6e-3 },
      { repetitiveAvalancheEnergyJ: 1e-3 },
      1e-3,
      0.4e-3,
    ),
    violate: v(
      "fail",
      p(
        "pfet-high-side",
        { turnOffRepetitive: true, absorbedEnergyJ: 1.2e-3 },
        { repetitiveAvalancheEnergyJ: 1e-3 },
        1e-3,
        -0.2e-3,
      ),
    ),
    off: p(
      "nfet-low-side",
      { turnOffRepetitive: false, absorbedEnergyJ: 1.2e-3 },
      { repetitiveAvalancheEnergyJ: 1e-3 },
    ),
  },
  "start-at-profile-minimum": {
    pass: p("nfet-ideal-diode", { startVoltageV: 3.2, startProfileMinV: 4.5 }, {}, 4.5, 1.3),
    violate: v("fail", p("integrated-switch", { startVoltageV: 5, startProfileMinV: 4.5 }, {}, 4.5, -0.5)),
  },
  "start-profile-no-dropout": {
    pass: p("pn-diode", { startProfileDropoutS: 0 }, {}, 0, 0),
    violate: v("fail", p("pn-diode", { startProfileDropoutS: 0.02 }, {}, 0, -0.02)),
  },
  // The inrush's peak Tj against Tj(max) (vehicle: 10 K below); the charge completing; the load's peak against its rating.
  "inrush-tj": {
    pass: p("integrated-switch", { inrushTjC: 140 }, { tjMaxC: 150 }, 150, 10),
    violate: v("fail", p("pfet-high-side", { inrushTjC: 152 }, { tjMaxC: 150 }, 150, -2)),
  },
  "inrush-completes": {
    pass: p("integrated-switch", { inrushCharges: true }, {}),
    violate: v("fail", p("integrated-switch", { inrushCharges: false }, {})),
  },
  "inrush-soa": {
    pass: p("nfet-ideal-diode", { inrushSoaCurrentA: 2, inrushSoaAllowedA: 2.5 }, {}, 2.5, 0.5),
    violate: v("fail", p("pfet-high-side", { inrushSoaCurrentA: 3, inrushSoaAllowedA: 2.5 }, {}, 2.5, -0.5)),
  },
  "switch-current-limit-above-load": {
    pass: p("integrated-switch", { stageCurrentMaxA: 3, switchCurrentLimitA: 6 }, {}, 6, 3),
    violate: v("fail", p("integrated-switch", { stageCurrentMaxA: 8, switchCurrentLimitA: 6 }, {}, 6, -2)),
  },
  // thermalShutdownInService: a corner at Tj = 85 + 5 K/W × 12 W = 145 °C against a 140 °C shutdown
  // is true, against a 150 °C one false (the closed form of the review's metric).
  "switch-thermal-shutdown-in-service": {
    pass: p("integrated-switch", { thermalShutdownInService: false }, {}),
    violate: v("fail", p("integrated-switch", { thermalShutdownInService: true }, {})),
  },
  // The lowest input at which the switch is open: its threshold, or after an excursion its re-close
  // level, threshold − hysteresis (a 20 V cut-off with 5 V hysteresis after a 24 V jump start: 15 V).
  "switch-cutoff-above-supply": {
    pass: p("integrated-switch", { overvoltageCutoffV: 19, supplyMaxV: 16 }, {}, 16, 3),
    violate: v("fail", p("integrated-switch", { overvoltageCutoffV: 15, supplyMaxV: 16 }, {}, 16, -1)),
  },
  "load-overvoltage": {
    pass: p("integrated-switch", { loadTransientVMaxV: 34, loadMaxV: 40 }, {}, 40, 6),
    violate: v("fail", p("pn-diode", { loadTransientVMaxV: 48, loadMaxV: 40 }, {}, 40, -8)),
  },
};

const VEHICLE: Record<string, RuleCases> = {
  ...DEFAULT,
  // 0.9 · 2.5 A = 2.25 A.
  "inrush-soa": {
    pass: p("nfet-ideal-diode", { inrushSoaCurrentA: 2, inrushSoaAllowedA: 2.5 }, {}, 2.25, 0.25),
    violate: v("fail", p("nfet-back-to-back", { inrushSoaCurrentA: 2.4, inrushSoaAllowedA: 2.5 }, {}, 2.25, -0.15)),
  },
  "inrush-tj": {
    pass: p("integrated-switch", { inrushTjC: 135 }, { tjMaxC: 150 }, 140, 5),
    violate: v("fail", p("nfet-ideal-diode", { inrushTjC: 145 }, { tjMaxC: 150 }, 140, -5)),
  },
  "tj-limit": {
    pass: p("schottky-diode", { tjWorstC: 135 }, { tjMaxC: 150 }, 140, 5),
    violate: v("fail", p("schottky-diode", { tjWorstC: 145 }, { tjMaxC: 150 }, 140, -5)),
  },
  "tj-margin": {
    pass: p("pfet-high-side", { tjWorstC: 115 }, { tjMaxC: 150 }, 120, 5),
    violate: v("warn", p("pfet-high-side", { tjWorstC: 125 }, { tjMaxC: 150 }, 120, -5)),
  },
  "load-voltage-headroom": {
    pass: p("pn-diode", { loadVMinV: 11.5, loadMinV: 10 }, {}, 11, 0.5),
    violate: v("warn", p("pn-diode", { loadVMinV: 10.8, loadMinV: 10 }, {}, 11, -0.2)),
  },
  "diode-reverse-steady": {
    pass: p("schottky-diode", { reverseVMaxV: 14 }, { vrrmV: 40 }, 28, 14),
    violate: v("fail", p("schottky-diode", { reverseVMaxV: 30 }, { vrrmV: 40 }, 28, -2)),
  },
  "diode-reverse-transient": {
    pass: p("pn-diode", { reverseTransientVMaxV: 35 }, { vrrmV: 40 }, 36, 1),
    violate: v("fail", p("pn-diode", { reverseTransientVMaxV: 38 }, { vrrmV: 40 }, 36, -2)),
  },
  "fet-vds-reverse-steady": {
    pass: p("nfet-low-side", { reverseVMaxV: 14 }, { vdsMaxV: 40 }, 28, 14),
    violate: v("fail", p("nfet-low-side", { reverseVMaxV: 30 }, { vdsMaxV: 40 }, 28, -2)),
  },
  "fet-vds-reverse-transient": {
    pass: p("nfet-ideal-diode", { reverseTransientVMaxV: 35 }, { vdsMaxV: 40 }, 36, 1),
    violate: v("fail", p("nfet-ideal-diode", { reverseTransientVMaxV: 38 }, { vdsMaxV: 40 }, 36, -2)),
  },
  "pair-forward-blocking": {
    pass: p("nfet-back-to-back", { supplyMaxV: 16, transientVMaxV: 35 }, { vdsMaxV: 40 }, 36, 1),
    violate: v("fail", p("nfet-back-to-back", { supplyMaxV: 16, transientVMaxV: 38 }, { vdsMaxV: 40 }, 36, -2)),
  },
  // 0.9 · 56.1 V = 50.49 V.
  "fet-vds-reverse-transient-cold": {
    pass: p("nfet-ideal-diode", { reverseTransientVMaxV: 48, vdsBreakdownColdV: 56.1 }, {}, 50.49, 2.49),
    violate: v("fail", p("nfet-low-side", { reverseTransientVMaxV: 52, vdsBreakdownColdV: 56.1 }, {}, 50.49, -1.51)),
  },
  "fet-vgs-derated": {
    pass: p("nfet-low-side", { gateSourceVMaxV: 13 }, { vgsMaxV: 20 }, 14, 1),
    violate: v("warn", p("nfet-low-side", { gateSourceVMaxV: 15 }, { vgsMaxV: 20 }, 14, -1)),
  },
  "controller-input-max": {
    pass: p("nfet-ideal-diode", { supplyMaxV: 16, transientVMaxV: 35 }, { maxInputV: 60 }, 54, 19),
    violate: v("fail", p("nfet-ideal-diode", { supplyMaxV: 16, transientVMaxV: 58 }, { maxInputV: 60 }, 54, -4)),
  },
  "controller-input-derated": {
    pass: p("integrated-switch", { supplyMaxV: 16 }, { maxInputV: 60 }, 42, 26),
    violate: v("warn", p("integrated-switch", { supplyMaxV: 45 }, { maxInputV: 60 }, 42, -3)),
  },
  "start-margin": {
    pass: p("nfet-ideal-diode", { startVoltageV: 2.5, supplyMinV: 6 }, {}, 5.4, 2.9),
    violate: v("warn", p("nfet-ideal-diode", { startVoltageV: 5.7, supplyMinV: 6 }, {}, 5.4, -0.3)),
  },
  "gate-drive-at-min-supply": {
    pass: p("nfet-low-side", { gateDriveMinV: 6 }, { vgsOnV: 4.5 }, 4.5, 1.5),
    violate: v("fail", p("nfet-low-side", { gateDriveMinV: 3.5 }, { vgsOnV: 4.5 }, 4.5, -1)),
  },
  // 0.8 · 0.06 J = 0.048 J; 0.6 · 0.06 J = 0.036 J.
  "avalanche-energy": {
    pass: p("pfet-high-side", { absorbedEnergyJ: 0.04, avalancheEnergyAtTjJ: AT_85C }, {}, 0.048, 0.008),
    violate: v("fail", p("pfet-high-side", { absorbedEnergyJ: 0.05, avalancheEnergyAtTjJ: AT_85C }, {}, 0.048, -0.002)),
    off: NO_ENERGY,
  },
  // 0.9 · EAR 1 mJ = 0.9 mJ.
  "avalanche-energy-repetitive": {
    pass: p(
      "nfet-ideal-diode",
      { turnOffRepetitive: true, absorbedEnergyJ: 0.6e-3 },
      { repetitiveAvalancheEnergyJ: 1e-3 },
      0.9e-3,
      0.3e-3,
    ),
    violate: v(
      "fail",
      p(
        "nfet-low-side",
        { turnOffRepetitive: true, absorbedEnergyJ: 0.95e-3 },
        { repetitiveAvalancheEnergyJ: 1e-3 },
        0.9e-3,
        -0.05e-3,
      ),
    ),
    off: p(
      "pfet-high-side",
      { turnOffRepetitive: false, absorbedEnergyJ: 0.95e-3 },
      { repetitiveAvalancheEnergyJ: 1e-3 },
    ),
  },
  "avalanche-energy-margin": {
    pass: p("nfet-ideal-diode", { absorbedEnergyJ: 0.03, avalancheEnergyAtTjJ: AT_85C }, {}, 0.036, 0.006),
    violate: v(
      "warn",
      p("nfet-ideal-diode", { absorbedEnergyJ: 0.04, avalancheEnergyAtTjJ: AT_85C }, {}, 0.036, -0.004),
    ),
    off: NO_ENERGY,
  },
  // 1.25 · 2 ms = 2.5 ms (fail); 1.5 · 2 ms = 3 ms (warn).
  "hold-up-time": {
    pass: p("schottky-diode", { holdUpS: 0.003, holdUpRequiredS: 0.002 }, {}, 0.0025, 0.0005),
    violate: v("fail", p("schottky-diode", { holdUpS: 0.0022, holdUpRequiredS: 0.002 }, {}, 0.0025, -0.0003)),
  },
  "hold-up-margin": {
    pass: p("schottky-diode", { holdUpS: 0.0035, holdUpRequiredS: 0.002 }, {}, 0.003, 0.0005),
    violate: v("warn", p("schottky-diode", { holdUpS: 0.0028, holdUpRequiredS: 0.002 }, {}, 0.003, -0.0002)),
  },
  // 0.9 · 10 A = 9 A (fail); 0.7 · 10 A = 7 A (warn); ripple 0.8 · 2.5 A = 2 A.
  "element-peak-current": {
    pass: p("pn-diode", { peakRepetitiveCurrentA: 8 }, { ifrmA: 10 }, 9, 1),
    violate: v("fail", p("pn-diode", { peakRepetitiveCurrentA: 9.5 }, { ifrmA: 10 }, 9, -0.5)),
  },
  "element-peak-current-derated": {
    pass: p("schottky-diode", { peakRepetitiveCurrentA: 6 }, { ifrmA: 10 }, 7, 1),
    violate: v("warn", p("schottky-diode", { peakRepetitiveCurrentA: 7.5 }, { ifrmA: 10 }, 7, -0.5)),
  },
  "capacitor-ripple": {
    pass: p("pn-diode", { capacitorRippleCurrentA: 1.8, capacitorRippleRatingA: 2.5 }, {}, 2, 0.2),
    violate: v("fail", p("pn-diode", { capacitorRippleCurrentA: 2.2, capacitorRippleRatingA: 2.5 }, {}, 2, -0.2)),
  }, // lhs = Tj(max) − reverse Tj against 10 K (fail) and 30 K (warn).
  "reverse-tj-limit": {
    pass: p("schottky-diode", { reverseTjC: 135 }, { tjMaxC: 150 }, 10, 5),
    violate: v("fail", p("schottky-diode", { reverseTjC: 145 }, { tjMaxC: 150 }, 10, -5)),
  },
  "reverse-tj-margin": {
    pass: p("pn-diode", { reverseTjC: 115 }, { tjMaxC: 150 }, 30, 5),
    violate: v("warn", p("pn-diode", { reverseTjC: 125 }, { tjMaxC: 150 }, 30, -5)),
  },
  // 0.7 · 40 V = 28 V; 0.9 · 40 V = 36 V.
  "switch-reverse-steady": {
    pass: p("integrated-switch", { reverseVMaxV: 14 }, { switchReverseRatingV: 40 }, 28, 14),
    violate: v("fail", p("integrated-switch", { reverseVMaxV: 30 }, { switchReverseRatingV: 40 }, 28, -2)),
  },
  "switch-reverse-transient": {
    pass: p("integrated-switch", { reverseTransientVMaxV: 35 }, { switchReverseRatingV: 40 }, 36, 1),
    violate: v("fail", p("integrated-switch", { reverseTransientVMaxV: 38 }, { switchReverseRatingV: 40 }, 36, -2)),
  },
  "controller-reverse-max": {
    pass: p("nfet-ideal-diode", { controllerReverseVMaxV: 28 }, { controllerReverseRatingV: 40 }, 36, 8),
    violate: v("fail", p("nfet-ideal-diode", { controllerReverseVMaxV: 38 }, { controllerReverseRatingV: 40 }, 36, -2)),
  },
  "controller-reverse-derated": {
    pass: p("nfet-ideal-diode", { reverseVMaxV: 14 }, { controllerReverseRatingV: 40 }, 28, 14),
    violate: v("warn", p("nfet-ideal-diode", { reverseVMaxV: 30 }, { controllerReverseRatingV: 40 }, 28, -2)),
  },
  // 0.8 · 5 J = 4 J; 0.8 · 30 A = 24 A; 0.9 · 40 A = 36 A.
  "clamp-energy": {
    pass: p("nfet-ideal-diode", { clampEnergyJ: 3, clampEnergyRatingJ: 5 }, {}, 4, 1),
    violate: v("fail", p("nfet-ideal-diode", { clampEnergyJ: 4.5, clampEnergyRatingJ: 5 }, {}, 4, -0.5)),
    off: p("pn-diode", { clampEnergyJ: 0, clampEnergyRatingJ: 5 }, {}),
  },
  "clamp-peak-current": {
    pass: p("nfet-ideal-diode", { clampPeakCurrentA: 20, clampPeakCurrentRatingA: 30 }, {}, 24, 4),
    violate: v("fail", p("nfet-ideal-diode", { clampPeakCurrentA: 25, clampPeakCurrentRatingA: 30 }, {}, 24, -1)),
    off: p("pn-diode", { clampPeakCurrentA: 0, clampPeakCurrentRatingA: 30 }, {}),
  },
  // 0.8 · 3000 W = 2400 W.
  // 10 K below the part's 175 °C Tj(max): 165 °C.
  "turn-off-train-tj": {
    pass: p("nfet-ideal-diode", { eventTrainTjC: 160 }, { tjMaxC: 175 }, 165, 5),
    violate: v("fail", p("pfet-high-side", { eventTrainTjC: 170 }, { tjMaxC: 175 }, 165, -5)),
  },
  // 10 K below the clamp's 150 °C Tj(max): 140 °C.
  "clamp-train-tj": {
    pass: p("schottky-diode", { clampTrainTjC: 135, clampTjMaxC: 150 }, {}, 140, 5),
    violate: v("fail", p("pfet-high-side", { clampTrainTjC: 145, clampTjMaxC: 150 }, {}, 140, -5)),
  },
  "clamp-peak-power": {
    pass: p("schottky-diode", { clampPeakPowerW: 2000, clampPeakPowerAllowedW: 3000 }, {}, 2400, 400),
    violate: v("fail", p("nfet-ideal-diode", { clampPeakPowerW: 2500, clampPeakPowerAllowedW: 3000 }, {}, 2400, -100)),
    off: p("pn-diode", { clampPeakPowerW: 0, clampPeakPowerAllowedW: 3000 }, {}),
  },
  "avalanche-current": {
    pass: p("nfet-ideal-diode", { absorbedEnergyJ: 0.01, peakReverseCurrentA: 30 }, { avalancheCurrentA: 40 }, 36, 6),
    violate: v(
      "fail",
      p("nfet-low-side", { absorbedEnergyJ: 0.01, peakReverseCurrentA: 38 }, { avalancheCurrentA: 40 }, 36, -2),
    ),
  },
};

const CONSUMER: Record<string, RuleCases> = {
  ...DEFAULT,
  "tj-margin": {
    pass: p("schottky-diode", { tjWorstC: 135 }, { tjMaxC: 150 }, 140, 5),
    violate: v("warn", p("schottky-diode", { tjWorstC: 145 }, { tjMaxC: 150 }, 140, -5)),
  },
  "load-voltage-headroom": {
    pass: p("pn-diode", { loadVMinV: 10.5, loadMinV: 10 }, {}, 10.2, 0.3),
    violate: v("warn", p("pn-diode", { loadVMinV: 10.1, loadMinV: 10 }, {}, 10.2, -0.1)),
  },
  "diode-reverse-steady": {
    pass: p("schottky-diode", { reverseVMaxV: 14 }, { vrrmV: 40 }, 36, 22),
    violate: v("fail", p("schottky-diode", { reverseVMaxV: 37 }, { vrrmV: 40 }, 36, -1)),
  },
  "fet-vds-reverse-steady": {
    pass: p("pfet-high-side", { reverseVMaxV: 14 }, { vdsMaxV: 40 }, 36, 22),
    violate: v("fail", p("pfet-high-side", { reverseVMaxV: 37 }, { vdsMaxV: 40 }, 36, -1)),
  },
  "fet-vgs-derated": {
    pass: p("pfet-high-side", { gateSourceVMaxV: 17 }, { vgsMaxV: 20 }, 18, 1),
    violate: v("warn", p("pfet-high-side", { gateSourceVMaxV: 19 }, { vgsMaxV: 20 }, 18, -1)),
  },
  "controller-input-derated": {
    pass: p("integrated-switch", { supplyMaxV: 16 }, { maxInputV: 60 }, 54, 38),
    violate: v("warn", p("integrated-switch", { supplyMaxV: 56 }, { maxInputV: 60 }, 54, -2)),
  },
  "standby-quiescent": {
    pass: p("nfet-ideal-diode", { quiescentA: 50e-6, standbyBudgetA: 100e-6 }, {}, 100e-6, 50e-6),
    violate: v("warn", p("nfet-ideal-diode", { quiescentA: 150e-6, standbyBudgetA: 100e-6 }, {}, 100e-6, -50e-6)),
  },
  // 0.9 · 0.06 J = 0.054 J; 1.1 · 2 ms = 2.2 ms; 0.9 · 10 A = 9 A.
  "avalanche-energy-margin": {
    pass: p("nfet-low-side", { absorbedEnergyJ: 0.05, avalancheEnergyAtTjJ: AT_85C }, {}, 0.054, 0.004),
    violate: v("warn", p("nfet-low-side", { absorbedEnergyJ: 0.058, avalancheEnergyAtTjJ: AT_85C }, {}, 0.054, -0.004)),
    off: NO_ENERGY,
  },
  "hold-up-margin": {
    pass: p("pn-diode", { holdUpS: 0.0025, holdUpRequiredS: 0.002 }, {}, 0.0022, 0.0003),
    violate: v("warn", p("pn-diode", { holdUpS: 0.0021, holdUpRequiredS: 0.002 }, {}, 0.0022, -0.0001)),
  },
  "element-peak-current-derated": {
    pass: p("pn-diode", { peakRepetitiveCurrentA: 8 }, { ifrmA: 10 }, 9, 1),
    violate: v("warn", p("pn-diode", { peakRepetitiveCurrentA: 9.5 }, { ifrmA: 10 }, 9, -0.5)),
  }, // lhs = Tj(max) − reverse Tj against 10 K; 0.9 · 40 V = 36 V.
  "reverse-tj-margin": {
    pass: p("pn-diode", { reverseTjC: 135 }, { tjMaxC: 150 }, 10, 5),
    violate: v("warn", p("pn-diode", { reverseTjC: 145 }, { tjMaxC: 150 }, 10, -5)),
  },
  "switch-reverse-steady": {
    pass: p("integrated-switch", { reverseVMaxV: 28 }, { switchReverseRatingV: 40 }, 36, 8),
    violate: v("fail", p("integrated-switch", { reverseVMaxV: 37 }, { switchReverseRatingV: 40 }, 36, -1)),
  },
  "controller-reverse-derated": {
    pass: p("nfet-ideal-diode", { reverseVMaxV: 28 }, { controllerReverseRatingV: 40 }, 36, 8),
    violate: v("warn", p("nfet-ideal-diode", { reverseVMaxV: 37 }, { controllerReverseRatingV: 40 }, 36, -1)),
  },
};

const TABLES: Record<string, Record<string, RuleCases>> = { default: DEFAULT, vehicle: VEHICLE, consumer: CONSUMER };
const sets = builtInRuleSets();

function run(set: CompiledRuleSet, ruleId: string, c: Case) {
  const rule = set.rules.find((r) => r.rule.id === ruleId);
  if (rule === undefined) throw new Error(`no rule ${ruleId} in ${set.stamp.id}`);
  return evaluateRule(
    rule,
    { stageKind: c.kind, metrics: c.metrics, part: (c.part ?? {}) as Record<string, number> },
    set.stamp,
  );
}

describe.each(sets.map((s) => [s.stamp.id, s] as const))("built-in rule set %s", (id, set) => {
  const table = TABLES[id] ?? {};
  it("has a hand-computed case for every rule and no case for a rule it lacks", () => {
    expect(Object.keys(table).sort()).toEqual(set.rules.map((r) => r.rule.id).sort());
  });
  describe.each(set.rules.map((r) => [r.rule.id, r] as const))("%s", (ruleId, compiled) => {
    const cases = table[ruleId];
    it("passes on the pass case, with the hand-computed threshold and margin", () => {
      if (!cases) throw new Error("missing cases");
      const out = run(set, ruleId, cases.pass);
      expect(out.outcome).toBe("pass");
      expect(out.reason).toBeNull();
      if (cases.pass.threshold !== undefined) expect(out.threshold).toBeCloseTo(cases.pass.threshold, 12);
      if (cases.pass.margin !== undefined) expect(out.margin).toBeCloseTo(cases.pass.margin, 12);
      expect(out.ruleSet).toEqual(set.stamp);
    });
    it("gives its severity (warn or fail) on the violating case", () => {
      if (!cases) throw new Error("missing cases");
      const out = run(set, ruleId, cases.violate);
      expect(out.outcome).toBe(cases.violate.outcome);
      expect(out.reason).toMatch(/does not hold|is false/);
      if (cases.violate.threshold !== undefined) expect(out.threshold).toBeCloseTo(cases.violate.threshold, 12);
      if (cases.violate.margin !== undefined) expect(out.margin).toBeCloseTo(cases.violate.margin, 12);
    });
    it("is not applicable when a metric it needs is absent", () => {
      if (!cases) throw new Error("missing cases");
      const [first, ...rest] = Object.keys(cases.pass.metrics).filter((k) => compiled.expression.names.includes(k));
      if (first === undefined) throw new Error("pass case names no metric of the expression");
      const metrics = Object.fromEntries(Object.entries(cases.pass.metrics).filter(([k]) => k !== first));
      const out = run(set, ruleId, { ...cases.pass, metrics });
      expect(out.outcome).toBe("not-applicable");
      expect(out.reason).toContain(`${first} is not given`);
      expect(out.threshold).toBeNull();
      expect(rest.every((k) => k in out.values)).toBe(true);
    });
    it("is not applicable on a stage kind it does not cover, or without a precondition", () => {
      const r = compiled.rule;
      if (r.appliesTo !== "all") {
        const other = ["pn-diode", "pfet-high-side", "integrated-switch"].find((k) => !r.appliesTo.includes(k)) ?? "";
        const out = run(set, ruleId, { ...(cases?.pass ?? p("", {}, {})), kind: other });
        expect(out.outcome).toBe("not-applicable");
        expect(out.reason).toContain(`not ${other}`);
      } else if (r.when !== undefined) {
        const out = run(
          set,
          ruleId,
          cases?.off ??
            p("pn-diode", { parallelSources: false, holdUpRequired: false, blocksReverseCurrent: false }, {}),
        );
        expect(out.outcome).toBe("not-applicable");
        expect(out.reason).toContain("is false");
      } else {
        const out = run(set, ruleId, p("pn-diode", {}, {}));
        expect(out.outcome).toBe("not-applicable");
        expect(out.reason).toContain("is not given");
      }
    });
  });
});

describe("built-in rule sets: identity and documentation", () => {
  it("each has an id, a version, a description; derived sets say what differs", () => {
    expect(sets.map((s) => s.stamp.id)).toEqual(["default", "vehicle", "consumer"]);
    for (const s of sets) {
      expect(s.stamp.version).toMatch(/^\d+\.\d+\.\d+$/);
      expect(s.stamp.hash).toMatch(/^sha256:[0-9a-f]{64}$/);
      expect(s.set.description.length).toBeGreaterThan(40);
      for (const r of s.set.rules) {
        expect(r.source.length).toBeGreaterThan(5);
        expect(r.rationale.length).toBeGreaterThan(20);
      }
      if (s.stamp.id !== "default") {
        expect(s.set.basedOn).toBe("default");
        expect((s.set.differences ?? []).length).toBeGreaterThan(2);
      }
    }
  });
  it("the vehicle set is at least as strict as the default on the same metrics (tj margin, reverse derating)", () => {
    const [def, veh, con] = sets;
    if (!def || !veh || !con) throw new Error("missing set");
    const m = { tjWorstC: 128, reverseVMaxV: 30 };
    const part = { tjMaxC: 150, vrrmV: 40 };
    const outcomes = (s: CompiledRuleSet) =>
      s.rules
        .filter((r) => ["tj-limit", "tj-margin", "diode-reverse-steady"].includes(r.rule.id))
        .map((r) => evaluateRule(r, { stageKind: "pn-diode", metrics: m, part }, s.stamp).outcome);
    // Tj 128 °C on a 150 °C part: limits (fail / warn) are default 150 / 125, vehicle 140 / 120,
    // consumer 150 / 140. Reverse 30 V on a 40 V part: default 0.8·40 = 32 passes, vehicle
    // 0.7·40 = 28 fails, consumer 0.9·40 = 36 passes.
    expect(outcomes(def)).toEqual(["pass", "warn", "pass"]);
    expect(outcomes(veh)).toEqual(["pass", "warn", "fail"]);
    expect(outcomes(con)).toEqual(["pass", "pass", "pass"]);
  });
});
