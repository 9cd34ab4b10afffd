import { describe, expect, it } from "vitest";
import { chargeBattery } from "../../../domain/checks/battery-charging.js";
import type { ChargingModel } from "../../../domain/checks/battery-charging-types.js";
import type { StageModel } from "../../../domain/stages/stage-model.js";
import { relativeError } from "../../helpers/tolerance.js";
import { idealDiodeStage, pfetStage, schottkyStage } from "../../fixtures/reverse-stages.js";

const ah = 3600;
// Invented demo batteries (inputs only): an alternator-backed source and a leisure battery.
const base: ChargingModel = {
  source: {
    capacityC: 100 * ah,
    ocvPoints: [
      { soc: 0, voltageV: 12.9 },
      { soc: 0.5, voltageV: 13.6 },
      { soc: 1, voltageV: 14.2 },
    ],
    internalResistanceOhm: 0.02,
    initialSoc: 0.95,
  },
  target: {
    capacityC: 20 * ah,
    ocvPoints: [
      { soc: 0, voltageV: 11.8 },
      { soc: 0.2, voltageV: 12.5 },
      { soc: 0.9, voltageV: 13.2 },
      { soc: 1, voltageV: 13.9 },
    ],
    internalResistanceOhm: 0.03,
    initialSoc: 0.3,
  },
  stage: schottkyStage,
  currentLimitA: 20,
  ambientC: 25,
  stop: { targetSoc: 0.999, minCurrentA: 0.2, sourceMinSoc: 0.05, maxTimeS: 48 * 3600 },
  rtol: 1e-7,
};

describe("battery-to-battery charging", () => {
  // Source: energy conservation: ∫OCV_s dq (exact on the OCV points) = ∫OCV_t dq + losses, 0.1 %.
  it.each([
    ["Schottky", schottkyStage],
    ["ideal diode", idealDiodeStage],
    ["P-FET", pfetStage],
  ] as [string, StageModel][])("%s: energy balance within 0.1 %", (_n, stage) => {
    const r = chargeBattery({ ...base, stage });
    if (r.outcome !== "charged") throw new Error(r.outcome);
    expect(Math.abs(r.energy.balanceResidual)).toBeLessThan(1e-3);
  });

  // Source: the error bound's definition: a run at half the tolerance moves the answer by less.
  it("halving the tolerance moves the answer less than the reported bound", () => {
    for (const rtol of [1e-5, 1e-7]) {
      const a = chargeBattery({ ...base, rtol });
      const b = chargeBattery({ ...base, rtol: rtol / 2 });
      if (a.outcome !== "charged" || b.outcome !== "charged") throw new Error("unsolved");
      expect(a.stoppedBy).toBe("taper-current");
      expect(Math.abs(a.timeS - b.timeS)).toBeLessThan(a.errorBound.timeS);
      expect(Math.abs(a.energy.stageLossJ - b.energy.stageLossJ)).toBeLessThan(
        a.errorBound.stageLossJ + 1e-9 * a.energy.stageLossJ,
      );
    }
    const tl = { ...base, stop: { ...base.stop, maxTimeS: 1800 } };
    const a = chargeBattery({ ...tl, rtol: 1e-6 });
    const b = chargeBattery({ ...tl, rtol: 5e-7 });
    if (a.outcome !== "charged" || b.outcome !== "charged") throw new Error("unsolved");
    expect(a.stoppedBy).toBe("time-limit");
    expect(Math.abs(a.chargeMovedC - b.chargeMovedC)).toBeLessThan(a.errorBound.chargeC);
  });

  // Source: closed form: linear OCVs through a pure resistance (P-FET channel, no self-heating)
  // give dq/dt = (Δ0 − k·q)/R_t, q(t) = (Δ0/k)(1 − e^(−k t/R_t)), k = ΔVs/Cs + ΔVt/Ct.
  it("matches the exponential closed form for linear OCVs through a channel", () => {
    const cold: StageModel = { ...pfetStage, thermal: { kind: "junction-ambient", rthJaKPerW: 0 } };
    const m: ChargingModel = {
      ...base,
      stage: cold,
      currentLimitA: 1000,
      source: {
        capacityC: 50 * ah,
        ocvPoints: [
          { soc: 0, voltageV: 12 },
          { soc: 1, voltageV: 13 },
        ],
        internalResistanceOhm: 0.02,
        initialSoc: 0.9,
      },
      target: {
        capacityC: 10 * ah,
        ocvPoints: [
          { soc: 0, voltageV: 11.5 },
          { soc: 1, voltageV: 13 },
        ],
        internalResistanceOhm: 0.03,
        initialSoc: 0.2,
      },
      stop: { targetSoc: 0.5, minCurrentA: 1e-3, sourceMinSoc: 0, maxTimeS: 48 * 3600 },
    };
    const r = chargeBattery(m);
    if (r.outcome !== "charged") throw new Error(r.outcome);
    const rt = 0.05 + 0.005; // source + target + Rds(on) 5 mΩ at 10 V gate (clamped 12 V), 25 °C
    const k = 1 / (50 * ah) + 1.5 / (10 * ah);
    const d0 = 12.9 - (11.5 + 1.5 * 0.2);
    const q1 = 0.3 * 10 * ah;
    const tRef = (rt / k) * Math.log(d0 / (d0 - k * q1));
    expect(relativeError(r.timeS, tRef)).toBeLessThan(2e-4);
  });

  it("a Schottky drop leaves the target short of an ideal diode's final charge", () => {
    const s = chargeBattery(base);
    const i = chargeBattery({ ...base, stage: idealDiodeStage });
    if (s.outcome !== "charged" || i.outcome !== "charged") throw new Error("unsolved");
    expect(s.finalTargetSoc).toBeLessThan(i.finalTargetSoc - 0.01);
    expect(s.energy.stageLossJ).toBeGreaterThan(i.energy.stageLossJ);
  });

  it("a P-FET lets the full target drain a flat source; diodes and controllers block", () => {
    const p = chargeBattery({ ...base, stage: pfetStage });
    const d = chargeBattery(base);
    if (p.outcome !== "charged" || d.outcome !== "charged") throw new Error("unsolved");
    expect(p.reverse.blocks).toBe(false);
    expect(p.reverse.backCurrentA).toBeGreaterThan(1);
    expect(d.reverse.blocks).toBe(true);
    expect(d.reverse.backCurrentA).toBeLessThan(1e-3);
  });
});
