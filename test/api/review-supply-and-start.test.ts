import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import {
  builtInProfile,
  repeatedProfile,
  START_PROFILE_POINTS,
  START_PROFILES,
} from "../../domain/checks/start-profiles.js";
import { demoContext } from "../helpers/app.js";

type Verdict = { ruleId: string; outcome: string };
type Cand = {
  verdict: string;
  rules: { verdicts: Verdict[] };
  metrics: Record<string, number | boolean>;
  startUp: {
    atProfileMin?: { inputV: number; startMarginV?: number };
    profiles: { result: { bodyDiodeTimeS: number; samples: unknown[] } }[];
  };
  transients: { pulseId: string; sweep?: { worstOf: string[]; sourceResistanceOhm: number; decayS: number } }[];
};
type Out = { candidates: Cand[]; requirement: { sources: string[] } };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};
const verdictOf = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;
const idealDiode = (startV: number) => ({
  kind: "nfet-ideal-diode",
  name: "test ideal diode",
  mosfet: {
    rdsOn: [{ gateSourceV: 10, rdsOnOhm: "3 mOhm" }],
    thresholdV: 2,
    vgsMaxV: 20,
    vdsMaxV: 60,
    tjMaxC: 175,
    bodyDiode: { model: "shockley", saturationCurrentA: "8 nA", ideality: 1.4, seriesResistanceOhm: "10 mOhm" },
  },
  controller: {
    startV,
    gateDrive: [{ inputV: startV, gateSourceV: 10 }],
    regulatedDropV: "20 mV",
    quiescentA: "80 uA",
    maxInputV: 65,
    reverseRatingV: 65,
  },
  thermal: { kind: "junction-ambient", rthJaKPerW: 45 },
});
const req12 = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
};

describe("12 V vehicle supply class through the review", () => {
  it("fails an input clamp standing off below the 24 V jump start and passes one above it (ISO 16750-2 clause 4.3.1.2)", async () => {
    const clamp = (standoffV: number) => ({ standoffV, clampV: standoffV * 1.5, peakCurrentA: 100, energyJ: 100 });
    const low = (
      await call({ requirement: { ...req12, inputClamp: clamp(20) }, candidates: [{ stage: idealDiode(3) }] })
    ).candidates[0];
    expect(verdictOf(low, "clamp-standoff-jump-start")).toBe("fail");
    expect(verdictOf(low, "clamp-standoff-overvoltage")).toBe("fail");
    expect(low?.verdict).toBe("fail");
    expect(low?.metrics["supplyOvervoltageV"]).toBe(24);
    const high = (
      await call({ requirement: { ...req12, inputClamp: clamp(26) }, candidates: [{ stage: idealDiode(3) }] })
    ).candidates[0];
    expect(verdictOf(high, "clamp-standoff-jump-start")).toBe("pass");
    expect(verdictOf(high, "clamp-standoff-overvoltage")).toBe("pass");
  });

  it("reports the Ri and td of load dump A's worst clamp energy", async () => {
    const out = await call({
      requirement: {
        ...req12,
        transients: ["iso16750-2-load-dump-a-12v"],
        inputClamp: { standoffV: 26, clampV: 40, peakCurrentA: 200, energyJ: 500 },
      },
      candidates: [{ stage: idealDiode(3) }],
    });
    const worst = out.candidates[0]?.transients.find((t) => t.sweep?.worstOf.includes("clampEnergyJ"));
    // ISO 16750-2 test A ranges (docs/references.md): the clamp's energy peaks at the lowest Ri and the longest td.
    expect(worst?.sweep?.sourceResistanceOhm).toBe(0.5);
    expect(worst?.sweep?.decayS).toBeCloseTo(0.4, 12);
  });
});

describe("built-in starting profiles", () => {
  it("every built-in profile has the point count the work bound assumes, and level I dips to 8 V (docs/references.md [S])", () => {
    for (const p of START_PROFILES) expect(builtInProfile(p.id)?.points.length).toBe(START_PROFILE_POINTS);
    expect(Math.min(...(builtInProfile("iso16750-2-12v-level-1")?.points ?? []).map((p) => p.voltageV))).toBe(8);
  });

  it("repeats a crank: times shift by the period plus the rest, the shared point written once without a rest", () => {
    const one = builtInProfile("iso16750-2-12v-level-2")?.points ?? [];
    const end = one[one.length - 1]?.timeS ?? 0;
    const three = repeatedProfile(one, 3, 0);
    expect(three.length).toBe(3 * 5 + 1);
    expect(three[three.length - 1]?.timeS).toBeCloseTo(3 * end, 12);
    const rested = repeatedProfile(one, 2, 2);
    expect(rested.length).toBe(12);
    expect(rested[6]?.timeS).toBeCloseTo(end + 2, 12);
  });

  it("reads the start check at the profile's lowest point: a 5 V start fails level II's 4.5 V dip, three cranks triple the body-diode time", async () => {
    const one = await call({
      requirement: { ...req12, startProfile: { builtIn: "iso16750-2-12v-level-2" } },
      candidates: [{ stage: idealDiode(5) }],
    });
    const c = one.candidates[0];
    expect(c?.startUp.atProfileMin?.inputV).toBe(4.5);
    expect(c?.startUp.atProfileMin?.startMarginV).toBeCloseTo(-0.5, 12);
    expect(verdictOf(c, "start-at-profile-minimum")).toBe("fail");
    expect(one.requirement.sources.some((s) => s.startsWith("iso16750-2-12v-level-2"))).toBe(true);
    const three = await call({
      requirement: { ...req12, startProfile: { builtIn: "iso16750-2-12v-level-2", cranks: 3 } },
      candidates: [{ stage: idealDiode(5) }],
    });
    const t1 = c?.startUp.profiles[0]?.result.bodyDiodeTimeS ?? 0;
    const t3 = three.candidates[0]?.startUp.profiles[0]?.result.bodyDiodeTimeS ?? 0;
    expect(t1).toBeGreaterThan(0);
    // Each crank spends the same time below the start voltage (closed form of a piecewise-linear
    // profile); the profile is stepped 40 times a segment, so each crossing is counted to within one
    // step of the 50 ms rise (1.25 ms): two crossings a crank.
    expect(Math.abs(t3 - 3 * t1)).toBeLessThanOrEqual(3 * 2 * (0.05 / 40) + 1e-12);
    const passes = await call({
      requirement: { ...req12, startProfile: { builtIn: "iso16750-2-12v-level-2" } },
      candidates: [{ stage: idealDiode(3.2) }],
    });
    expect(verdictOf(passes.candidates[0], "start-at-profile-minimum")).toBe("pass");
  });

  it("refuses a built-in profile and points together, and bounds the repeated work", async () => {
    await expect(
      call({
        requirement: {
          ...req12,
          startProfile: {
            builtIn: "iso16750-2-12v-level-1",
            points: [
              { timeS: 0, voltageV: 12 },
              { timeS: 1, voltageV: 8 },
            ],
          },
        },
        candidates: [{ stage: idealDiode(3) }],
      }),
    ).rejects.toThrow(/either builtIn/);
    const many = Array.from({ length: 64 }, () => ({ stage: idealDiode(3) }));
    await expect(
      call({
        requirement: { ...req12, startProfile: { builtIn: "iso16750-2-12v-level-1", cranks: 10 } },
        candidates: many,
      }),
    ).rejects.toThrow(/BACKSTOP_MAX_PROFILE_WORK/);
  });
});

describe("the review's start-up in the chatter band at the start threshold", () => {
  it("names the first corner whose two states both contradict themselves, and the rule fails", async () => {
    const { KNOWN_BAD } = await import("../known-bad/designs.js");
    const d = KNOWN_BAD.find((x) => x.id === "ideal-diode-chatters-at-start");
    if (d === undefined) throw new Error("known-bad design missing");
    type Chatter = { inChatterBand: boolean; chatter?: { corner: number; startV: number; runningInputV: number } };
    const bad = (await call(d.bad)).candidates[0] as Cand & { startUp: Chatter; corners: { conditions: object }[] };
    // Closed form of the divider (designs.ts): running 4.05/1.3 = 3.115 V < 3.2 V at the lowest supply.
    expect(bad.startUp.inChatterBand).toBe(true);
    expect(bad.startUp.chatter?.startV).toBe(3.2);
    expect(bad.startUp.chatter?.runningInputV).toBeCloseTo(4.05 / 1.3, 1);
    expect(bad.corners[bad.startUp.chatter?.corner ?? -1]?.conditions).toMatchObject({ supply: "min" });
    expect(bad.metrics["startChatter"]).toBe(true);
    expect(verdictOf(bad, "start-no-chatter")).toBe("fail");
    const twin = (await call(d.twin)).candidates[0] as Cand & { startUp: Chatter };
    expect(twin.startUp.inChatterBand).toBe(false);
    expect(twin.startUp.chatter).toBeUndefined();
    expect(twin.metrics["startChatter"]).toBe(false);
  });
});
