import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext, postTrpc, testApp } from "../helpers/app.js";

// An integrated switch's current limit and overvoltage cut-off at their datasheet extremes
// (datasheetMax.currentLimitMinA, overvoltageCutoffMinV, overvoltageCutoffMaxV), against the
// closed forms of docs/references.md (the integrated switch at its current limit and above its
// cut-off): the charge at the lowest limit takes C·V/(I_lim,min − I_load); what reaches the load is
// the highest threshold plus the input's rise over the response time. The demo switch (6 A limit,
// 33 V cut-off in 2 us) is invented (examples/catalog).

type Verdict = { ruleId: string; outcome: string };
type Cand = {
  rules: { verdicts: Verdict[] };
  metrics: Record<string, number | boolean>;
  inrush?: { drive?: string; result?: Record<string, number | string> };
  loadOvervoltage: { pulses: { pulseId: string; loadPeakV: number }[] };
};
type Out = { candidates: Cand[]; assumptions: string[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};
const verdictOf = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;

const demoSwitch = { kind: "catalog-part", partId: "demo-integrated-ideal-diode-5a-36v" };
const dm = (o: Record<string, unknown>) => ({ rdsOnFactor: 1, forwardVoltageFactor: 1, ...o });
const req = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: ["iso16750-2-load-dump-b-12v"],
};

describe("review: an integrated switch's current limit and cut-off at their datasheet extremes", () => {
  it("charges at the lowest limit: 470 uF·24 V (the jump start) / (5 A − 3 A) = 5.64 ms, and the limit rule reads 5 A", async () => {
    const out = await call({
      requirement: { ...req, inrush: { outputCapacitanceF: "470 uF" } },
      candidates: [{ stage: demoSwitch, datasheetMax: dm({ currentLimitMinA: 5 }) }],
    });
    const c = out.candidates[0];
    expect(c?.inrush?.drive).toBe("current-limit");
    const t = (470e-6 * 24) / (5 - 3);
    expect(c?.inrush?.result?.["chargeTimeS"]).toBeCloseTo(t, 12);
    expect(c?.inrush?.result?.["energyJ"]).toBeCloseTo((5 * 24 * t) / 2, 12);
    expect(c?.metrics["switchCurrentLimitA"]).toBe(5);
    expect(out.assumptions.some((a) => a.includes("currentLimitMinA"))).toBe(false);
  });

  it("absent, the typical limit stands, with an assumption saying so", async () => {
    const out = await call({ requirement: req, candidates: [{ stage: demoSwitch }] });
    expect(out.candidates[0]?.metrics["switchCurrentLimitA"]).toBe(6);
    expect(out.assumptions.some((a) => a.includes("currentLimitMinA") && a.includes("typical 6 A"))).toBe(true);
    expect(out.assumptions.some((a) => a.includes("overvoltageCutoffMinV") && a.includes("typical 33 V"))).toBe(true);
  });

  it("the load sees the highest threshold, the supply rule reads the lowest", async () => {
    const out = await call({
      requirement: { ...req, loadMaxV: 34 },
      candidates: [{ stage: demoSwitch, datasheetMax: dm({ overvoltageCutoffMinV: 31, overvoltageCutoffMaxV: 34 }) }],
    });
    const c = out.candidates[0];
    const p = c?.loadOvervoltage.pulses.find((x) => x.pulseId === "iso16750-2-load-dump-b-12v");
    // (101 − 14) V over 10 ms = 8.7 V/ms: 34 V + 8.7 V/ms·2 us = 34.0174 V, above the load's 34 V.
    expect(p?.loadPeakV).toBeCloseTo(34 + 8.7e3 * 2e-6, 9);
    expect(verdictOf(c, "load-overvoltage")).toBe("fail");
    // the lowest threshold, less the demo part's 1 V hysteresis after the load dump took the input above it
    expect(c?.metrics["overvoltageCutoffV"]).toBe(30);
    const low = await call({
      requirement: req,
      candidates: [{ stage: demoSwitch, datasheetMax: dm({ overvoltageCutoffMinV: 15.5 }) }],
    });
    expect(verdictOf(low.candidates[0], "switch-cutoff-above-supply")).toBe("fail");
  });

  const app = testApp().app;
  it.each([
    ["a minimum limit above the typical", { currentLimitMinA: 7 }, "currentLimitMinA"],
    ["a maximum threshold below the typical", { overvoltageCutoffMaxV: 30 }, "overvoltageCutoffMaxV"],
    ["a minimum threshold above the typical", { overvoltageCutoffMinV: 35 }, "overvoltageCutoffMinV"],
  ])("rejects %s, naming the field", async (_what, f, field) => {
    const r = await postTrpc(app, "review", {
      requirement: req,
      candidates: [{ stage: demoSwitch, datasheetMax: dm(f) }],
    });
    expect(r.status).toBe(400);
    const issues = (r.body as { error: { data: { backstop: { issues: { path: (string | number)[] }[] } } } }).error.data
      .backstop.issues;
    expect(issues.map((i) => i.path.join("."))).toContain(`candidates.0.datasheetMax.${field}`);
  });

  it("rejects a limit tolerance on a stage without a current limit, naming the field", async () => {
    const r = await postTrpc(app, "review", {
      requirement: req,
      candidates: [
        { stage: { kind: "catalog-part", partId: "demo-schottky-10a-60v" }, datasheetMax: dm({ currentLimitMinA: 2 }) },
      ],
    });
    expect(r.status).toBe(400);
    const issues = (r.body as { error: { data: { backstop: { issues: { path: (string | number)[] }[] } } } }).error.data
      .backstop.issues;
    expect(issues.map((i) => i.path.join("."))).toContain("candidates.0.datasheetMax.currentLimitMinA");
  });

  it("sizing.catalog refuses a catalog-wide limit or cut-off tolerance, naming the field", async () => {
    const r = await postTrpc(app, "sizing.catalog", { requirement: req, datasheetMax: dm({ currentLimitMinA: 5 }) });
    expect(r.status).toBe(400);
    const issues = (r.body as { error: { data: { backstop: { issues: { path: (string | number)[] }[] } } } }).error.data
      .backstop.issues;
    expect(issues.map((i) => i.path.join("."))).toContain("datasheetMax.currentLimitMinA");
  });
});
