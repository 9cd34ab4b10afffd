import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { clampPulse, tauFromDecay } from "../../domain/checks/clamp-energy.js";
import { clampTrainTj } from "../../domain/checks/clamp-train.js";
import { demoContext } from "../helpers/app.js";

// The input clamp's junction over a test's pulse train through the review (issue 19 item 4):
// ISO 7637-2 pulse 1 (12 V: −150 V, 10 ohm, td 2 ms) repeated every 0.5 s, 500 times (the
// library's default: the 2011 edition's count, docs/references.md), into a 40 V clamp with a long
// thermal tail. The train's heat piles up where one pulse does not; the figure is the closed form of domain/checks/clamp-train.ts
// (itself checked against the geometric series and numerical integration in
// test/domain/checks/clamp-train.test.ts).

type Verdict = { ruleId: string; outcome: string };
type Cand = {
  rules: { verdicts: Verdict[] };
  metrics: Record<string, number | boolean>;
  transients: { pulseId: string; designClamp?: { train?: { outcome: string; trainTjC?: number; count?: number } } }[];
};
type Out = { candidates: Cand[]; requirement: { sources: string[]; assumptions?: string[] } };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};
const verdictOf = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;

const diode = {
  kind: "schottky-diode",
  name: "test schottky",
  diode: { model: "shockley", saturationCurrentA: "20 uA", ideality: 1.05, seriesResistanceOhm: "15 mOhm" },
  reverseRatingV: 200,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
};
const thermal = [
  { rKPerW: 0.05, tauS: 1e-3 },
  { rKPerW: 0.5, tauS: 0.05 },
  { rKPerW: 200, tauS: 60 },
];
const requirement = (transients: unknown[]) => ({
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 1 },
  ambient: { minC: -40, maxC: 85 },
  transients,
  inputClamp: { standoffV: 26, clampV: 40, peakCurrentA: 100, energyJ: 50, tjMaxC: 150, thermal },
});

describe("the input clamp's junction over a test's pulse train (review)", () => {
  it("ISO 7637-2 pulse 1, 500 pulses 0.5 s apart: the train's Tj is the closed form and fails the clamp's Tj(max)", async () => {
    const out = await call({ requirement: requirement(["iso7637-2-pulse-1-12v"]), candidates: [{ stage: diode }] });
    const c = out.candidates[0];
    const duty = clampPulse(
      { baseV: 0, amplitudeV: 150, tauS: tauFromDecay(2e-3, "to-10-percent"), sourceResistanceOhm: 10, riseS: 1e-6 },
      { breakdownV: 40, dynamicOhm: 0 },
    );
    if (duty.conducts !== true) throw new Error("the clamp must conduct");
    const expected = clampTrainTj(duty.energyJ, duty.peakPowerW, thermal, { periodS: 0.5, count: 500 }, 85);
    if (expected.outcome !== "computed") throw new Error("expected a train");
    // By hand: E = Vc·(τ/Ri)·(A − B − B·ln(A/B)) ≈ 0.199 J, Ppk = 40·11 = 440 W, mean 0.40 W over 250 s
    // through 200 K/W at τ 60 s: ≈ 0.40·200·(1 − e^(−250/60)) ≈ 78 K above 85 °C.
    expect(duty.peakPowerW).toBeCloseTo(440, 9);
    expect(expected.trainTjC).toBeGreaterThan(150);
    expect(expected.singlePulseTjC).toBeLessThan(100);
    expect(c?.metrics["clampTrainTjC"]).toBeCloseTo(expected.trainTjC, 9);
    expect(c?.metrics["clampTjMaxC"]).toBe(150);
    expect(verdictOf(c, "clamp-train-tj")).toBe("fail");
    // The single-pulse ratings pass: only the train's heat fails it.
    expect(verdictOf(c, "clamp-energy")).toBe("pass");
    expect(verdictOf(c, "clamp-peak-current")).toBe("pass");
  });

  it("the test's own repetition ({ builtIn, repetition }) replaces the standard's: 10 pulses pass", async () => {
    const out = await call({
      requirement: requirement([{ builtIn: "iso7637-2-pulse-1-12v", repetition: { periodS: 0.5, count: 10 } }]),
      candidates: [{ stage: diode }],
    });
    const c = out.candidates[0];
    expect(c?.transients[0]?.designClamp?.train?.count).toBe(10);
    expect(c?.metrics["clampTrainTjC"] as number).toBeLessThan(150);
    expect(verdictOf(c, "clamp-train-tj")).toBe("pass");
    expect(out.requirement.sources.some((s) => s.includes("repetition: the test's own"))).toBe(true);
  });

  it("a clamp without a thermal network leaves the train out of scope, saying why", async () => {
    const req = requirement(["iso7637-2-pulse-1-12v"]);
    const { thermal: _, ...clamp } = req.inputClamp;
    const out = await call({ requirement: { ...req, inputClamp: clamp }, candidates: [{ stage: diode }] });
    const c = out.candidates[0];
    expect(c?.metrics["clampTrainTjC"]).toBeUndefined();
    expect(verdictOf(c, "clamp-train-tj")).toBe("not-applicable");
  });

  it("load dump A's sweep reports the point of the hottest train", async () => {
    const out = await call({
      requirement: {
        ...requirement(["iso16750-2-load-dump-a-12v"]),
        inputClamp: { standoffV: 26, clampV: 40, peakCurrentA: 500, energyJ: 500, thermal },
      },
      candidates: [{ stage: diode }],
    });
    const rows = out.candidates[0]?.transients ?? [];
    const trains = rows.flatMap((t) => (t.designClamp?.train?.outcome === "computed" ? [t.designClamp.train] : []));
    expect(trains.length).toBeGreaterThan(0);
    expect(trains.every((t) => t.count === 10)).toBe(true);
    const hottest = Math.max(...trains.map((t) => t.trainTjC ?? 0));
    expect(out.candidates[0]?.metrics["clampTrainTjC"]).toBe(hottest);
  });
});
