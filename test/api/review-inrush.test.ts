import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext, postTrpc, testApp } from "../helpers/app.js";
import { KNOWN_BAD } from "../known-bad/designs.js";

// The review's inrush and load-side overvoltage through the procedure: the closed forms of
// domain/checks/inrush.ts and load-overvoltage.ts (docs/references.md "Inrush"), the defaults it
// declares and the gaps it leaves open. The demo switch's figures are invented (examples/catalog).

type Verdict = { ruleId: string; outcome: string; notApplicableCode: string | null; reason: string | null };
type Cand = {
  verdict: string;
  rules: { verdicts: Verdict[] };
  metrics: Record<string, number | boolean>;
  inrush?: { assessed: boolean; drive?: string; result?: Record<string, number | string> };
  loadOvervoltage: { loadVMaxV: number; pulses: { pulseId: string; inputPeakV: number; loadPeakV: number }[] };
};
type Out = { candidates: Cand[]; assumptions: string[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};
const verdictOf = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id);

const demoSwitch = { stage: { kind: "catalog-part", partId: "demo-integrated-ideal-diode-5a-36v" } };
const zth = {
  kind: "foster",
  terms: [
    { rKPerW: 0.8, tauS: 1e-3 },
    { rKPerW: 6, tauS: 0.05 },
    { rKPerW: 48.2, tauS: 10 },
  ],
};
const req = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: ["iso16750-2-load-dump-b-12v"],
};

describe("review: inrush into the output capacitance", () => {
  it("the switch charges at its 6 A limit beside the 3 A load in C·V/(Ilim − IL), switched on at the 24 V jump start by default", async () => {
    const out = await call({
      requirement: { ...req, inrush: { outputCapacitanceF: "220 uF" } },
      candidates: [{ ...demoSwitch, transientThermal: zth }],
    });
    const c = out.candidates[0];
    expect(c?.inrush?.drive).toBe("current-limit");
    // vehicle-12v-b: steady to 16 V, jump start 24 V, long-term 18 V: 470 uF·24 V / 3 A = 3.76 ms; energy 6 A·24 V·T/2.
    const t = (220e-6 * 24) / 3;
    expect(c?.inrush?.result?.["chargeTimeS"]).toBeCloseTo(t, 12);
    expect(c?.inrush?.result?.["energyJ"]).toBeCloseTo((6 * 24 * t) / 2, 12);
    expect(c?.inrush?.result?.["peakPowerW"]).toBeCloseTo(6 * 24, 12);
    expect(c?.metrics["inrushCharges"]).toBe(true);
    expect(c?.metrics["inrushTjC"]).toBeGreaterThan(85);
    expect(verdictOf(c, "inrush-tj")?.outcome).toBe("pass");
    expect(
      out.assumptions.some((a) =>
        a.startsWith(
          "inrush.inputV: the jump start 24 V, the highest level the stage can be switched on at (default; of steady 16 V, jump start 24 V, long-term overvoltage 18 V)",
        ),
      ),
    ).toBe(true);
    expect(out.assumptions.some((a) => a.startsWith("inrush.load: the requirement's load"))).toBe(true);
  });

  it("the default input is the highest level of the class: the telecom abnormal limit, a custom supply's maximum", async () => {
    const telecom = await call({
      requirement: {
        ...req,
        supply: { class: "telecom-48v" },
        transients: [],
        inrush: { outputCapacitanceF: "100 uF", slewVPerS: "1000 V/s", load: { kind: "none" } },
      },
      candidates: [{ stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" } }],
    });
    expect(telecom.assumptions.some((a) => a.startsWith("inrush.inputV: the abnormal service limit 60 V"))).toBe(true);
    // Slew into a bare capacitor: the pass element loses what the capacitor stores, ½·C·V² at 60 V = 0.18 J.
    expect(telecom.candidates[0]?.inrush?.result?.["energyJ"]).toBeCloseTo(0.5 * 100e-6 * 60 ** 2, 12);
    const custom = await call({
      requirement: {
        ...req,
        supply: { class: "custom", minV: 10, nominalV: 12, maxV: 14 },
        reverse: { voltageV: 14, durationS: 60 },
        transients: [],
        inrush: { outputCapacitanceF: "470 uF" },
      },
      candidates: [{ ...demoSwitch, transientThermal: zth }],
    });
    expect(custom.assumptions).toContain(
      "inrush.inputV: the highest steady supply 14 V (default; the supply has no higher steady level)",
    );
    expect(custom.candidates[0]?.inrush?.result?.["chargeTimeS"]).toBeCloseTo((470e-6 * 14) / 3, 12);
  });

  it("an integrated switch open above its cut-off switches on at most there: the 24 V class's 36 V jump start charges at 33 V", async () => {
    const on24 = {
      ...req,
      supply: { class: "vehicle-24v-f" },
      transients: [],
      inrush: { outputCapacitanceF: "100 uF" },
    };
    const typical = await call({ requirement: on24, candidates: [{ ...demoSwitch, transientThermal: zth }] });
    expect(typical.assumptions.some((a) => a.startsWith("inrush.inputV: the jump start 36 V"))).toBe(true);
    // The demo switch's cut-off is 33 V: C·V/(Ilim − IL) = 100 uF·33 V/(6 A − 3 A) = 1.1 ms, peak 6 A·33 V.
    const i = typical.candidates[0]?.inrush as { inputV?: number; result?: Record<string, number> } | undefined;
    expect(i?.inputV).toBe(33);
    expect(i?.result?.["chargeTimeS"]).toBeCloseTo((100e-6 * 33) / 3, 12);
    expect(i?.result?.["peakPowerW"]).toBeCloseTo(6 * 33, 12);
    // At its datasheet's highest threshold, 34 V.
    const dm = { rdsOnFactor: 1, forwardVoltageFactor: 1, overvoltageCutoffMaxV: 34 };
    const high = await call({
      requirement: on24,
      candidates: [{ ...demoSwitch, transientThermal: zth, datasheetMax: dm }],
    });
    expect((high.candidates[0]?.inrush as { inputV?: number } | undefined)?.inputV).toBe(34);
  });

  it("leaves the pulse's Tj open without a transient thermal network; a constant-power load draws P/V from its minVoltageV", async () => {
    const noZth = await call({
      requirement: { ...req, inrush: { outputCapacitanceF: "470 uF" } },
      candidates: [demoSwitch],
    });
    const c = noZth.candidates[0];
    expect(verdictOf(c, "inrush-tj")?.notApplicableCode).toBe("missing-value");
    // The demo switch shuts down at 165 °C: without Zth nobody can say whether the charge gets there first.
    expect(verdictOf(c, "inrush-completes")?.notApplicableCode).toBe("missing-value");
    expect(c?.verdict).not.toBe("pass");

    const cp = await call({
      requirement: {
        ...req,
        load: { kind: "constant-power", powerW: 20, minVoltageV: 8 },
        inrush: { outputCapacitanceF: "470 uF" },
      },
      candidates: [{ ...demoSwitch, transientThermal: zth }],
    });
    // 6 A limit, 20 W from 8 V, to the 24 V jump start: C·Vs/I + (C/I)·[(Vin − Vs) + (P/I)·ln((I·Vin − P)/(I·Vs − P))].
    const [C, I, P, VS, V] = [470e-6, 6, 20, 8, 24];
    const t = (C * VS) / I + (C / I) * (V - VS + (P / I) * Math.log((I * V - P) / (I * VS - P)));
    expect(cp.candidates[0]?.inrush).toMatchObject({ assessed: true, drive: "current-limit" });
    expect(cp.candidates[0]?.inrush?.result?.["chargeTimeS"]).toBeCloseTo(t, 12);
    expect(
      cp.assumptions.some((a) =>
        a.startsWith("inrush.load: the requirement's 20 W converter draws P/V from its minVoltageV 8 V"),
      ),
    ).toBe(true);
  });

  it("without requirement.inrush or loadMaxV the new rules are not required", async () => {
    const out = await call({ requirement: req, candidates: [{ ...demoSwitch, transientThermal: zth }] });
    for (const id of ["inrush-tj", "inrush-completes", "load-overvoltage"])
      expect(verdictOf(out.candidates[0], id)?.notApplicableCode).toBe("not-required");
  });
});

describe("review: what reaches the load through the switch's overvoltage cut-off", () => {
  it("the suppressed 35 V load dump reaches the load at the 33 V threshold plus its rise over the 2 us response", async () => {
    const out = await call({ requirement: { ...req, loadMaxV: 34 }, candidates: [demoSwitch] });
    const c = out.candidates[0];
    const p = c?.loadOvervoltage.pulses.find((x) => x.pulseId === "iso16750-2-load-dump-b-12v");
    expect(p?.inputPeakV).toBe(35);
    // Open-circuit rise: (101 − 14) V over 10 ms = 8.7 V/ms; 33 V + 8.7 V/ms·2 us = 33.0174 V.
    expect(p?.loadPeakV).toBeCloseTo(33 + 8.7e3 * 2e-6, 9);
    expect(c?.metrics["loadTransientVMaxV"]).toBeCloseTo(33.0174, 9);
    expect(verdictOf(c, "load-overvoltage")?.outcome).toBe("pass");
    const tight = await call({ requirement: { ...req, loadMaxV: 33 }, candidates: [demoSwitch] });
    expect(verdictOf(tight.candidates[0], "load-overvoltage")?.outcome).toBe("fail");
  });

  const app = testApp().app;
  it.each([
    ["an unknown inrush field", { outputCapacitanceF: "470 uF", capacitance: 1 }, "requirement.inrush.capacitance"],
    ["a slew in the wrong unit", { outputCapacitanceF: "470 uF", slewVPerS: "5 A" }, "requirement.inrush.slewVPerS"],
    ["a missing capacitance", { slewVPerS: 1000 }, "requirement.inrush.outputCapacitanceF"],
  ])("rejects %s with 400 naming the field", async (_what, inrush, path) => {
    const r = await postTrpc(app, "review", { requirement: { ...req, inrush }, candidates: [demoSwitch] });
    expect(r.status).toBe(400);
    const issues = (r.body as { error: { data: { backstop: { issues: { path: (string | number)[] }[] } } } }).error.data
      .backstop.issues;
    expect(issues.map((i) => i.path.join("."))).toContain(path);
  });
});

describe("review: the inrush pulse against the MOSFET's SOA lines", () => {
  it("the known-bad slew: 2.2 A at 16 V for E/Ppeak = 8 ms against the lines' log-log value derated to 85 °C", async () => {
    const d = KNOWN_BAD.find((x) => x.id === "inrush-slew-outside-soa");
    if (d === undefined) throw new Error("design missing");
    const c = (await call(d.bad)).candidates[0];
    // Slew 1000 V/s into 2200 uF: I = C·s = 2.2 A at Vds = 16 V, E = ½·C·V², Ppeak = C·s·V → 8 ms.
    // Along the 1 ms and 10 ms lines at 16 V (log-log): 200·16^(ln 0.01/ln 60) and 100·16^(ln 0.006/ln 60);
    // between them at 8 ms (log-log in width), ×(175 − 85)/(175 − 25) = 0.6.
    const at1 = 200 * 16 ** (Math.log(0.01) / Math.log(60));
    const at10 = 100 * 16 ** (Math.log(0.006) / Math.log(60));
    const allowed = Math.exp(Math.log(at1) + Math.log10(8) * Math.log(at10 / at1)) * 0.6;
    expect(c?.metrics["inrushSoaCurrentA"]).toBeCloseTo(2.2, 9);
    expect(c?.metrics["inrushSoaAllowedA"]).toBeCloseTo(allowed, 9);
    expect(allowed).toBeCloseTo(2.08, 2);
  });

  it("at the jump start (no inputV): ½·C·V² at 24 V in the pass element, uncontrolled or slewed, the SOA read at Vds 24 V", async () => {
    const at = async (id: string) => {
      const d = KNOWN_BAD.find((x) => x.id === id);
      if (d === undefined) throw new Error("design missing");
      const input = structuredClone(d.bad) as { requirement: { inrush: Record<string, unknown> } };
      delete input.requirement.inrush["inputV"];
      return (await call(input)).candidates[0];
    };
    // Conservation of energy: a capacitor charged from 0 V through a resistance (here the channel alone:
    // no source or loop resistance) or at a constant current loses ½·C·V² = ½·2200 uF·(24 V)² = 0.6336 J.
    const full = await at("inrush-uncontrolled-into-2200uF");
    expect(full?.inrush?.drive).toBe("uncontrolled");
    expect(full?.inrush?.result?.["energyJ"]).toBeCloseTo(0.5 * 2200e-6 * 24 ** 2, 12);
    const slew = await at("inrush-slew-outside-soa");
    expect(slew?.inrush?.result?.["energyJ"]).toBeCloseTo(0.5 * 2200e-6 * 24 ** 2, 12);
    expect(slew?.inrush?.result?.["peakPowerW"]).toBeCloseTo(2200e-6 * 1000 * 24, 12);
    const soa = (slew?.inrush as { soa?: { vdsV: number; currentA: number; equivalentWidthS: number } } | undefined)
      ?.soa;
    expect(soa?.vdsV).toBe(24);
    expect(soa?.currentA).toBeCloseTo(2.2, 12);
    // E/Ppeak = (½·C·V²)/(C·s·V) = V/(2·s) = 12 ms.
    expect(soa?.equivalentWidthS).toBeCloseTo(24 / 2000, 12);
  });
});
