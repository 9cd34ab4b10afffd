import { describe, expect, it } from "vitest";
import { appRouter } from "../../api/router.js";
import { cToK } from "../../domain/physics/constants.js";
import { type DiodeParams, diodeVoltageV } from "../../domain/physics/diode.js";
import { demoContext } from "../helpers/app.js";

const caller = appRouter.createCaller(demoContext());

// Points from diode.ts's linear law (the curve at 25 °C shifted by tc·(T − 25 °C)), noise-free:
// the fit procedure must give back the coefficient they were made with.
const truth: DiodeParams = {
  saturationCurrentA: 1e-9,
  ideality: 1.5,
  seriesResistanceOhm: 0.02,
  energyGapEv: 1.11,
  saturationTempExponent: 3,
  nominalTempK: cToK(25),
  linearTempCoVPerK: -0.0021,
};
const points = [25, 100].flatMap((tempC) =>
  [0.1, 0.5, 1, 3].map((currentA) => ({ currentA, tempC, voltageV: diodeVoltageV(truth, currentA, cToK(tempC)) })),
);

describe("the fit procedure fits a linear Vf temperature coefficient when the caller chooses that law", () => {
  it("returns the coefficient as a fitted parameter with its standard error, and the linear law as the model", async () => {
    const r = await caller.fit({
      curve: "diode-forward",
      junction: "pn",
      diode: { model: "points", points, temperatureLaw: "linear" },
    });
    const tc = r.parameters.find((p) => p.name === "vfTempCoVPerK");
    expect(tc?.fitted).toBe(true);
    expect(Math.abs((tc?.value ?? 0) + 0.0021)).toBeLessThan(1e-8);
    expect(r.parameters.some((p) => p.name === "energyGapEv")).toBe(false);
    expect(r.model).toMatchObject({ model: "shockley", vfTempCoVPerK: expect.closeTo(-0.0021, 8) });
    expect(r.quality.converged).toBe(true);
    expect(
      r.assumptions.some((a) => a.includes("linear Vf temperature coefficient fitted: least-squares fit to 8 points")),
    ).toBe(true);
    // No Eg/XTI default is claimed for a linear-law diode.
    expect(r.assumptions.some((a) => a.includes("XTI"))).toBe(false);
  });

  it("refuses the linear law from one temperature, and with a held coefficient or Eg as well", async () => {
    const oneT = points.filter((p) => p.tempC === 25);
    await expect(
      caller.fit({
        curve: "diode-forward",
        junction: "pn",
        diode: { model: "points", points: oneT, temperatureLaw: "linear" },
      }),
    ).rejects.toThrow(/two temperatures or more \(4 points at 1 temperature given\)/);
    await expect(
      caller.fit({
        curve: "diode-forward",
        junction: "pn",
        diode: { model: "points", points, temperatureLaw: "linear", vfTempCoVPerK: -0.002 },
      }),
    ).rejects.toThrow(/drop temperatureLaw to hold it, or drop vfTempCoVPerK to fit it/);
    await expect(
      caller.fit({
        curve: "diode-forward",
        junction: "pn",
        diode: { model: "points", points, temperatureLaw: "linear", energyGapEv: 1.1 },
      }),
    ).rejects.toThrow(/the linear law takes no Eg\/XTI/);
  });
});
