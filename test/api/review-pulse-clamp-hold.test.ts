import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { reviewOutput } from "../../contracts/review.js";
import { turnOffOutput } from "../../contracts/turn-off.js";
import { demoContext } from "../helpers/app.js";
import { pfetPulse1HeldByClamp } from "../known-bad/designs.js";

// The known-bad design pfet-pulse-1-held-by-clamp (test/known-bad/designs.ts) through the review: the
// input clamp holds pulse 1's input only until the generator alone carries the loop current, then the
// input follows the generator (turn-off-input-clamp.ts, checked against ngspice in
// test/domain/review/pulse-clamp-hold.test.ts). The same input through the turnOff procedure gives the
// same figures (one definition); the earlier input, the clamp's level decaying from t = 0, passes the
// load's 7 V limit: the gap the hold closes.

const ctx = demoContext();
const review = procedureInvoker(ctx)("review");
const turnOff = procedureInvoker(ctx)("turnOff");
const PULSE_1 = "iso7637-2-pulse-1-12v";
type Obj = Record<string, unknown>;

async function reviewOf(input: Obj) {
  if (review === undefined) throw new Error("review missing");
  const r = reviewOutput.parse(await review({ ...input, ruleSet: "default" }));
  const c = r.candidates[0];
  if (c === undefined) throw new Error("no candidate");
  return { r, c, p: c.pulseBackConduction?.find((x) => x.pulseId === PULSE_1) };
}

describe("pulse 1 held by the input clamp, at a P-FET with a slow gate", () => {
  const design = pfetPulse1HeldByClamp("100 kOhm") as { requirement: Obj; candidates: { stage: Obj }[] };
  const stage = design.candidates[0]?.stage;
  const req = design.requirement;
  const turnOffReq = req["turnOff"] as Obj;

  async function direct(inputDecay: Obj, tjC: number) {
    if (turnOff === undefined) throw new Error("turnOff missing");
    return turnOffOutput.parse(
      await turnOff({
        stage,
        outputV: 13.5,
        inputAfterV: 0,
        inputDecay,
        gateLag: turnOffReq["gateLag"],
        loop: { resistanceOhm: 10, inductanceH: "1 uH" },
        capacitor: turnOffReq["capacitor"],
        load: req["load"],
        loadMinV: 0,
        tjC,
      }),
    );
  }

  it("fails load-reverse-voltage now, and its figures are the turnOff procedure's on the same held input", async () => {
    const { r, c, p } = await reviewOf(design);
    if (p?.outcome !== "assessed") throw new Error(JSON.stringify(p));
    expect(r.requirement.supplyNominalV).toBe(13.5);
    expect(p.clampHold?.levelV).toBe(-28.9);
    expect(p.outputMinV).toBeLessThan(-7);
    expect(c.rules.verdicts.find((v) => v.ruleId === "load-reverse-voltage")?.outcome).toBe("fail");
    const held = await direct(
      { startV: -150, timeConstantS: p.tauS, clamp: { levelV: -28.9, dynamicResistanceOhm: 11.1 / 60 } },
      c.turnOff?.tjC ?? 0,
    );
    if (held.outcome !== "does-not-block" || held.gateTurnOff === undefined) throw new Error(held.outcome);
    expect(Math.abs(held.outputMinV - p.outputMinV)).toBeLessThan(1e-9);
    expect(Math.abs(held.gateTurnOff.peakReverseCurrentA / p.peakReverseCurrentA - 1)).toBeLessThan(1e-12);
  });

  it("the earlier input (the clamp's level decaying from t = 0) keeps the output within the load's 7 V: it passed", async () => {
    const { c, p } = await reviewOf(design);
    if (p?.outcome !== "assessed") throw new Error(JSON.stringify(p));
    const t = (c.transients as { pulseId: string; inputPeakV: number }[]).find((x) => x.pulseId === PULSE_1);
    const before = await direct({ startV: t?.inputPeakV, timeConstantS: p.tauS }, c.turnOff?.tjC ?? 0);
    if (before.outcome !== "does-not-block") throw new Error(before.outcome);
    expect(-before.outputMinV).toBeLessThan(7);
    expect(-p.outputMinV).toBeGreaterThan(2 * -before.outputMinV);
  });

  it("without requirement.turnOff each negative pulse is not assessed, with what to add, and the set cannot pass", async () => {
    const { turnOff: _none, ...rest } = req;
    const { c, p } = await reviewOf({ ...design, requirement: rest });
    expect(p?.outcome).toBe("not-assessed");
    if (p?.outcome === "not-assessed") expect(p.reason).toContain("add requirement.turnOff");
    const v = c.rules.verdicts.find((x) => x.ruleId === "load-reverse-voltage");
    expect(v?.outcome).toBe("not-applicable");
    expect(v?.reason).toContain("requirement.turnOff");
    expect(c.verdict).not.toBe("pass");
  });

  it("the turnOff waveform on the held input follows the same pieces: its reverse peak and end state are the event's", async () => {
    if (turnOff === undefined) throw new Error("turnOff missing");
    const r = turnOffOutput.parse(
      await turnOff({
        stage,
        outputV: 13.5,
        inputAfterV: 0,
        inputDecay: {
          startV: -150,
          timeConstantS: 2e-3 / Math.log(10),
          clamp: { levelV: -28.9, dynamicResistanceOhm: 0.185 },
        },
        gateLag: turnOffReq["gateLag"],
        loop: { resistanceOhm: 10, inductanceH: "1 uH" },
        capacitor: turnOffReq["capacitor"],
        load: req["load"],
        loadMinV: 0,
        tjC: 25,
        waveform: true,
      }),
    );
    if (r.outcome !== "does-not-block" || r.waveform === undefined) throw new Error(r.outcome);
    const w = r.waveform;
    const peakA = Math.max(...w.currentA.map((i) => -i));
    expect(Math.abs(peakA / r.peakReverseCurrentA - 1)).toBeLessThan(1e-9);
    // The waveform runs to the event's window end (the output crossing the load's minimum, 0 V here),
    // through the clamp's release: its last sample is the event's end state.
    expect(r.end.timeS).toBeGreaterThan(r.inputClampHold?.releaseS ?? Number.POSITIVE_INFINITY);
    const last = w.timeS.findIndex((t) => t === r.end.timeS);
    expect(last).toBeGreaterThan(0);
    expect(Math.abs((w.outputV[last] ?? Number.NaN) - r.end.outputV)).toBeLessThan(1e-9);
    expect(Math.abs((w.currentA[last] ?? Number.NaN) / r.end.currentA - 1)).toBeLessThan(1e-9);
  });

  it("refuses a clamp level at or above the output, naming the field", async () => {
    await expect(direct({ startV: -150, timeConstantS: 1e-3, clamp: { levelV: 20 } }, 25)).rejects.toThrow(
      /levelV[\s\S]*below the output voltage before the event/,
    );
    if (review === undefined) throw new Error("review missing");
    const bad = {
      ...design,
      requirement: {
        ...req,
        turnOff: { ...turnOffReq, inputDecay: { startV: -5, timeConstantS: 1e-3, clamp: { levelV: 20 } } },
      },
    };
    await expect(review(bad)).rejects.toThrow(/clamp holds a falling input/);
  });
});
