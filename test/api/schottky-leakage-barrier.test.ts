import { describe, expect, it } from "vitest";
import { toStageModel } from "../../api/map/stage-model.js";
import { appRouter } from "../../api/router.js";
import { stageSpec } from "../../contracts/stage.js";
import { reverseSteady } from "../../domain/checks/reverse-steady.js";
import { cToK } from "../../domain/physics/constants.js";
import { demoContext } from "../helpers/app.js";

// Source: thermionic emission over a Schottky barrier, IR ∝ T²·exp(−q·ΦB/(k·T)) (S. M. Sze and
// K. K. Ng, Physics of Semiconductor Devices, 3rd ed., §3.3; docs/references.md). The closed form
// is written out here with the SI constants, independently of domain/physics/schottky-leakage.ts.
const K_B = 1.380649e-23;
const Q_E = 1.602176634e-19;
const closedForm = (i0A: number, t0C: number, tC: number, barrierEv: number) => {
  const t0 = t0C + 273.15;
  const t = tC + 273.15;
  return i0A * (t / t0) ** 2 * Math.exp(((-barrierEv * Q_E) / K_B) * (1 / t - 1 / t0));
};

// A 40 V-class Schottky whose forward points fit a high n (the case the issue names: with the
// forward fit's Is(T), 25 → 125 °C gave ×49 where thermionic emission gives ×630–1500).
const schottky = (reverseLeakage: Record<string, unknown>) => ({
  kind: "schottky-diode",
  diode: {
    model: "points",
    points: [
      { currentA: 0.1, voltageV: 0.3 },
      { currentA: 1, voltageV: 0.42 },
      { currentA: 5, voltageV: 0.6 },
    ],
  },
  reverseRatingV: 40,
  reverseLeakage,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
});

async function leakageAt125(reverseLeakage: Record<string, unknown>) {
  const out = await appRouter.createCaller(demoContext()).holdUp({
    stages: [schottky(reverseLeakage)],
    outputV: "12 V",
    capacitor: { capacitanceF: "1000 uF", esrOhm: "30 mOhm" },
    load: { kind: "constant-power", powerW: 20, minVoltageV: "8 V" },
    tjC: "125 degC",
    input: {
      kind: "falls",
      inputAfterV: "0 V",
      loop: { resistanceOhm: "20 mOhm", inductanceH: "1 uH" },
      reverseRecoveryChargeC: "20 nC",
    },
  } as never);
  const body = JSON.parse(JSON.stringify(out)) as {
    assumptions: string[];
    stages: { result: { reverseLeakageA: number } }[];
  };
  return { leakageA: body.stages[0]?.result.reverseLeakageA ?? Number.NaN, assumptions: body.assumptions };
}

describe("a Schottky's reverse leakage follows thermionic emission, not the forward fit", () => {
  it.each([0.5, 0.6, 0.75])(
    "one 25 °C figure and ΦB = %s eV: the 125 °C leakage within a factor 2 of the closed form",
    async (barrierEv) => {
      const { leakageA } = await leakageAt125({ currentA: "50 uA", tempC: 25, barrierEv });
      const expected = closedForm(50e-6, 25, 125, barrierEv);
      expect(leakageA / expected).toBeGreaterThan(0.5);
      expect(leakageA / expected).toBeLessThan(2);
    },
  );

  it("no barrier given: the stated default (0.7 eV) is applied and said in the assumptions", async () => {
    const { leakageA, assumptions } = await leakageAt125({ currentA: "50 uA", tempC: 25 });
    expect(assumptions.some((a) => /barrier height 0\.7 eV/.test(a) && /memory/.test(a))).toBe(true);
    const ratio = leakageA / closedForm(50e-6, 25, 125, 0.7);
    expect(ratio).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(2);
    // The old Is(T) scaling of the forward fit gave far less than ×300 from 25 to 125 °C.
    expect(leakageA / 50e-6).toBeGreaterThan(300);
  });

  it("a figure at a hot junction carries down and up by the same law", async () => {
    const { leakageA } = await leakageAt125({ currentA: "20 mA", tempC: 150, barrierEv: 0.65 });
    const ratio = leakageA / closedForm(20e-3, 150, 125, 0.65);
    expect(Math.abs(ratio - 1)).toBeLessThan(0.01);
  });

  it("the voltage power m scales the figure from its voltage", async () => {
    const { leakageA } = await leakageAt125({
      currentA: "50 uA",
      tempC: 25,
      barrierEv: 0.6,
      reverseV: 40,
      voltageExponent: 0.5,
    });
    // holdUp's reverse voltage is the 12 V held output with the input at 0 V.
    const ratio = leakageA / (closedForm(50e-6, 25, 125, 0.6) * Math.sqrt(12 / 40));
    expect(Math.abs(ratio - 1)).toBeLessThan(0.02);
  });

  it("a PN diode refuses a barrier height, naming the field", async () => {
    const stage = { ...schottky({ currentA: "1 uA", tempC: 25, barrierEv: 0.6 }), kind: "pn-diode" };
    await expect(
      appRouter.createCaller(demoContext()).operatingPoint({ stage, currentA: 1, ambientC: 25 } as never),
    ).rejects.toThrow(/barrierEv|reverseLeakage/);
  });
});

describe("the known-bad hot-leakage design (test/known-bad/designs.ts) under both laws", () => {
  // The same stage and reversed 14 V at 100 °C on 35 K/W: the forward fit's Is(T) scaling of the
  // 40 µA figure (what a Schottky got before, still a PN diode's law) settles; thermionic
  // emission over 0.7 eV runs away — the stability bound is Rth·VR·IR(Ta)·(d ln IR/dT) < 1/e.
  it("settles with the Is(T) scaling, runs away with thermionic emission", () => {
    const spec = stageSpec.parse({
      kind: "schottky-diode",
      diode: { model: "shockley", saturationCurrentA: "40 uA", ideality: 1.15, seriesResistanceOhm: "18 mOhm" },
      reverseRatingV: 60,
      reverseLeakage: { currentA: "40 uA", tempC: 25, barrierEv: 0.7 },
      tjMaxC: 175,
      thermal: { kind: "junction-ambient", rthJaKPerW: 35 },
    });
    const model = toStageModel(spec, { kind: "junction-ambient", rthJaKPerW: 35 }, ["stage"], []);
    if (model.kind !== "schottky-diode") throw new Error(model.kind);
    expect(reverseSteady(model, 14, 100, { currentA: 40e-6, tempK: cToK(25) }).outcome).toBe("blocks");
    expect(reverseSteady(model, 14, 100, model.reverseLeakage).outcome).toBe("leakage-runaway");
    // The closed-form bound at 100 °C: IR(100 °C) by the law, slope 2/T + ΦB/(k·T²).
    const t = cToK(100);
    const ir = closedForm(40e-6, 25, 100, 0.7);
    const slope = 2 / t + (0.7 * Q_E) / (K_B * t * t);
    expect(35 * 14 * ir * slope).toBeGreaterThan(1 / Math.E);
  });
});
