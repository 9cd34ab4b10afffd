import { describe, expect, it } from "vitest";
import { cToK } from "../../domain/physics/constants.js";
import { diodeVoltageV } from "../../domain/physics/diode.js";
import { fitDiode } from "../../domain/physics/diode-fit.js";
import { solveOperatingPoint, solveThermalPoint } from "../../domain/solve/electrothermal-point.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import { idealDiode, lowSideFet, mosfet } from "../helpers/stages.js";
import { relativeError, withinTolerance } from "../helpers/tolerance.js";

const cc = (currentA: number) => ({ kind: "constant-current" as const, currentA });

function solved(r: ReturnType<typeof solveOperatingPoint>) {
  if (r.outcome !== "solved") throw new Error(`expected solved, got ${r.outcome}: ${"reason" in r ? r.reason : ""}`);
  return r.point;
}

describe("facts of the trade (common practice, docs/references.md)", () => {
  it("a 5 A-class Schottky at ~0.3 V near zero current and ~0.7 V at 5 A dissipates ~3.5 W at 5 A", () => {
    const fit = fitDiode(
      [
        { currentA: 0.05, voltageV: 0.3, tempK: cToK(25) },
        { currentA: 5, voltageV: 0.7, tempK: cToK(25) },
      ],
      { energyGapEv: 0.69, saturationTempExponent: 2, nominalTempK: cToK(25) },
    );
    if (!fit.ok) throw new Error(fit.message);
    const stage: StageModel = {
      kind: "schottky-diode",
      diode: fit.params,
      reverseRatingV: 45,
      tjMaxC: 150,
      thermal: { kind: "junction-ambient", rthJaKPerW: 0 },
    };
    const p = solved(
      solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 0, load: cc(5), ambientC: 25, rthKPerW: 0 }),
    );
    expect(p.forward.mode).toBe("junction");
    expect(withinTolerance(p.dieLossW, 3.5, 0.03)).toBe(true);
  });

  it("an ideal-diode N-FET of a few milliohms drops ~10 mV / ~50 mW at 5 A once running, a body-diode drop below start", () => {
    const stage = idealDiode(0.002, { startV: 4 });
    const on = solved(
      solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 0, load: cc(5), ambientC: 25, rthKPerW: 0 }),
    );
    expect(on.forward.mode).toBe("fully-enhanced");
    expect(withinTolerance(on.forward.dropV, 0.01, 0.05)).toBe(true);
    expect(withinTolerance(on.dieLossW, 0.05, 0.05)).toBe(true);
    const below = solved(
      solveOperatingPoint({ stage, supplyV: 3.5, sourceResistanceOhm: 0, load: cc(5), ambientC: 25, rthKPerW: 0 }),
    );
    expect(below.forward.mode).toBe("body-diode");
    expect(below.forward.dropV).toBeGreaterThan(0.3);
    expect(below.forward.dropV).toBeLessThan(1.0);
  });

  it("with a regulated drop the controller holds ~20 mV at light load", () => {
    const p = solved(
      solveOperatingPoint({
        stage: idealDiode(0.002, { regulatedDropV: 0.02 }),
        supplyV: 12,
        sourceResistanceOhm: 0,
        load: cc(1),
        ambientC: 25,
        rthKPerW: 0,
      }),
    );
    expect(p.forward.mode).toBe("regulated-drop");
    expect(p.forward.dropV).toBeCloseTo(0.02, 9);
  });
});

describe("electrothermal fixed point", () => {
  // Closed form: with a temperature exponent of zero, P does not depend on Tj and Tj = Ta + Rth·I²·R.
  it("equals the closed form when Rds(on) does not depend on temperature", () => {
    const stage = lowSideFet(0.01, 20, { law: "power", exponent: 0 });
    const p = solved(
      solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 0, load: cc(10), ambientC: 40, rthKPerW: 20 }),
    );
    // The body diode (Is 10 fA) takes a negligible share at 0.1 V; compare the full drop.
    expect(relativeError(p.tjC, 40 + 20 * 10 * p.forward.dropV)).toBeLessThan(1e-9);
    expect(relativeError(p.forward.dropV, 0.1)).toBeLessThan(1e-6);
  });

  // Closed form (docs/references.md, self-heating with a linear coefficient a, checkable by substitution):
  // Tj = (Ta + I²·R25·Rth·(1 − 25·a)) / (1 − I²·R25·Rth·a).
  it("matches the linear-coefficient self-heating closed form", () => {
    const a = 0.006;
    const law = {
      law: "points" as const,
      points: [-50, 400].map((tC) => ({ tempK: cToK(tC), factor: 1 + a * (tC - 25) })),
    };
    const stage = lowSideFet(0.005, 15, law);
    const i = 12;
    const p = solved(
      solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 0, load: cc(i), ambientC: 60, rthKPerW: 15 }),
    );
    const k = i * i * 0.005 * 15;
    const closed = (60 + k * (1 - 25 * a)) / (1 - k * a);
    expect(Math.abs(p.tjC - closed)).toBeLessThan(1e-3);
    expect(p.thermalLoopGain).toBeGreaterThan(0);
    expect(p.thermalLoopGain).toBeLessThan(1);
  });

  it("reports thermal runaway when Rth·dP/dT > 1 at every temperature", () => {
    // P(T) = I²·R25·(T/298.15)^2.3 with I²R25 = 4 W and Rth = 100 K/W: Rth·dP/dT ≥ 3 from 25 °C up.
    const stage = lowSideFet(0.01, 100, { law: "power", exponent: 2.3 });
    const r = solveOperatingPoint({
      stage,
      supplyV: 12,
      sourceResistanceOhm: 0,
      load: cc(20),
      ambientC: 25,
      rthKPerW: 100,
    });
    expect(r.outcome).toBe("thermal-runaway");
    if (r.outcome !== "thermal-runaway") return;
    expect(r.evidence.thermalLoopGainAtSearchEnd).toBeGreaterThan(1);
    expect(Number.isFinite(r.evidence.lossAtSearchEndW)).toBe(true);
  });

  it("reports a stable point above the junction limit as over-temperature, not as a number that passes", () => {
    const stage = lowSideFet(0.01, 30, { law: "power", exponent: 0 });
    const r = solveOperatingPoint({
      stage,
      supplyV: 12,
      sourceResistanceOhm: 0,
      load: cc(20),
      ambientC: 85,
      rthKPerW: 30,
    });
    expect(r.outcome).toBe("over-temperature");
    if (r.outcome === "over-temperature") expect(r.point.tjC).toBeCloseTo(85 + 30 * 4, 2);
  });

  // Independent check: for a diode (loss falls with temperature) the solution satisfies
  // Tj = Ta + Rth·Vf(I, Tj)·I, checked by substitution into the diode equation.
  it("a diode's self-consistent point satisfies Tj = Ta + Rth·I·Vf(I, Tj)", () => {
    const diode = {
      saturationCurrentA: 2e-6,
      ideality: 1.1,
      seriesResistanceOhm: 0.02,
      energyGapEv: 0.69,
      saturationTempExponent: 2,
      nominalTempK: cToK(25),
    };
    const stage: StageModel = {
      kind: "schottky-diode",
      diode,
      reverseRatingV: 40,
      tjMaxC: 175,
      thermal: { kind: "junction-ambient", rthJaKPerW: 30 },
    };
    const p = solved(
      solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 0, load: cc(3), ambientC: 50, rthKPerW: 30 }),
    );
    const vf = diodeVoltageV(diode, 3, cToK(p.tjC));
    expect(Math.abs(p.tjC - (50 + 30 * 3 * vf))).toBeLessThan(1e-6);
  });
});

describe("loads", () => {
  // Closed form: a constant-power load P behind a series resistance R from Vin sits at the stable
  // root V = (Vin + √(Vin² − 4PR))/2; with Vin² < 4PR there is none (collapse).
  it("constant power behind a resistive drop matches the quadratic's stable root", () => {
    const stage = lowSideFet(0.001, 0, { law: "power", exponent: 0 });
    const vin = 12;
    const r = 0.3 + 0.001;
    const pW = 60;
    const p = solved(
      solveOperatingPoint({
        stage,
        supplyV: vin,
        sourceResistanceOhm: 0.3,
        load: { kind: "constant-power", powerW: pW, minVoltageV: 5 },
        ambientC: 25,
        rthKPerW: 0,
      }),
    );
    const v = (vin + Math.sqrt(vin * vin - 4 * pW * r)) / 2;
    expect(relativeError(p.loadV, v)).toBeLessThan(1e-6);
    expect(relativeError(p.loadV * p.currentA, pW)).toBeLessThan(1e-9);
  });

  it("constant power beyond Vin²/(4R) reports collapse with the deliverable maximum", () => {
    const stage = lowSideFet(0.001, 0, { law: "power", exponent: 0 });
    const r = solveOperatingPoint({
      stage,
      supplyV: 12,
      sourceResistanceOhm: 0.3,
      load: { kind: "constant-power", powerW: 130, minVoltageV: 5 },
      ambientC: 25,
      rthKPerW: 0,
    });
    expect(r.outcome).toBe("load-collapse");
    if (r.outcome === "load-collapse")
      expect(relativeError(r.maxDeliverablePowerW ?? 0, (12 * 12) / (4 * 0.301))).toBeLessThan(1e-4);
  });

  it("a constant-power load below its minimum voltage reports undervoltage with the point", () => {
    const stage = lowSideFet(0.001, 0, { law: "power", exponent: 0 });
    const r = solveOperatingPoint({
      stage,
      supplyV: 8,
      sourceResistanceOhm: 0.1,
      load: { kind: "constant-power", powerW: 50, minVoltageV: 7.5 },
      ambientC: 25,
      rthKPerW: 0,
    });
    expect(r.outcome).toBe("load-undervoltage");
  });

  // Closed form: a resistive load behind a pure resistance is a divider.
  it("a resistive load is a divider", () => {
    const stage = lowSideFet(0.002, 0, { law: "power", exponent: 0 });
    const p = solved(
      solveOperatingPoint({
        stage,
        supplyV: 12,
        sourceResistanceOhm: 0.048,
        load: { kind: "resistive", resistanceOhm: 2.35 },
        ambientC: 25,
        rthKPerW: 0,
      }),
    );
    expect(relativeError(p.currentA, 12 / 2.4)).toBeLessThan(1e-7);
  });

  it("an integrated switch that blocks below its start voltage leaves the load unpowered", () => {
    const stage: StageModel = {
      kind: "integrated-switch",
      channel: {
        rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: 0.03 }],
        thresholdV: 1,
        tempLaw: { law: "power", exponent: 2.3 },
      },
      internalGateV: 10,
      startV: 2.5,
      belowStart: { mode: "blocks" },
      regulatedDropV: 0,
      quiescentA: 1e-3,
      maxVoltageV: 36,
      blocksReverseCurrent: false,
      tjMaxC: 150,
      thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
    };
    expect(
      solveOperatingPoint({ stage, supplyV: 2, sourceResistanceOhm: 0, load: cc(1), ambientC: 25, rthKPerW: 50 })
        .outcome,
    ).toBe("stage-off");
    const on = solved(
      solveOperatingPoint({ stage, supplyV: 5, sourceResistanceOhm: 0, load: cc(1), ambientC: 25, rthKPerW: 50 }),
    );
    // Die heat includes the switch's own supply current: I²R(T) + Iq·Vin.
    expect(on.dieLossW).toBeGreaterThan(0.03 + 1e-3 * 5);
  });
});

describe("gate drive", () => {
  it("a P-FET whose gate drive falls below the lowest datasheet point is partially enhanced, with a higher drop", () => {
    const stage: StageModel = {
      kind: "pfet-high-side",
      mosfet: { ...lowSideFetMosfet() },
      thermal: { kind: "junction-ambient", rthJaKPerW: 0 },
    };
    const hi = solved(
      solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 0, load: cc(2), ambientC: 25, rthKPerW: 0 }),
    );
    const lo = solved(
      solveOperatingPoint({ stage, supplyV: 3.5, sourceResistanceOhm: 0, load: cc(2), ambientC: 25, rthKPerW: 0 }),
    );
    expect(hi.forward.mode).toBe("fully-enhanced");
    expect(lo.forward.mode).toBe("partially-enhanced");
    expect(lo.forward.dropV).toBeGreaterThan(hi.forward.dropV);
    // |Vgs| = Vin − drop for a P-FET with its gate to ground (source at the output).
    expect(Math.abs((lo.forward.gateSourceV ?? 0) - (3.5 - lo.forward.dropV))).toBeLessThan(1e-9);
  });
});

function lowSideFetMosfet() {
  return mosfet(0.01);
}

describe("solveThermalPoint (no loop-gain probe)", () => {
  // The same search stopped at the same root: every field equal, one circuit solve fewer.
  it("gives solveOperatingPoint's point without the gain, one circuit solve fewer", () => {
    const stage = lowSideFet(0.01, 40, { law: "power", exponent: 2.3 });
    for (const [currentA, ambientC] of [
      [2, 25],
      [6, 85],
    ] as const) {
      const m = { stage, supplyV: 12, sourceResistanceOhm: 0.02, load: cc(currentA), ambientC, rthKPerW: 40 };
      const full = solved(solveOperatingPoint(m));
      const r = solveThermalPoint(m);
      if (r.outcome !== "solved") throw new Error(r.outcome);
      const { thermalLoopGain, iterations, ...rest } = full;
      expect(thermalLoopGain).toBeGreaterThan(0);
      expect(r.point).toEqual({ ...rest, iterations: iterations - 1 });
      expect("thermalLoopGain" in r.point).toBe(false);
    }
  });
});
