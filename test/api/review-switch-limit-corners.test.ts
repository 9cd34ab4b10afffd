import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext } from "../helpers/app.js";

// The review's steady corners of an integrated switch with a datasheet minimum current limit,
// against the closed form of a switch held at its current limit (docs/references.md, the
// integrated switch at its current limit): a resistive load R sets its own voltage I_lim·R, the
// switch dissipates (V_in − I_lim·R)·I_lim + Iq·V_in, Tj = Ta + Rth·P. That loss peaks at
// I_lim = V_in/(2R), so the lower limit heats more above that current and less below it: the load's
// supply is taken at the minimum limit, Tj and loss at whichever limit is hotter. Invented part.

type Verdict = { ruleId: string; outcome: string };
type Row = { outcome: string; mode?: string; currentA?: number; lossW?: number; tjC?: number; loadV?: number };
type Corner = Row & {
  conditions: { supplyV: number; ambientC: number; loadScale: number };
  hotterAtLimit?: Row & { currentLimitA: number };
};
type Cand = {
  verdict: string;
  corners: Corner[];
  worst: { tjC?: { value: number }; lossW?: { value: number } };
  rules: { verdicts: Verdict[] };
};
type Out = { candidates: Cand[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};
const IQ_A = 2e-4;
const sw = (o: Record<string, unknown>) => ({
  kind: "integrated-switch",
  name: "test switch",
  onResistanceOhm: "25 mOhm",
  startV: 2.5,
  belowStart: "blocks",
  regulatedDropV: "15 mV",
  quiescentA: IQ_A,
  maxVoltageV: 60,
  currentLimitA: 3,
  tjMaxC: 200,
  reverseRatingV: 60,
  ...o,
});
const input = (loadOhm: number, rth: number, minA: number | undefined, extra: Record<string, unknown> = {}) => ({
  requirement: {
    supply: { class: "vehicle-12v-b" },
    load: { kind: "resistive", resistanceOhm: loadOhm },
    ambient: { minC: -40, maxC: 85 },
    transients: [],
    ...extra,
  },
  candidates: [
    {
      stage: sw({ thermal: { kind: "junction-ambient", rthJaKPerW: rth }, thermalShutdownC: 190 }),
      ...(minA === undefined
        ? {}
        : { datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, currentLimitMinA: minA } }),
    },
  ],
});
const hotCorner = (c: Cand | undefined) =>
  c?.corners.find((k) => k.conditions.supplyV === 16 && k.conditions.ambientC === 85 && k.conditions.loadScale === 1);
const tjAt = (rth: number, vin: number, limitA: number, loadOhm: number) =>
  85 + rth * ((vin - limitA * loadOhm) * limitA + IQ_A * vin);
const rule = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;

describe("review: the steady corners at the worst current limit for each figure", () => {
  it("above V_in/(2R) the minimum limit is hotter: 16 V, 4 Ω, 2 A against 3 A (16 W against 12 W)", async () => {
    const out = await call(input(4, 5, 2));
    const hot = hotCorner(out.candidates[0]);
    expect(hot?.mode).toBe("current-limit");
    expect(hot?.loadV).toBeCloseTo(2 * 4, 9);
    expect(hot?.tjC).toBeCloseTo(tjAt(5, 16, 2, 4), 6); // 165.016 °C
    expect(hot?.hotterAtLimit).toBeUndefined();
    expect(out.candidates[0]?.worst.tjC?.value).toBeCloseTo(tjAt(5, 16, 2, 4), 6);
  });

  it("below V_in/(2R) the typical limit is hotter: 16 V, 2 Ω, 3 A (30 W) against 2 A (24 W); the load at 2 A·2 Ω", async () => {
    const out = await call(input(2, 2, 2));
    const c = out.candidates[0];
    const hot = hotCorner(c);
    expect(hot?.loadV).toBeCloseTo(2 * 2, 9);
    expect(hot?.tjC).toBeCloseTo(tjAt(2, 16, 2, 2), 6); // 133.006 °C at the minimum
    expect(hot?.hotterAtLimit?.currentLimitA).toBe(3);
    expect(hot?.hotterAtLimit?.tjC).toBeCloseTo(tjAt(2, 16, 3, 2), 6); // 145.006 °C at the typical
    expect(hot?.hotterAtLimit?.lossW).toBeCloseTo((16 - 6) * 3 + IQ_A * 16, 9);
    expect(c?.worst.tjC?.value).toBeCloseTo(tjAt(2, 16, 3, 2), 6);
    expect(c?.worst.lossW?.value).toBeCloseTo(30 + IQ_A * 16, 9);
  });

  it("without the minimum the corners stand at the typical limit, unchanged", async () => {
    const out = await call(input(4, 5, undefined));
    const hot = hotCorner(out.candidates[0]);
    expect(hot?.loadV).toBeCloseTo(3 * 4, 9);
    expect(hot?.tjC).toBeCloseTo(tjAt(5, 16, 3, 4), 6);
    expect(hot?.hotterAtLimit).toBeUndefined();
  });

  it("known-bad: a 150 °C shutdown passes at the typical 3 A (145 °C) but trips at the 2 A minimum (165 °C); a 2.9 A minimum (148.8 °C) passes", async () => {
    const at = (minA: number) => {
      const i = input(4, 5, minA);
      const cand = i.candidates[0] as { stage: Record<string, unknown> };
      cand.stage = { ...cand.stage, thermalShutdownC: 150 };
      return call(i);
    };
    const bad = (await at(2)).candidates[0];
    expect(rule(bad, "switch-thermal-shutdown-in-service")).toBe("fail");
    expect(bad?.verdict).toBe("fail");
    const twin = (await at(2.9)).candidates[0];
    expect(hotCorner(twin)?.tjC).toBeCloseTo(tjAt(5, 16, 2.9, 4), 6);
    expect(rule(twin, "switch-thermal-shutdown-in-service")).toBe("pass");
  });

  it("known-bad: at the 9 V lowest supply of code C a 4 Ω load draws 2.25 A: held at a 2 A minimum it gets 8 V, below its 8.5 V; a 2.9 A minimum does not limit", async () => {
    const bad = (await call(input(4, 5, 2, { loadMinV: 8.5, supply: { class: "vehicle-12v-c" } }))).candidates[0];
    const low = bad?.corners.find((k) => k.conditions.supplyV === 9 && k.conditions.loadScale === 1);
    expect(low?.loadV).toBeCloseTo(2 * 4, 9);
    expect(rule(bad, "load-voltage-min")).toBe("fail");
    const twin = (await call(input(4, 5, 2.9, { loadMinV: 8.5, supply: { class: "vehicle-12v-c" } }))).candidates[0];
    expect(rule(twin, "load-voltage-min")).toBe("pass");
  });
});

describe("review: datasheetMax without its factors", () => {
  it("takes rdsOnFactor and forwardVoltageFactor as 1, says so, and answers as with 1 and 1 given", async () => {
    const given = input(4, 5, 2);
    const bare = input(4, 5, undefined);
    const cand = bare.candidates[0] as Record<string, unknown>;
    cand["datasheetMax"] = { currentLimitMinA: 2 };
    const a = (await call(given)) as Out & { assumptions: string[] };
    const b = (await call(bare)) as Out & { assumptions: string[] };
    expect(b.candidates[0]?.corners).toEqual(a.candidates[0]?.corners);
    // the hot corner at the 2 A minimum: 85 + 5·((16 − 8)·2 + Iq·16) °C, as without the factors
    expect(hotCorner(b.candidates[0])?.tjC).toBeCloseTo(tjAt(5, 16, 2, 4), 6);
    const said = (o: { assumptions: string[] }) =>
      o.assumptions.some(
        (x) => x.includes("rdsOnFactor") && x.includes("forwardVoltageFactor") && x.includes("taken as 1"),
      );
    expect(said(b)).toBe(true);
    expect(said(a)).toBe(false);
  });

  it("sizing.catalog takes a datasheetMax with only a start-voltage maximum", async () => {
    const sizing = procedureInvoker(demoContext())("sizing.catalog");
    if (sizing === undefined) throw new Error("sizing.catalog missing");
    const out = (await sizing({
      requirement: {
        supply: { class: "vehicle-12v-b" },
        load: { kind: "constant-current", currentA: 3 },
        ambient: { minC: -40, maxC: 85 },
        transients: [],
      },
      datasheetMax: { startV: "4 V" },
      kinds: ["integrated-switch"],
    })) as { assumptions: string[] };
    expect(out.assumptions.some((x) => x.includes("rdsOnFactor") && x.includes("taken as 1"))).toBe(true);
  });
});
