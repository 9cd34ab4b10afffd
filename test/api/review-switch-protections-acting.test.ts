import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext } from "../helpers/app.js";

// An integrated switch's protections as they act, through the review, against closed forms
// (docs/references.md: the integrated switch at its current limit; overvoltage cut-off with
// hysteresis; thermal shutdown of an integrated switch): a cut-off opened above Vth recloses only
// below Vth − H; an auto-retrying shutdown cycles with t = τ·ln(...) heating and cooling (one
// pole); the start-up profile's junction follows Ta + R·P + (T0 − Ta − R·P)·e^(−t/τ) (one Foster
// pole) to the shutdown. Invented part; the vehicle 12 V code B class: 8–16 V, jump start 24 V,
// long-term overvoltage 18 V.

type Verdict = { ruleId: string; outcome: string; values: Record<string, number | boolean> };
type Corner = { conditions: { supplyV: number; ambientC: number }; lossW?: number; tjC?: number };
type Profile = {
  ambientC: number;
  result: {
    dropoutTimeS: number;
    thermalShutdownAtS?: number;
    samples: { timeS: number; lossW: number; tjC: number; mode: string }[];
  };
};
type Cand = {
  verdict: string;
  corners: Corner[];
  rules: { verdicts: Verdict[] };
  metrics: Record<string, number | boolean>;
  startUp: { profiles: Profile[] };
  loadOvervoltage: {
    hold?: { reclosesBelowV: number; excursion?: string; heldOff: { level: string; levelV: number }[] };
  };
  thermalShutdownCycle?: {
    corner: number;
    ambientC: number;
    cycle: {
      outcome: string;
      onLossW: number;
      dutyOn: number;
      averageLossW: number;
      heatS?: number;
      coolS?: number;
      periodS?: number;
    };
  };
};
type Out = { candidates: Cand[]; assumptions: string[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  // curves: the start-up profiles with their samples, which these checks read
  return (await review({ ...(input as object), curves: true })) as Out;
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
  tjMaxC: 200,
  thermal: { kind: "junction-ambient", rthJaKPerW: 5 },
  reverseRatingV: 60,
  ...o,
});
const requirement = (o: Record<string, unknown> = {}) => ({
  supply: { class: "vehicle-12v-b" },
  load: { kind: "resistive", resistanceOhm: 4 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
  ...o,
});
const rule = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;

describe("review: the overvoltage cut-off's hysteresis", () => {
  const cutoff = (h: number | undefined) =>
    sw({ overvoltageCutoffV: 20, ...(h === undefined ? {} : { overvoltageHysteresisV: h }) });

  it("after the 24 V jump start a 20 V cut-off with 5 V hysteresis recloses below 15 V: 16 V and 18 V hold it open", async () => {
    const out = await call({ requirement: requirement(), candidates: [{ stage: cutoff(5) }] });
    const c = out.candidates[0];
    expect(c?.loadOvervoltage.hold?.reclosesBelowV).toBe(15);
    expect(c?.loadOvervoltage.hold?.excursion).toBe("jump-start");
    expect(c?.loadOvervoltage.hold?.heldOff).toEqual([
      { level: "supply-max", levelV: 16 },
      { level: "long-term-overvoltage", levelV: 18 },
    ]);
    // known-bad: the normal supply's top inside the band: the load stays off after the excursion
    expect(c?.metrics["overvoltageCutoffV"]).toBe(15);
    expect(rule(c, "switch-cutoff-above-supply")).toBe("fail");
  });

  it("its twin with 1 V hysteresis recloses below 19 V: nothing held, the rule passes", async () => {
    const c = (await call({ requirement: requirement(), candidates: [{ stage: cutoff(1) }] })).candidates[0];
    expect(c?.loadOvervoltage.hold?.heldOff).toEqual([]);
    expect(c?.metrics["overvoltageCutoffV"]).toBe(19);
    expect(rule(c, "switch-cutoff-above-supply")).toBe("pass");
  });

  it("without the field the hysteresis is 0, said in the assumptions", async () => {
    const out = await call({ requirement: requirement(), candidates: [{ stage: cutoff(undefined) }] });
    expect(out.candidates[0]?.metrics["overvoltageCutoffV"]).toBe(20);
    expect(out.assumptions.some((a) => a.includes("overvoltageHysteresisV") && a.includes("taken as 0"))).toBe(true);
  });

  it("along a start-up profile 14 → 22 → 17 V the open switch stays open in the band (dropout to the end) and recloses below it", async () => {
    const profile = [
      { timeS: 0, voltageV: 14 },
      { timeS: 0.1, voltageV: 14 },
      { timeS: 0.11, voltageV: 22 },
      { timeS: 0.2, voltageV: 22 },
      { timeS: 0.21, voltageV: 17 },
      { timeS: 1, voltageV: 17 },
    ];
    const dropout = async (h: number | undefined) =>
      (await call({ requirement: requirement({ startProfile: profile }), candidates: [{ stage: cutoff(h) }] }))
        .candidates[0]?.startUp.profiles[0]?.result.dropoutTimeS ?? Number.NaN;
    // open from the rise through 20 V (t = 0.1075 s); 40 samples a segment: 0.25 ms steps there
    expect(Math.abs((await dropout(5)) - (1 - 0.1075))).toBeLessThan(3e-4);
    // 2 V: recloses as the fall crosses 18 V (t = 0.208 s)
    expect(Math.abs((await dropout(2)) - (0.208 - 0.1075))).toBeLessThan(6e-4);
    // none: open only above 20 V (0.1075 to 0.204 s)
    expect(Math.abs((await dropout(undefined)) - (0.204 - 0.1075))).toBeLessThan(6e-4);
  });

  it("refuses a hysteresis without a cut-off or at its threshold, naming the field", async () => {
    await expect(
      call({ requirement: requirement(), candidates: [{ stage: sw({ overvoltageHysteresisV: 1 }) }] }),
    ).rejects.toThrow(/overvoltageHysteresisV/);
    await expect(
      call({
        requirement: requirement(),
        candidates: [{ stage: sw({ overvoltageCutoffV: 20, overvoltageHysteresisV: 20 }) }],
      }),
    ).rejects.toThrow(/overvoltageHysteresisV/);
  });
});

describe("review: an auto-retrying thermal shutdown", () => {
  const TAU = 0.5;
  const retrying = sw({
    currentLimitA: 3,
    thermalShutdownC: 140,
    afterThermalShutdown: { mode: "auto-retry", hysteresisK: 20 },
  });
  const foster = { kind: "foster", terms: [{ rKPerW: 5, tauS: TAU }] };

  it("cycles between 140 and 120 °C at the hot corner: t_heat = τ·ln((Tss − 120)/(Tss − 140)), t_cool = τ·ln(55/35)", async () => {
    const c = (await call({ requirement: requirement(), candidates: [{ stage: retrying, transientThermal: foster }] }))
      .candidates[0];
    const cyc = c?.thermalShutdownCycle;
    expect(cyc?.cycle.outcome).toBe("cycles");
    const corner = c?.corners[cyc?.corner ?? -1];
    expect(corner?.conditions).toMatchObject({ supplyV: 16, ambientC: 85 });
    const p = (16 - 3 * 4) * 3 + IQ_A * 16; // 12.0032 W
    expect(cyc?.cycle.onLossW).toBeCloseTo(p, 9);
    const tss = 85 + 5 * p; // 145.016 °C
    const heat = TAU * Math.log((tss - 120) / (tss - 140));
    const cool = TAU * Math.log((140 - 85) / (120 - 85));
    expect(cyc?.cycle.heatS).toBeCloseTo(heat, 9);
    expect(cyc?.cycle.coolS).toBeCloseTo(cool, 9);
    expect(cyc?.cycle.periodS).toBeCloseTo(heat + cool, 9);
    expect(cyc?.cycle.dutyOn).toBeCloseTo(heat / (heat + cool), 9);
    expect(cyc?.cycle.averageLossW).toBeCloseTo((p * heat) / (heat + cool), 9);
    // the load is interrupted: the in-service rule still fails
    expect(rule(c, "switch-thermal-shutdown-in-service")).toBe("fail");
    expect(c?.verdict).toBe("fail");
  });

  it("without a Foster network the duty alone, from the corner's own steady rise; a latched part gets no cycle", async () => {
    const c = (await call({ requirement: requirement(), candidates: [{ stage: retrying }] })).candidates[0];
    const cyc = c?.thermalShutdownCycle?.cycle;
    const p = (16 - 12) * 3 + IQ_A * 16;
    const tss = 85 + 5 * p;
    const h = Math.log((tss - 120) / (tss - 140));
    const k = Math.log(55 / 35);
    expect(cyc?.dutyOn).toBeCloseTo(h / (h + k), 6);
    expect(cyc?.periodS).toBeUndefined();
    const latched = sw({ currentLimitA: 3, thermalShutdownC: 140, afterThermalShutdown: { mode: "latched" } });
    const l = (await call({ requirement: requirement(), candidates: [{ stage: latched }] })).candidates[0];
    expect(l?.thermalShutdownCycle).toBeUndefined();
    expect(rule(l, "switch-thermal-shutdown-in-service")).toBe("fail");
  });

  it("refuses a behaviour after shutdown without a shutdown temperature, naming the field", async () => {
    await expect(
      call({ requirement: requirement(), candidates: [{ stage: sw({ afterThermalShutdown: { mode: "latched" } }) }] }),
    ).rejects.toThrow(/afterThermalShutdown/);
  });
});

describe("review: the start-up profile's junction against the thermal shutdown", () => {
  const TAU = 0.5;
  const part = sw({ currentLimitA: 3, thermalShutdownC: 150 });
  const foster = { kind: "foster", terms: [{ rKPerW: 5, tauS: TAU }] };
  // 11 V (2.75 A, fully on), a step to 18 V held for holdS (the switch at its 3 A limit, 18 W), back to 11 V
  const profile = (holdS: number) => [
    { timeS: 0, voltageV: 11 },
    { timeS: 0.001, voltageV: 18 },
    { timeS: 0.001 + holdS, voltageV: 18 },
    { timeS: 0.002 + holdS, voltageV: 11 },
    { timeS: 1 + holdS, voltageV: 11 },
  ];
  const run = async (holdS: number, transientThermal?: unknown) =>
    (
      await call({
        requirement: requirement({ startProfile: profile(holdS) }),
        candidates: [{ stage: part, ...(transientThermal === undefined ? {} : { transientThermal }) }],
      })
    ).candidates[0];

  it("known-bad: 3 s at 18 V heats through τ = 0.5 s toward 175 °C and trips the 150 °C shutdown at τ·ln((Tss − T0)/(Tss − 150))", async () => {
    const c = await run(3, foster);
    const hot = c?.startUp.profiles.find((p) => p.ambientC === 85)?.result;
    const t0 = hot?.samples[0];
    const pOn = (18 - 12) * 3 + IQ_A * 18;
    const tss = 85 + 5 * pOn; // 175.018 °C
    const t = 0.001 + TAU * Math.log((tss - (t0?.tjC ?? 0)) / (tss - 150));
    // flagged at the first sample at or past it: the segment's samples are 75 ms apart (the ramp's
    // millisecond of lower loss delays the real crossing by less than 1 ms)
    expect(hot?.thermalShutdownAtS).toBeGreaterThanOrEqual(t - 1e-3);
    expect(hot?.thermalShutdownAtS).toBeLessThanOrEqual(t + 0.076);
    // the steady corners stay below it (16 V: 145.016 °C), the profile fails the rule
    expect(Math.max(...(c?.corners.map((k) => k.tjC ?? 0) ?? []))).toBeLessThan(150);
    expect(rule(c, "switch-thermal-shutdown-in-service")).toBe("fail");
    expect(hot?.samples.at(-1)?.mode).toBe("thermal-shutdown"); // latched: off to the end
  });

  it("its twin: 0.2 s at 18 V reaches 175 − (175 − T0)·e^(−0.4) ≈ 115 °C, below the shutdown: the rule passes", async () => {
    const c = await run(0.2, foster);
    expect(c?.startUp.profiles.every((p) => p.result.thermalShutdownAtS === undefined)).toBe(true);
    expect(rule(c, "switch-thermal-shutdown-in-service")).toBe("pass");
  });

  it("without a Foster network each instant's steady Tj trips it as soon as the ramp passes 16.33 V (conservative)", async () => {
    const c = await run(0.2);
    const hot = c?.startUp.profiles.find((p) => p.ambientC === 85)?.result;
    // 85 + 5·((V − 12)·3 + Iq·V) = 150 at V ≈ 16.333 V: 0.00076 s into the 11 → 18 V ramp
    const v = (65 / 5 + 36) / (3 + IQ_A);
    expect(hot?.thermalShutdownAtS).toBeGreaterThanOrEqual(((v - 11) / 7) * 0.001);
    expect(hot?.thermalShutdownAtS).toBeLessThanOrEqual(((v - 11) / 7) * 0.001 + 0.001 / 40);
    expect(rule(c, "switch-thermal-shutdown-in-service")).toBe("fail");
  });
});

describe("review: the start-up profile at the worst current limit for each figure", () => {
  it("16 V into 2 Ω: the load at the 2 A minimum (4 V), the junction at the typical 3 A (30 W against 24 W through 2 K/W: 145 °C trips a 140 °C shutdown, 133 °C would not)", async () => {
    const c = (
      await call({
        requirement: requirement({
          load: { kind: "resistive", resistanceOhm: 2 },
          startProfile: [
            { timeS: 0, voltageV: 16 },
            { timeS: 1, voltageV: 16 },
          ],
        }),
        candidates: [
          {
            stage: sw({
              currentLimitA: 3,
              thermalShutdownC: 140,
              thermal: { kind: "junction-ambient", rthJaKPerW: 2 },
            }),
            datasheetMax: { currentLimitMinA: 2 },
            transientThermal: { kind: "foster", terms: [{ rKPerW: 2, tauS: 0.5 }] },
          },
        ],
      })
    ).candidates[0];
    const hot = c?.startUp.profiles.find((p) => p.ambientC === 85)?.result;
    expect(hot?.samples[0]?.lossW).toBeCloseTo((16 - 2 * 2) * 2 + IQ_A * 16, 9); // the samples at the minimum
    // in equilibrium at 16 V from the start: 85 + 2·(30 + Iq·16) °C at the typical limit, tripped at once
    expect(hot?.thermalShutdownAtS).toBe(0);
    const cold = c?.startUp.profiles.find((p) => p.ambientC === -40)?.result;
    expect(cold?.thermalShutdownAtS).toBeUndefined(); // −40 + 60 °C
  });
});
