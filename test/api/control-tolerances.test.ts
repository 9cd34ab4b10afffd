import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { toStageModel } from "../../api/map/stage-model.js";
import { stageSpec } from "../../contracts/stage.js";
import { monteCarlo } from "../../domain/checks/monte-carlo.js";
import { demoContext } from "../helpers/app.js";
import { idealDiode as knownBadIdealDiode } from "../known-bad/designs.js";

// Sources: the start check is the comparison of the stage input with the controller's start
// voltage (common practice: below start the body diode carries the load); the reverse current at
// turn-off grows as ΔV·td/L before the gate is off (docs/references.md, Turn-off and inductive
// energy); a uniform draw's share beyond a level is its closed-form probability.
// The known-bad designs' ideal diode: controller start 3.2 V, Vth 2 V, threshold 30 mV, delay 2 µs.
const idealDiode = () => knownBadIdealDiode();
const requirement = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
  turnOff: {
    loop: { resistanceOhm: "20 mOhm", inductanceH: "1 uH" },
    capacitor: { capacitanceF: "470 uF", esrOhm: "20 mOhm" },
  },
};
type Verdict = { ruleId: string; outcome: string };
type Candidate = { rules: { verdicts: Verdict[] }; turnOff?: { event: Record<string, unknown> } };
const review = procedureInvoker(demoContext())("review");
async function run(datasheetMax?: Record<string, unknown>, extra: Record<string, unknown> = {}) {
  if (review === undefined) throw new Error("no review");
  const out = (await review({
    requirement,
    candidates: [
      {
        stage: idealDiode(),
        ...(datasheetMax ? { datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, ...datasheetMax } } : {}),
      },
    ],
    ...extra,
  })) as {
    candidates: Candidate[];
    assumptions: string[];
    monteCarlo?: { dropV?: { p5: number; p95: number }; shareFailingByRule: Record<string, number> };
  };
  return out;
}
const outcome = (c: Candidate | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;

describe("control-parameter tolerances in the review", () => {
  it("the datasheet-maximum start voltage above the 8 V minimum supply fails the start check; the typical 3.2 V passes", async () => {
    expect(outcome((await run()).candidates[0], "start-at-min-supply")).toBe("pass");
    expect(outcome((await run({ startV: 7 })).candidates[0], "start-at-min-supply")).toBe("pass");
    expect(outcome((await run({ startV: 9 })).candidates[0], "start-at-min-supply")).toBe("fail");
  });

  it("the turn-off event runs at the datasheet-maximum delay: the peak reverse current grows by about ΔV·Δtd/L", async () => {
    const typical = (await run()).candidates[0]?.turnOff?.event;
    const slow = await run({ turnOffDelayS: "4 us" });
    const worst = slow.candidates[0]?.turnOff?.event;
    const peak = (r: Record<string, unknown> | undefined) => Number(r?.["peakReverseCurrentA"]);
    expect(
      slow.assumptions.some((a) => /datasheet maximum timing \(reverse threshold 0\.03 V, delay 0\.000004 s\)/.test(a)),
    ).toBe(true);
    // Input shorted, about 13 V on the 1 µH loop: di/dt = ΔV/L ≈ 13 A/µs, so 2 µs more delay adds
    // about 27 A (the loop's resistance and the capacitor's fall take a little off).
    const slope = Math.abs(Number(typical?.["initialSlopeAPerS"]));
    expect(slope).toBeGreaterThan(12e6);
    expect(slope).toBeLessThan(15e6);
    const added = peak(worst) - peak(typical);
    expect(added).toBeGreaterThan(0.75 * slope * 2e-6);
    expect(added).toBeLessThan(1.05 * slope * 2e-6);
  });

  it("refuses a start voltage on a stage without one, naming the field", async () => {
    if (review === undefined) throw new Error("no review");
    const schottky = {
      kind: "schottky-diode",
      diode: { model: "shockley", saturationCurrentA: "40 uA", ideality: 1.15, seriesResistanceOhm: "18 mOhm" },
      reverseRatingV: 60,
      tjMaxC: 175,
      thermal: { kind: "junction-ambient", rthJaKPerW: 35 },
    };
    await expect(
      review({
        requirement: { ...requirement, turnOff: undefined },
        candidates: [{ stage: schottky, datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, startV: 5 } }],
      }),
    ).rejects.toThrow(/candidates\.0\.datasheetMax\.startV|no start voltage/);
  });

  it("refuses a datasheet maximum below the typical value", async () => {
    await expect(run({ thresholdV: 1.5 })).rejects.toThrow(/below the stage's typical MOSFET gate threshold 2 V/);
  });

  it("Monte Carlo takes a start-voltage tolerance (V): near the start voltage, some samples run on the body diode", async () => {
    const out = await run(undefined, {
      monteCarlo: {
        samples: 400,
        seed: 7,
        supplyV: "9 V",
        tolerances: [{ parameter: "startV", distribution: "uniform", halfWidth: 7 }],
      },
    });
    const d = out.monteCarlo?.dropV;
    expect(d?.p5).toBeLessThan(0.1);
    expect(d?.p95).toBeGreaterThan(0.3);
  });
});

describe("the Monte Carlo's sampled start voltage reaches the start rule", () => {
  it("a sample above the 8 V minimum supply fails start-at-min-supply: the share is P(s0 + U(−h, h) > 8 V)", async () => {
    const samples = 1000;
    const h = 7;
    const out = await run(undefined, {
      monteCarlo: {
        samples,
        seed: 3,
        tolerances: [{ parameter: "startV", distribution: "uniform", halfWidth: h }],
      },
    });
    // Uniform closed form: (3.2 + 7 − 8)/(2·7) = 0.157; within 3 binomial standard deviations.
    const expected = (3.2 + h - 8) / (2 * h);
    const share = out.monteCarlo?.shareFailingByRule["start-at-min-supply"] ?? 0;
    const sd = Math.sqrt((expected * (1 - expected)) / samples);
    expect(Math.abs(share - expected)).toBeLessThan(3 * sd);
    // Without the tolerance no sample fails it (the typical 3.2 V starts at 8 V).
    const none = await run(undefined, {
      monteCarlo: { samples: 50, seed: 3, tolerances: [{ parameter: "rdsOn", distribution: "normal", sigma: 0.1 }] },
    });
    expect(none.monteCarlo?.shareFailingByRule["start-at-min-supply"]).toBeUndefined();
  });
});

describe("Monte Carlo start-voltage draws against the uniform distribution's closed form", () => {
  it("the share of samples below start is (s0 + h − Vin)/(2h) within 3 binomial standard deviations", () => {
    const stage = toStageModel(
      stageSpec.parse(idealDiode()),
      { kind: "junction-ambient", rthJaKPerW: 45 },
      ["stage"],
      [],
    );
    const samples = 2000;
    const h = 4;
    let body = 0;
    let inputV = 0;
    monteCarlo(
      {
        stage,
        supplyV: 5,
        ambientC: 25,
        sourceResistanceOhm: 0.03,
        load: { kind: "constant-current", currentA: 1 },
        tolerances: [{ parameter: "startV", distribution: "uniform", halfWidth: h }],
        samples,
        seed: 11,
      },
      (s) => {
        if (!("point" in s.result)) return;
        inputV = s.result.point.stageInputV;
        if (s.result.point.forward.mode === "body-diode") body += 1;
      },
    );
    // The stage input sits near 5 V less the source drop; its value with the channel on is used.
    const expected = (3.2 + h - inputV) / (2 * h);
    const sd = Math.sqrt((expected * (1 - expected)) / samples);
    expect(Math.abs(body / samples - expected)).toBeLessThan(3 * sd + 0.01);
  });
});

describe("a PN diode without its reverse-recovery charge", () => {
  const turnOff = procedureInvoker(demoContext())("turnOff");
  const call = async (partId: string) => {
    if (turnOff === undefined) throw new Error("no turnOff");
    const out = (await turnOff({
      stage: { kind: "catalog-part", partId },
      outputV: "12 V",
      inputAfterV: "0 V",
      loop: { resistanceOhm: "20 mOhm", inductanceH: "1 uH" },
      capacitor: { capacitanceF: "470 uF", esrOhm: "20 mOhm" },
      load: { kind: "constant-current", currentA: 3 },
      loadMinV: "9 V",
      tjC: "85 degC",
    })) as { assumptions: string[] };
    return out.assumptions.filter((a) => a.includes("reverseRecoveryChargeC"));
  };
  it("gets a warning naming the field, not a silent 0; a Schottky gets the plain default", async () => {
    const pn = await call("demo-pn-rectifier-3a-100v");
    expect(pn.some((a) => a.startsWith("warning: reverseRecoveryChargeC: not given") && /PN diode/.test(a))).toBe(true);
    const schottky = await call("demo-schottky-10a-60v");
    expect(schottky.some((a) => a.startsWith("warning:"))).toBe(false);
    expect(schottky.some((a) => /Schottky/.test(a))).toBe(true);
  });
});

describe("the Monte Carlo's sampled gate threshold reaches the cold overdrive rule", () => {
  it("a sample fails gate-overdrive-cold when Vth25 + draw + k·(Tmin − 25 °C) ≥ the drive: P(U(−h, h) ≥ d*)", async () => {
    const { KNOWN_BAD } = await import("../known-bad/designs.js");
    const d = KNOWN_BAD.find((x) => x.id === "pfet-below-threshold-when-cold");
    if (d === undefined || review === undefined) throw new Error("design or review missing");
    const samples = 1000;
    const h = 1;
    // No datasheet Vth range here (the twin's Vth(max) taken out): the tolerance's draw is the spread.
    const twin = d.twin as { candidates: { datasheetMax: Record<string, unknown> }[] };
    const candidates = twin.candidates.map((c) => {
      const { thresholdV: _max, ...datasheetMax } = c.datasheetMax;
      return { ...c, datasheetMax };
    });
    const out = (await review({
      ...d.twin,
      candidates,
      monteCarlo: {
        samples,
        seed: 5,
        tolerances: [{ parameter: "thresholdV", distribution: "uniform", halfWidth: h }],
      },
    })) as {
      candidates: { metrics: Record<string, number> }[];
      monteCarlo: { shareFailingByRule: Record<string, number> };
    };
    // Typical Vth 1.5 V, −6 mV/K, −40 °C: 1.89 V cold; a draw above drive − 1.89 V fails (uniform closed form).
    const drive = out.candidates[0]?.metrics["gateDriveMinV"] ?? 0;
    const expected = (h - (drive - (1.5 + 0.006 * 65))) / (2 * h);
    const share = out.monteCarlo.shareFailingByRule["gate-overdrive-cold"] ?? 0;
    expect(expected).toBeGreaterThan(0.05);
    expect(Math.abs(share - expected)).toBeLessThan(3 * Math.sqrt((expected * (1 - expected)) / samples));
  });
});

describe("the Monte Carlo's Vth spans the datasheet's minimum to maximum where given", () => {
  it("the share failing gate-overdrive-cold is P(U(min, max) + k·(Tmin − 25 °C) ≥ the drive), a thresholdV tolerance replaced", async () => {
    const { KNOWN_BAD } = await import("../known-bad/designs.js");
    const d = KNOWN_BAD.find((x) => x.id === "pfet-below-threshold-when-cold");
    if (d === undefined || review === undefined) throw new Error("design or review missing");
    const samples = 2000;
    const [vMin, vMax] = [1.0, 2.8];
    const twin = d.twin as { candidates: { datasheetMax: Record<string, unknown> }[] };
    const candidates = twin.candidates.map((c) => ({
      ...c,
      datasheetMax: { ...c.datasheetMax, thresholdMinV: vMin, thresholdV: vMax },
    }));
    const out = (await review({
      ...d.twin,
      candidates,
      monteCarlo: {
        samples,
        seed: 11,
        tolerances: [{ parameter: "thresholdV", distribution: "uniform", halfWidth: 0.01 }],
      },
    })) as {
      candidates: { metrics: Record<string, number> }[];
      monteCarlo: { shareFailingByRule: Record<string, number> };
      assumptions: string[];
    };
    // k = −6 mV/K at −40 °C: +0.39 V. The uniform closed form of the share above the drive.
    const drive = out.candidates[0]?.metrics["gateDriveMinV"] ?? 0;
    const cold = 0.006 * 65;
    const expected = Math.min(1, Math.max(0, (vMax + cold - drive) / (vMax - vMin)));
    const share = out.monteCarlo.shareFailingByRule["gate-overdrive-cold"] ?? 0;
    expect(expected).toBeGreaterThan(0.1);
    expect(expected).toBeLessThan(0.9);
    expect(Math.abs(share - expected)).toBeLessThan(3 * Math.sqrt((expected * (1 - expected)) / samples));
    expect(
      out.assumptions.some((a) =>
        /monteCarlo: the MOSFET's gate threshold drawn uniform over the datasheet's 1–2\.8 V at 25 °C/.test(a),
      ),
    ).toBe(true);
  });
});

describe("the datasheet-minimum gate threshold in the review's turn-off event", () => {
  // A low-side N-FET's gate sees the output (nfet-low-side.ts): with no gate lag given it conducts
  // backwards until the output falls below Vth(Tj) (the threshold's linear law, docs/references.md),
  // so the output where the channel lets go is the threshold the event used. The input is shorted.
  const lowSide = (mosfet: Record<string, unknown> = {}) => ({
    kind: "nfet-low-side",
    mosfet: {
      rdsOn: [{ gateSourceV: 4.5, rdsOnOhm: "10 mOhm" }],
      thresholdV: 2,
      vgsMaxV: 20,
      vdsMaxV: 60,
      tjMaxC: 175,
      bodyDiode: { model: "shockley", saturationCurrentA: "8 nA", ideality: 1.4, seriesResistanceOhm: "10 mOhm" },
      ...mosfet,
    },
    gateClampV: 15,
    thermal: { kind: "junction-ambient", rthJaKPerW: 45 },
  });
  const event = async (stage: unknown, datasheetMax?: Record<string, unknown>, tjC = "25 degC") => {
    if (review === undefined) throw new Error("no review");
    const out = (await review({
      requirement: { ...requirement, turnOff: { ...requirement.turnOff, inputAfterV: "0 V", tjC } },
      candidates: [
        {
          stage,
          ...(datasheetMax ? { datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, ...datasheetMax } } : {}),
        },
      ],
    })) as { candidates: Candidate[] };
    const e = out.candidates[0]?.turnOff?.event;
    return (e?.["gateTurnOff"] as { outputAtOffV?: number } | undefined)?.outputAtOffV;
  };
  it("a typical 2 V threshold lets the channel go at 2 V; with the 1.2 V minimum it holds on to 1.2 V", async () => {
    expect(await event(lowSide())).toBeCloseTo(2, 6);
    expect(await event(lowSide(), { thresholdMinV: "1.2 V" })).toBeCloseTo(1.2, 6);
  });
  it("hot, the threshold's coefficient does the same: 2 V − 5 mV/K·90 K = 1.55 V at 115 °C, 1.45 V at 135 °C", async () => {
    expect(await event(lowSide({ thresholdTempCoVPerK: -0.005 }), undefined, "115 degC")).toBeCloseTo(1.55, 6);
    expect(await event(lowSide({ thresholdTempCoVPerK: -0.005 }), undefined, "135 degC")).toBeCloseTo(1.45, 6);
  });
  it("refuses a minimum above the typical value, naming the field", async () => {
    await expect(event(lowSide(), { thresholdMinV: "2.5 V" })).rejects.toThrow(
      /above the stage's typical MOSFET gate threshold 2 V/,
    );
  });
});
