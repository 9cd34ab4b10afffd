import { describe, expect, it } from "vitest";
import { type HoldUpModel, holdUp } from "../../../domain/checks/hold-up.js";
import { type DischargeModel, dischargeTime } from "../../../domain/checks/hold-up-discharge.js";
import type { LoadModel } from "../../../domain/solve/load-model.js";
import { integrateRk45 } from "../../../domain/solve/ode-rk45.js";
import { relativeError } from "../../helpers/tolerance.js";
import { idealDiodeStage, pfetStage, pnStage, schottkyStage } from "../../fixtures/reverse-stages.js";

/**
 * Independent oracle: integrate C·dv_C/dt = −(i_load(v_out) + I_lk) numerically, with v_out found
 * from v_out = v_C − ESR·(i_load(v_out) + I_lk) by fixed-point iteration, to the event v_out = Vmin.
 */
function numericHoldUp(m: DischargeModel): number {
  const iload = (v: number): number =>
    m.load.kind === "constant-current"
      ? m.load.currentA
      : m.load.kind === "resistive"
        ? v / m.load.resistanceOhm
        : m.load.powerW / v;
  const vout = (vc: number): number => {
    let v = vc;
    for (let k = 0; k < 200; k += 1) v = vc - m.esrOhm * (iload(v) + m.leakageA);
    return v;
  };
  const r = integrateRk45((_t, y) => [-(iload(vout(y[0] ?? 0)) + m.leakageA) / m.capacitanceF], 0, [m.capacitorV], 10, {
    rtol: 1e-11,
    atol: 1e-12,
    initialStepS: 1e-6,
    maxStepS: 1e-2,
    maxSteps: 1e6,
    event: (_t, y) => vout(y[0] ?? 0) - m.loadMinV,
  });
  return r.t;
}

const loads: [string, LoadModel][] = [
  ["constant current", { kind: "constant-current", currentA: 2 }],
  ["resistive", { kind: "resistive", resistanceOhm: 6 }],
  ["constant power", { kind: "constant-power", powerW: 24, minVoltageV: 9 }],
];

describe("hold-up closed forms", () => {
  // Source: closed forms (linear, exponential, energy/quadrature) against numerical integration.
  it.each(loads)("%s load with ESR and leakage agrees with RK45 within 1e-6", (_n, load) => {
    const m: DischargeModel = { capacitorV: 12, capacitanceF: 470e-6, esrOhm: 0.05, load, loadMinV: 9, leakageA: 0.01 };
    const d = dischargeTime(m);
    if (d.outcome !== "holds") throw new Error(d.outcome);
    expect(relativeError(d.timeS, numericHoldUp(m))).toBeLessThan(1e-6);
  });

  // Source: energy form t = C·(V0² − Vmin²)/(2P) (capacitor energy ½CV² delivered at power P).
  it("constant power without ESR is the energy form", () => {
    const d = dischargeTime({
      capacitorV: 12,
      capacitanceF: 1e-3,
      esrOhm: 0,
      load: { kind: "constant-power", powerW: 10, minVoltageV: 9 },
      loadMinV: 9,
      leakageA: 0,
    });
    expect(d.outcome === "holds" && d.timeS).toBeCloseTo((1e-3 * (144 - 81)) / 20, 12);
  });
});

const model: HoldUpModel = {
  stage: schottkyStage,
  outputV: 12,
  capacitanceF: 470e-6,
  esrOhm: 0.02,
  load: { kind: "constant-current", currentA: 0.5 },
  loadMinV: 9,
  tjC: 25,
  input: {
    kind: "falls",
    inputAfterV: 0,
    loopResistanceOhm: 0.02,
    loopInductanceH: 1e-6,
    reverseRecoveryChargeC: 20e-9,
  },
};

describe("hold-up per stage kind", () => {
  it("a hot Schottky's leakage shortens hold-up; a PN diode's barely does", () => {
    const cold = holdUp(model);
    const hot = holdUp({ ...model, tjC: 125 });
    const pn = holdUp({ ...model, stage: pnStage, tjC: 125 });
    if (cold.outcome !== "holds" || hot.outcome !== "holds" || pn.outcome !== "holds")
      throw new Error("expected holds");
    // Source: SPICE Is(T) law with Eg = 0.69 eV, XTI = 2: Is grows ~ (T ratio)^(XTI/n)·exp(...) ≫ 100× over 100 K.
    expect(hot.reverseLeakageA / cold.reverseLeakageA).toBeGreaterThan(100);
    expect(hot.holdUpS).toBeLessThan(cold.holdUpS);
    expect(pn.reverseLeakageA).toBeLessThan(hot.reverseLeakageA / 100);
  });

  it("a P-FET drains back into the short: hold-up is the reverse-drain time, far shorter", () => {
    const p = holdUp({ ...model, stage: pfetStage });
    const d = holdUp({
      ...model,
      stage: idealDiodeStage,
      input: { ...model.input, controller: { reverseThresholdV: 0.03, turnOffDelayS: 1e-6 } } as HoldUpModel["input"],
    });
    expect(p.outcome).toBe("drains-back");
    expect(d.outcome).toBe("holds");
    if (p.outcome !== "drains-back" || d.outcome !== "holds") return;
    expect(p.holdUpS).toBeLessThan(d.holdUpS / 100);
    // Source: linear CC discharge C·ΔV/I = 470 µF·3 V/0.5 A ≈ 2.82 ms, less the event's charge.
    expect(d.holdUpS).toBeLessThan((470e-6 * 3) / 0.5);
    expect(d.holdUpS).toBeGreaterThan((0.5 * (470e-6 * 3)) / 0.5);
  });

  it("an open input takes nothing back: all stages give the load-only time", () => {
    const t = [schottkyStage, pfetStage].map((stage) => holdUp({ ...model, stage, input: { kind: "open" } }));
    for (const r of t)
      expect(r.outcome === "holds" && r.holdUpS).toBeCloseTo((470e-6 * (12 - 0.02 * 0.5 - 9)) / 0.5, 12);
  });
});
