import { TYPICAL } from "../helpers/stages.js";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { reviewOutput } from "../../contracts/review.js";
import { turnOffOutput } from "../../contracts/turn-off.js";
import { demoContext } from "../helpers/app.js";

const ctx = demoContext();
const review = procedureInvoker(ctx)("review");
const turnOff = procedureInvoker(ctx)("turnOff");
const example = JSON.parse(readFileSync(join(projectRoot(), "examples/requests/review.json"), "utf8")).input;

describe("review with a turn-off section", () => {
  it("runs the turnOff analysis per candidate: same event as the procedure, metrics computed, avalanche rules decide", async () => {
    if (review === undefined || turnOff === undefined) throw new Error("procedures missing");
    const r = reviewOutput.parse(await review(example));
    const ideal = r.candidates.find((c) => c.stage.partId === "demo-ideal-diode-60v-3mohm");
    const t = ideal?.turnOff;
    if (ideal === undefined || t === undefined) throw new Error("no turn-off result");
    // Source: the same model through the turnOff procedure (its own example's loop, this Tj, and
    // the candidate's datasheet-maximum timing, which the review's event runs at).
    const candidate = (
      example.candidates as {
        stage: { partId?: string };
        datasheetMax?: { reverseThresholdV?: string; turnOffDelayS?: string };
      }[]
    ).find((c) => c.stage.partId === "demo-ideal-diode-60v-3mohm");
    const timing = candidate?.datasheetMax;
    const direct = turnOffOutput.parse(
      await turnOff({
        stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
        outputV: r.requirement.supplyNominalV,
        inputAfterV: 0,
        loop: example.requirement.turnOff.loop,
        capacitor: example.requirement.turnOff.capacitor,
        load: example.requirement.load,
        loadMinV: example.requirement.loadMinV,
        tjC: t.tjC,
        ...(timing?.reverseThresholdV === undefined || timing.turnOffDelayS === undefined
          ? {}
          : { turnOff: { reverseThresholdV: timing.reverseThresholdV, turnOffDelayS: timing.turnOffDelayS } }),
      }),
    );
    if (direct.outcome !== "blocks" || t.event.outcome !== "blocks") throw new Error(direct.outcome);
    expect(t.event.peakReverseCurrentA).toBe(direct.peakReverseCurrentA);
    expect(t.event.clamp?.absorbedJ).toBe(direct.clamp?.absorbedJ);
    expect(t.tjSource).toBe("worst-corner");
    expect(t.tjC).toBe(ideal.worst.tjC?.value);
    expect(t.event.waveform).toBeUndefined(); // only with curves
    expect(ideal.metrics["absorbedEnergyJ"]).toBe(direct.clamp?.absorbedJ);
    expect(ideal.metrics["eventTjC"]).toBe(t.tjC);
    const aval = ideal.rules.verdicts.find((v) => v.ruleId === "avalanche-energy");
    expect(aval?.outcome).toBe("pass");
    expect(aval?.values["absorbedEnergyJ"]).toBe(direct.clamp?.absorbedJ);
    // The integrated switch's own rating decides for it.
    const integrated = r.candidates.find((c) => c.stage.partId === "demo-integrated-ideal-diode-5a-36v");
    expect(integrated?.rules.verdicts.find((v) => v.ruleId === "avalanche-energy")?.outcome).toBe("pass");
    // A part without an avalanche rating that absorbs energy is a gap, not out of scope.
    const part = ctx.catalog.find("demo-integrated-ideal-diode-5a-36v");
    if (part === undefined) throw new Error("demo part missing");
    const { avalancheEnergyJ: _rating, ...unrated } = part.stage as typeof part.stage & { avalancheEnergyJ?: number };
    const gap = reviewOutput.parse(
      await review({
        ...example,
        candidates: [{ stage: unrated, turnOffTiming: example.candidates[3].turnOffTiming }],
        monteCarlo: undefined,
      }),
    );
    expect(gap.candidates[0]?.rules.verdicts.find((v) => v.ruleId === "avalanche-energy")?.notApplicableCode).toBe(
      "missing-value",
    );
  });

  it("with a rating too small, the avalanche rule fails the candidate; without the section the rules are out of scope", async () => {
    if (review === undefined) throw new Error("review missing");
    const stage = { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" };
    const base = { ...example, candidates: [{ stage, datasheetMax: TYPICAL }], monteCarlo: undefined };
    const plain = reviewOutput.parse(
      await review({ ...base, requirement: { ...example.requirement, turnOff: undefined } }),
    );
    expect(plain.candidates[0]?.turnOff).toBeUndefined();
    expect(plain.candidates[0]?.rules.verdicts.find((v) => v.ruleId === "avalanche-energy")?.notApplicableCode).toBe(
      "not-required",
    );
    // A 200 µH loop (a long harness), 4.7 mF at the output and a slow turn-off (1 ms): the reverse
    // current reaches tens of amperes and ½·L·I² exceeds the derated 150 mJ rating.
    const hard = {
      ...example.requirement,
      turnOff: {
        loop: { resistanceOhm: "20 mOhm", inductanceH: "200 uH" },
        capacitor: { capacitanceF: "4.7 mF", esrOhm: "20 mOhm" },
      },
    };
    const r = reviewOutput.parse(
      await review({
        ...base,
        requirement: hard,
        candidates: [{ stage, turnOffTiming: { reverseThresholdV: "30 mV", turnOffDelayS: "1 ms" } }],
        curves: true,
      }),
    );
    const c = r.candidates[0];
    const e = c?.turnOff?.event;
    if (c === undefined || e === undefined || e.outcome !== "blocks") throw new Error("no event");
    const aval = c.rules.verdicts.find((v) => v.ruleId === "avalanche-energy");
    // Source: the rule's own expression on the numbers it read (150 mJ derated to Tj).
    const limit = (0.15 * (175 - (c.turnOff?.tjC ?? 0))) / (175 - 25);
    expect(e.clamp?.absorbedJ ?? 0).toBeGreaterThan(limit);
    expect(aval?.outcome).toBe("fail");
    expect(c.verdict).toBe("fail");
    expect(e.waveform?.timeS.length).toBeGreaterThanOrEqual(399);
    expect(Math.max(...(e.waveform?.currentA ?? []).map((i) => -i))).toBe(e.peakReverseCurrentA);
  });

  it("a negative input with a gate-resistor lag: the P-FET candidate's output goes below 0 V, as the turnOff procedure finds, and fails the load's reverse limit", async () => {
    if (review === undefined || turnOff === undefined) throw new Error("procedures missing");
    const gateLag = { resistanceOhm: "10 kOhm", gateChargeC: "30 nC", atGateSourceV: "10 V" };
    const requirement = {
      ...example.requirement,
      turnOff: { ...example.requirement.turnOff, inputAfterV: "-14 V", gateLag, loadReverseLimitV: "0.5 V" },
    };
    const pfet = { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" };
    const r = reviewOutput.parse(await review({ requirement, candidates: [{ stage: pfet, datasheetMax: TYPICAL }] }));
    const c = r.candidates[0];
    const e = c?.turnOff?.event;
    if (c === undefined || e === undefined || e.outcome !== "does-not-block") throw new Error("no drain-back event");
    const direct = turnOffOutput.parse(
      await turnOff({
        stage: pfet,
        outputV: r.requirement.supplyNominalV,
        inputAfterV: -14,
        gateLag,
        loop: example.requirement.turnOff.loop,
        capacitor: example.requirement.turnOff.capacitor,
        load: example.requirement.load,
        loadMinV: example.requirement.loadMinV,
        tjC: c.turnOff?.tjC ?? 0,
      }),
    );
    if (direct.outcome !== "does-not-block") throw new Error(direct.outcome);
    expect(e.gateTurnOff?.outputMinV).toBe(direct.gateTurnOff?.outputMinV);
    expect(e.outputMinV).toBeLessThan(-0.5);
    expect(c.metrics["loadReverseVMaxV"]).toBe(-e.outputMinV);
    expect(c.rules.verdicts.find((v) => v.ruleId === "load-reverse-voltage")?.outcome).toBe("fail");
  });

  it("a repeated event: the blocking element's junction over the train is the closed form of clamp-train.ts on the event's clamp phase", async () => {
    if (review === undefined) throw new Error("review missing");
    const candidate = (example.candidates as { stage: { partId?: string } }[]).find(
      (c) => c.stage.partId === "demo-ideal-diode-60v-3mohm",
    );
    const run = async (repetition: { periodS: number; count: number }) => {
      const r = reviewOutput.parse(
        await review({
          ...example,
          monteCarlo: undefined,
          requirement: { ...example.requirement, turnOff: { ...example.requirement.turnOff, repetition } },
          candidates: [candidate],
        }),
      );
      const c = r.candidates[0];
      const e = c?.turnOff?.event;
      const train = c?.turnOff?.train;
      if (c === undefined || e?.outcome !== "blocks" || e.clamp === undefined || train?.outcome !== "computed")
        throw new Error("no train");
      return { c, clamp: e.clamp, train, tjC: c.turnOff?.tjC ?? 0 };
    };
    const once = await run({ periodS: 1, count: 1 });
    // The candidate's junction-case network cascaded with the rest of its 45 K/W path (1 node of 2 J/K).
    const terms = [
      { rKPerW: 2, tauS: 0.01 },
      { rKPerW: 13, tauS: 1 },
      { rKPerW: 30, tauS: 60 },
    ];
    const p = once.clamp.clampV * once.clamp.currentAtTurnOffA;
    const w = once.clamp.absorbedJ / p;
    const zth = terms.reduce((a, t) => a + t.rKPerW * (1 - Math.exp(-w / t.tauS)), 0);
    expect(once.train.trainTjC - once.tjC).toBeCloseTo(p * zth, 9);
    // 5,000,000 events 0.2 ms apart (1000 s, past every τ): the periodic state; its peak lies above the mean E/T·ΣR.
    const many = await run({ periodS: 2e-4, count: 5_000_000 });
    const mean = (many.clamp.absorbedJ / 2e-4) * 45;
    expect(many.train.steadyPeriodicTjC - many.tjC).toBeGreaterThan(mean);
    expect(many.train.trainTjC).toBeCloseTo(many.train.steadyPeriodicTjC, 3);
    expect(many.c.metrics["eventTrainTjC"]).toBe(many.train.trainTjC);
    // Each event alone passes the junction limit; five thousand a second do not.
    expect(once.c.rules.verdicts.find((v) => v.ruleId === "turn-off-train-tj")?.outcome).toBe("pass");
    expect(many.train.trainTjC).toBeGreaterThan(175);
    expect(many.c.rules.verdicts.find((v) => v.ruleId === "turn-off-train-tj")?.outcome).toBe("fail");
  });
});
