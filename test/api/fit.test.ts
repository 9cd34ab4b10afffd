import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { fitOutput } from "../../contracts/fit.js";
import { appRouter } from "../../api/router.js";
import { cToK } from "../../domain/physics/constants.js";
import { type DiodeParams, diodeVoltageV } from "../../domain/physics/diode.js";
import { demoContext, postTrpc, testApp } from "../helpers/app.js";

type ErrBody = {
  error: {
    data: { httpStatus: number; backstop: { code: string; issues: { path: (string | number)[]; message: string }[] } };
  };
};

const caller = appRouter.createCaller(demoContext());
const example = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "fit.json"), "utf8")) as {
  input: Parameters<typeof caller.fit>[0];
};

// Points from the model itself (diode.ts, checked against ngspice in test/domain/diode.test.ts).
const truth: DiodeParams = {
  saturationCurrentA: 1e-8,
  ideality: 1.7,
  seriesResistanceOhm: 0.05,
  energyGapEv: 1.11,
  saturationTempExponent: 3,
  nominalTempK: cToK(25),
};
const pnPoints = [0.01, 0.05, 0.2, 0.5, 1, 2, 4].map((currentA) => ({
  currentA,
  voltageV: diodeVoltageV(truth, currentA, cToK(25)),
}));
const pnStage = (points: unknown[], extra: object = {}) => ({
  kind: "pn-diode",
  diode: { model: "points", points, ...extra },
  reverseRatingV: 100,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
});
const op = (stage: unknown) => ({
  stage,
  supplyV: "12 V",
  load: { kind: "constant-current", currentA: 1 },
  ambientC: 25,
});

describe("fit procedure", () => {
  it("fits the example's eight forward points at two temperatures, within the 2 % gate, and matches its contract", async () => {
    const r = fitOutput.parse(await caller.fit(example.input));
    expect(r.method).toBe("least-squares");
    expect(r.quality.withinBound).toBe(true);
    expect(r.residuals).toHaveLength(8);
    expect(r.parameters.find((p) => p.name === "energyGapEv")?.fitted).toBe(true);
    expect(r.assumptions.some((a) => a.includes("least-squares fit to 8 points"))).toBe(true);
  });

  it("gives a three-point diode exactly the parameters a part with those points gets (the exact fit)", async () => {
    const three = pnPoints.filter((_, i) => i % 3 === 0);
    const r = await caller.fit({ curve: "diode-forward", junction: "pn", diode: { model: "points", points: three } });
    expect(r.method).toBe("exact");
    expect(r.quality.worstFraction).toBeLessThan(1e-9);
    expect(Math.abs((r.parameters[1]?.value ?? 0) - 1.7)).toBeLessThan(1e-6);
    // The same model through an analysis: the fitted Shockley form gives the same operating point.
    const viaPoints = await caller.operatingPoint(op(pnStage(three)) as never);
    const viaModel = await caller.operatingPoint(op({ ...pnStage(three), diode: r.model }) as never);
    // (the records differ: they digest two different inputs)
    const { record: _m, ...modelled } = viaModel;
    const { record: _p, ...pointed } = viaPoints;
    expect(JSON.stringify({ ...modelled, assumptions: [] })).toBe(JSON.stringify({ ...pointed, assumptions: [] }));
  });

  it("takes the curve-points form in an analysis and records the fit's residuals in assumptions", async () => {
    const r = await caller.operatingPoint(op(pnStage(pnPoints)) as never);
    expect(
      r.assumptions.some((a) => /stage\.diode: Is, n, Rs fitted \(Eg held\): least-squares fit to 7 points/.test(a)),
    ).toBe(true);
  });

  const { app } = testApp();
  it("refuses a fit beyond its bound naming the worst point, and accepts it when asked", async () => {
    const bent = pnPoints.map((p, i) => (i === 4 ? { ...p, voltageV: p.voltageV * 1.08 } : p));
    const r = await postTrpc(app, "operatingPoint", op(pnStage(bent)));
    expect(r.status).toBe(400);
    const b = (r.body as ErrBody).error.data.backstop;
    expect(b.code).toBe("fit-failed");
    expect(b.issues.map((i) => i.path.join("."))).toEqual(["stage.diode.points.4"]);
    expect(b.issues[0]?.message).toMatch(/misses point 4 .* beyond the 2\.00 % bound/);
    const accepted = await caller.operatingPoint(op(pnStage(bent, { acceptFit: true })) as never);
    expect(accepted.assumptions.some((a) => a.includes("accepted by the caller (acceptFit)"))).toBe(true);
  });

  it("refuses a forward voltage falling with current, naming both points", async () => {
    const falling = pnPoints.map((p, i) => (i === 2 ? { ...p, voltageV: 0.3 } : p));
    const r = await postTrpc(app, "fit", {
      curve: "diode-forward",
      junction: "pn",
      diode: { model: "points", points: falling },
    });
    expect(r.status).toBe(400);
    const b = (r.body as ErrBody).error.data.backstop;
    expect(b.issues.map((i) => i.path.join("."))).toEqual(["diode.points.1", "diode.points.2"]);
  });

  it("fits Rds(on)(Tj), Zth(t) and IR(Tj, VR) curves to the forms a part takes", async () => {
    const rds = await caller.fit({
      curve: "rds-on-temperature",
      points: [-40, 25, 100, 175].map((tjC) => ({ tjC, rdsOnOhm: 0.01 * ((tjC + 273.15) / 298.15) ** 2.2 })),
    });
    expect(rds.model).toEqual({ law: "power", exponent: expect.closeTo(2.2, 9) });
    const times = Array.from({ length: 9 }, (_, i) => 1e-4 * 10 ** (i / 2));
    const zth = await caller.fit({
      curve: "zth",
      steadyKPerW: 2,
      points: times.map((timeS) => ({
        timeS,
        zthKPerW: 0.5 * -Math.expm1(-timeS / 1e-3) + 1.5 * -Math.expm1(-timeS / 0.3),
      })),
    });
    expect(zth.model).toMatchObject({ kind: "foster" });
    expect(zth.quality.worstFraction).toBeLessThan(1e-6);
    const leak = await caller.fit({
      curve: "reverse-leakage",
      points: [25, 125].map((tjC) => ({
        tjC,
        reverseV: 40,
        currentA:
          1e-5 *
          ((tjC + 273.15) / 298.15) ** 2 *
          Math.exp(-(0.65 / 8.617333262e-5) * (1 / (tjC + 273.15) - 1 / 298.15)),
      })),
    });
    expect(leak.method).toBe("exact");
    expect(leak.parameters.find((p) => p.name === "barrierEv")?.value).toBeCloseTo(0.65, 6);
  });
});
