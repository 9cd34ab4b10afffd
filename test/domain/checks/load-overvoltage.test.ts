import { describe, expect, it } from "vitest";
import { loadOvervoltage } from "../../../domain/checks/load-overvoltage.js";
import { type TransientContext, transientStress } from "../../../domain/checks/transient-stress.js";
import { reviewInrush } from "../../../domain/review/review-inrush.js";
import type { TransientPulse } from "../../../domain/review/transient-library.js";
import type { IntegratedSwitchStage } from "../../../domain/stages/stage-model.js";
import { idealDiode, siBodyDiode } from "../../helpers/stages.js";

const sw: IntegratedSwitchStage = {
  kind: "integrated-switch",
  channel: {
    rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: 0.02 }],
    thresholdV: 1,
    tempLaw: { law: "power", exponent: 0 },
  },
  internalGateV: 10,
  startV: 2.5,
  belowStart: { mode: "blocks" },
  regulatedDropV: 0,
  quiescentA: 1e-3,
  maxVoltageV: 60,
  blocksReverseCurrent: false,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
};
// An invented surge: 13.5 V + 40 V over a 10 µs rise, 2 ohm, 1 ms decay (no clamp in the design).
const surge: TransientPulse = {
  id: "surge",
  title: "surge",
  baseV: "supply",
  amplitudeV: 40,
  sourceResistanceOhm: 2,
  riseS: 10e-6,
  decayS: 1e-3,
  decayConvention: "to-10-percent",
  source: "invented",
};
const ctx: TransientContext = {
  supplyNominalV: 13.5,
  supplyMaxV: 16,
  reverseV: 14,
  overvoltageV: 24,
  outputHeldV: 13.5,
  deratingFactor: 0.8,
  clampToStandoffRatio: 1.3,
};
const atLoad = (stage: IntegratedSwitchStage) =>
  loadOvervoltage(stage, [surge], [transientStress(stage, surge, ctx)], ctx);

describe("what reaches the load through an overvoltage cut-off (circuit reasoning)", () => {
  it("without a cut-off the load sees the input's peak and the steady overvoltage", () => {
    const r = atLoad(sw);
    expect(r.pulses[0]).toMatchObject({ inputPeakV: 53.5, loadPeakV: 53.5, cutOff: false });
    expect(r.loadVMaxV).toBe(53.5);
  });

  it("an instant cut-off holds the load at its threshold, and the jump start above it is cut too", () => {
    const r = atLoad({ ...sw, overvoltageCutoffV: 20 });
    expect(r.pulses[0]).toMatchObject({ loadPeakV: 20, cutOff: true });
    // Steady: max(16 V supply, min(24 V overvoltage, 20 V)) = 20 V.
    expect(r.loadVMaxV).toBe(20);
  });

  it("a response time lets the input's open-circuit rise through: Vth + (40 V / 10 µs)·tr", () => {
    // 20 V + 4 V/µs · 2 µs = 28 V, below the 53.5 V peak.
    expect(atLoad({ ...sw, overvoltageCutoffV: 20, overvoltageResponseS: 2e-6 }).pulses[0]?.loadPeakV).toBeCloseTo(
      28,
      9,
    );
    // A response longer than the rise passes the whole peak.
    expect(atLoad({ ...sw, overvoltageCutoffV: 20, overvoltageResponseS: 20e-6 }).pulses[0]?.loadPeakV).toBe(53.5);
    // A pulse without a rise time given: no bound on its rise, the whole peak.
    const steep = { ...surge, riseS: 0 };
    const s2 = { ...sw, overvoltageCutoffV: 20, overvoltageResponseS: 1e-6 };
    expect(loadOvervoltage(s2, [steep], [transientStress(s2, steep, ctx)], ctx).pulses[0]?.loadPeakV).toBe(53.5);
  });
});

describe("the review's inrush drive per stage (review-inrush.ts)", () => {
  const inrush = {
    capacitanceF: 1e-3,
    inputV: 12,
    loopResistanceOhm: 0.02,
    load: { kind: "constant-current", currentA: 2 } as const,
    ambientC: 85,
  };
  const quasi = { kind: "quasi-static" } as const;
  const zth = { kind: "foster", terms: [{ rKPerW: 2, tauS: 1e-3 }] } as const;
  it("an integrated switch limits at its current limit, and a slew that stays below it sets dV/dt", () => {
    const limited = reviewInrush(inrush, { ...sw, currentLimitA: 5 }, quasi);
    expect(limited).toMatchObject({ assessed: true, drive: "current-limit" });
    // C·s + IL = 1 mF·1000 V/s + 2 A = 3 A ≤ 5 A: the slew governs.
    expect(reviewInrush({ ...inrush, slewVPerS: 1000 }, { ...sw, currentLimitA: 5 }, quasi)).toMatchObject({
      drive: "slew",
    });
    // A controller's limit beside the switch's: the lower holds, C·V/(I − IL) = 1 mF·12 V/(4 A − 2 A) = 6 ms.
    const lower = reviewInrush({ ...inrush, controllerLimitA: 4 }, { ...sw, currentLimitA: 5 }, quasi);
    expect(lower.assessed && lower.result.outcome === "charged" && lower.result.chargeTimeS).toBeCloseTo(6e-3, 12);
    const higher = reviewInrush({ ...inrush, controllerLimitA: 8 }, { ...sw, currentLimitA: 5 }, quasi);
    expect(higher.assessed && higher.result.outcome === "charged" && higher.result.chargeTimeS).toBeCloseTo(4e-3, 12);
    // 1 mF·4000 V/s + 2 A = 6 A > 5 A: the limit governs.
    expect(reviewInrush({ ...inrush, slewVPerS: 4000 }, { ...sw, currentLimitA: 5 }, quasi)).toMatchObject({
      drive: "current-limit",
    });
  });

  it("a MOSFET without a slew turns fully on: the loop and Rds(on) at the ambient limit the current", () => {
    // Rds(on) 5 mOhm (no temperature law): 12 V / (5 + 20) mOhm = 480 A at t = 0.
    const r = reviewInrush(inrush, idealDiode(0.005, { rth: 40 }), quasi);
    expect(r).toMatchObject({ assessed: true, drive: "uncontrolled" });
    if (!r.assessed || r.result.outcome !== "charged") throw new Error("expected a charge");
    expect(r.result.peakCurrentA).toBeCloseTo(480, 9);
  });

  it("an integrated switch with a thermal shutdown below the charge's Tj fails the start", () => {
    // 60 W falling over 4 ms into 2 K/W, 1 ms: about 85 + 75 K at the peak, above 130 °C.
    const r = reviewInrush(inrush, { ...sw, currentLimitA: 5, thermalShutdownC: 130 }, zth);
    expect(r).toMatchObject({ assessed: true, result: { outcome: "thermal-shutdown", tjPeakC: 130 } });
  });

  it("a diode stage is out of scope; a load the charge cannot model is a gap", () => {
    const diode = reviewInrush(
      inrush,
      {
        kind: "pn-diode",
        diode: siBodyDiode,
        reverseRatingV: 60,
        tjMaxC: 150,
        thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
      },
      quasi,
    );
    expect(diode).toMatchObject({ assessed: false, scope: "out" });
    // A converter's P/V under a slew from a 0 V start: not modelled (unbounded); fully on at once it is.
    const cp = { kind: "constant-power", powerW: 20, startV: 8 } as const;
    expect(reviewInrush({ ...inrush, load: cp }, sw, quasi)).toMatchObject({ assessed: true, drive: "uncontrolled" });
    const from0 = { ...inrush, load: { ...cp, startV: 0 }, slewVPerS: 1000 };
    expect(reviewInrush(from0, sw, quasi)).toMatchObject({ assessed: false, scope: "gap" });
    // Behind a 5 A limit the slew cannot be held from 0 V: the limit governs, and the output stalls at 0 V.
    const limited = reviewInrush(from0, { ...sw, currentLimitA: 5 }, quasi);
    expect(limited).toMatchObject({ assessed: true, drive: "current-limit", result: { outcome: "does-not-charge" } });
  });
});
