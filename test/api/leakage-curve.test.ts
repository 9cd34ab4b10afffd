import { describe, expect, it } from "vitest";
import { appRouter } from "../../api/router.js";
import { toStageModel } from "../../api/map/stage-model.js";
import { stageSpec } from "../../contracts/stage.js";
import { reverseSteady } from "../../domain/checks/reverse-steady.js";
import { cToK, T25_K } from "../../domain/physics/constants.js";
import { type LeakageLaw, leakageCurrentA } from "../../domain/physics/schottky-leakage.js";
import { demoContext } from "../helpers/app.js";

// Source: the thermionic-emission law (Sze and Ng, Physics of Semiconductor Devices, 3rd ed.,
// section 3.3; domain/physics/schottky-leakage.ts): a stage given IR(Tj, VR) points of a barrier
// must report, at any junction temperature, the leakage of that law (the Is(T) scaling of one
// point understates a hot Schottky's leakage by an order of magnitude).
const law: LeakageLaw = { refCurrentA: 50e-6, refTempK: T25_K, refVoltageV: 40, barrierEv: 0.6, voltageExponent: 0.3 };
const points = [25, 75, 125].flatMap((tjC) =>
  [10, 40].map((reverseV) => ({
    tjC,
    reverseV,
    currentA: leakageCurrentA(law, cToK(tjC), reverseV) * (reverseV === 10 ? 1.05 : 0.97),
  })),
);
const stage = {
  kind: "schottky-diode",
  diode: { model: "shockley", saturationCurrentA: 5e-6, ideality: 1.05, seriesResistanceOhm: 0.03 },
  reverseRatingV: 40,
  reverseLeakage: { points },
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
};

describe("a diode stage described by its reverse-leakage curves", () => {
  it("carries the fitted law into the steady reverse check: the leakage at its Tj within 10 % of the source law", () => {
    const assumptions: string[] = [];
    const model = toStageModel(
      stageSpec.parse(stage),
      { kind: "junction-ambient", rthJaKPerW: 40 },
      ["stage"],
      assumptions,
    );
    expect(
      assumptions.some((a) => a.startsWith("stage.reverseLeakage: barrier height, VR power and reference current")),
    ).toBe(true);
    if (model.kind !== "schottky-diode" || model.reverseLeakage === undefined) throw new Error("no leakage");
    const r = reverseSteady(model, 24, 85, model.reverseLeakage);
    if (r.outcome !== "blocks") throw new Error(r.outcome);
    const expected = leakageCurrentA(law, cToK(r.tjC), 24);
    expect(Math.abs(r.leakageA / expected - 1)).toBeLessThan(0.1);
    // Conservation: the self-heated junction sits at Ta + Rth·VR·IR.
    expect(Math.abs(r.tjC - (85 + 40 * 24 * r.leakageA))).toBeLessThan(1e-6);
  });

  it("reports that leakage through holdUp at 125 °C (within 10 % of the law at the capacitor voltage)", async () => {
    const caller = appRouter.createCaller(demoContext());
    const out = await caller.holdUp({
      stages: [stage],
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
    const row = JSON.parse(JSON.stringify(out)).stages[0].result as {
      reverseLeakageA: number;
      startCapacitorV: number;
    };
    expect(Math.abs(row.reverseLeakageA / leakageCurrentA(law, cToK(125), row.startCapacitorV) - 1)).toBeLessThan(0.1);
  });

  it("refuses leakage points that fall with temperature, naming them", () => {
    const bad = {
      ...stage,
      reverseLeakage: { points: points.map((p, i) => (i === 4 ? { ...p, currentA: 1e-9 } : p)) },
    };
    expect(() =>
      toStageModel(stageSpec.parse(bad), { kind: "junction-ambient", rthJaKPerW: 40 }, ["stage"], []),
    ).toThrow(/falls by more than 25 % with rising Tj between points 2 and 4/);
  });
});
