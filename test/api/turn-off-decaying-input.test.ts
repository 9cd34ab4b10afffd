import { TYPICAL } from "../helpers/stages.js";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { holdUpOutput } from "../../contracts/hold-up.js";
import { reviewOutput } from "../../contracts/review.js";
import { turnOffOutput } from "../../contracts/turn-off.js";
import { demoContext } from "../helpers/app.js";
import { relativeError } from "../helpers/tolerance.js";

// An input decaying after the event (issue 19 item 11) through the procedures. The model's own
// checks (τ → 0 / ∞ limits, ngspice with an EXP source) are in
// test/domain/checks/turn-off-decaying-input.test.ts; here: the same limits through turnOff and
// holdUp, and the review's event equal to the turnOff procedure's.

const ctx = demoContext();
const invoke = procedureInvoker(ctx);
const [turnOff, holdUp, review] = [invoke("turnOff"), invoke("holdUp"), invoke("review")];
const read = (p: string) =>
  JSON.parse(readFileSync(join(projectRoot(), "examples/requests", `${p}.json`), "utf8")).input as Record<
    string,
    // biome-ignore lint/suspicious/noExplicitAny: example JSON
    any
  >;
const pfet = { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" };
const gateLag = { resistanceOhm: "10 kOhm", gateChargeC: "30 nC", atGateSourceV: "10 V" };

describe("an input decaying after the event, through the procedures", () => {
  it("turnOff, P-FET: τ → 0 gives the −14 V step's figures, τ → ∞ the 0 V step's; 20 us lies between", async () => {
    if (turnOff === undefined) throw new Error("turnOff missing");
    const base = { ...read("turnOff"), stage: pfet, inputAfterV: "-14 V", gateLag, ruleSet: undefined };
    const run = async (extra: object) => {
      const r = turnOffOutput.parse(await turnOff({ ...base, ...extra }));
      if (r.outcome !== "does-not-block" || r.gateTurnOff === undefined) throw new Error(r.outcome);
      return r.gateTurnOff;
    };
    const step = await run({});
    const fast = await run({ inputDecay: { startV: "0 V", timeConstantS: "1 ps" } });
    const atStart = await run({ inputAfterV: "0 V" });
    const slow = await run({ inputDecay: { startV: "0 V", timeConstantS: "1000 s" } });
    const mid = await run({ inputDecay: { startV: "0 V", timeConstantS: "20 us" } });
    for (const [a, b] of [
      [fast, step],
      [slow, atStart],
    ] as const) {
      expect(relativeError(a.peakReverseCurrentA, b.peakReverseCurrentA)).toBeLessThan(1e-4);
      expect(relativeError(a.chargeLostC, b.chargeLostC)).toBeLessThan(1e-4);
      expect(relativeError(a.channelOffS, b.channelOffS)).toBeLessThan(1e-4);
      expect(Math.abs(a.outputMinV - b.outputMinV)).toBeLessThan(1e-3);
    }
    expect(mid.peakReverseCurrentA).toBeLessThan(step.peakReverseCurrentA);
    expect(mid.outputMinV).toBeLessThan(atStart.outputMinV);
  });

  it("holdUp: the shipped example's 20 us edge against its step (τ → 0) and each stage's answer", async () => {
    if (holdUp === undefined) throw new Error("holdUp missing");
    const ex = read("holdUp");
    const run = async (input: object) => holdUpOutput.parse(await holdUp({ ...ex, ruleSet: undefined, input }));
    const { inputDecay: _d, ...stepInput } = ex["input"];
    const step = await run(stepInput);
    const fast = await run({ ...stepInput, inputDecay: { startV: "0 V", timeConstantS: "1 ps" } });
    expect(fast.stages.map((s) => s.result.outcome)).toEqual(step.stages.map((s) => s.result.outcome));
    fast.stages.forEach((s, k) => {
      const t = step.stages[k]?.result;
      if ("holdUpS" in s.result && t !== undefined && "holdUpS" in t)
        expect(relativeError(s.result.holdUpS, t.holdUpS)).toBeLessThan(1e-4);
    });
    const edge = await run(ex["input"]);
    expect(edge.stages.length).toBe(step.stages.length);
  });

  it("review: a P-FET candidate's event under a decaying input is the turnOff procedure's", async () => {
    if (review === undefined || turnOff === undefined) throw new Error("procedures missing");
    const ex = read("review");
    const inputDecay = { startV: "0 V", timeConstantS: "20 us" };
    const requirement = {
      ...ex["requirement"],
      turnOff: { ...ex["requirement"].turnOff, inputAfterV: "-14 V", inputDecay, gateLag },
    };
    const r = reviewOutput.parse(await review({ requirement, candidates: [{ stage: pfet, datasheetMax: TYPICAL }] }));
    const c = r.candidates[0];
    const e = c?.turnOff?.event;
    if (c === undefined || e === undefined || e.outcome !== "does-not-block") throw new Error("no drain-back event");
    const direct = turnOffOutput.parse(
      await turnOff({
        stage: pfet,
        outputV: r.requirement.supplyNominalV,
        inputAfterV: -14,
        inputDecay,
        gateLag,
        loop: ex["requirement"].turnOff.loop,
        capacitor: ex["requirement"].turnOff.capacitor,
        load: ex["requirement"].load,
        loadMinV: ex["requirement"].loadMinV,
        tjC: c.turnOff?.tjC ?? 0,
      }),
    );
    if (direct.outcome !== "does-not-block") throw new Error(direct.outcome);
    expect(e.gateTurnOff?.outputMinV).toBe(direct.gateTurnOff?.outputMinV);
    expect(e.peakReverseCurrentA).toBe(direct.peakReverseCurrentA);
  });

  it("review: a decay starting at or above the output is refused, naming requirement.turnOff.inputDecay.startV", async () => {
    if (review === undefined) throw new Error("review missing");
    const ex = read("review");
    const requirement = {
      ...ex["requirement"],
      turnOff: { ...ex["requirement"].turnOff, inputDecay: { startV: "40 V", timeConstantS: "20 us" } },
    };
    await expect(review({ requirement, candidates: [{ stage: pfet, datasheetMax: TYPICAL }] })).rejects.toThrow(
      /startV|output voltage/,
    );
  });

  it("holdUp: an inputAfterV at or above outputV is refused as turnOff refuses it, naming input.inputAfterV", async () => {
    if (holdUp === undefined || turnOff === undefined) throw new Error("procedures missing");
    const ex = read("holdUp");
    const { inputDecay: _d, ...stepInput } = ex["input"];
    const outputV = ex["outputV"];
    const refusal = async (p: Promise<unknown>) => {
      const e = await p.then(
        () => undefined,
        (err: unknown) => err,
      );
      if (e === undefined) throw new Error("accepted");
      return String((e as { message?: unknown }).message);
    };
    const held = await refusal(holdUp({ ...ex, ruleSet: undefined, input: { ...stepInput, inputAfterV: outputV } }));
    expect(held).toMatch(/input\.inputAfterV|"input",\s*"inputAfterV"/);
    expect(held).toMatch(/must be below the output voltage before the event, outputV/);
    const t = read("turnOff");
    const direct = await refusal(turnOff({ ...t, inputAfterV: t["outputV"] }));
    expect(direct).toMatch(/must be below the output voltage before the event, outputV/);
  });
});
