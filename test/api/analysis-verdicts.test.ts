import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { projectRoot } from "../../adapters/project-root.js";
import { batteryChargeOutput } from "../../contracts/battery-charge.js";
import { bridgeAcOutput, bridgeDcOutput } from "../../contracts/bridge.js";
import { holdUpOutput } from "../../contracts/hold-up.js";
import { oringOutput } from "../../contracts/oring.js";
import type { ruleSetResultSchema } from "../../contracts/rule-set.js";
import { turnOffOutput } from "../../contracts/turn-off.js";
import { postTrpc, testApp } from "../helpers/app.js";

// Verdicts of the built-in rule sets on the reverse-current and bridge analyses: per procedure a
// case that passes and one that fails for a physical reason, each checked against its source.
type Input = Record<string, unknown>;
const root = projectRoot();
const example = (p: string): Input =>
  (JSON.parse(readFileSync(join(root, "examples", "requests", `${p}.json`), "utf8")) as { input: Input }).input;
const catalogStage = (id: string): Input => {
  const c = JSON.parse(readFileSync(join(root, "examples", "catalog", "demo-parts.json"), "utf8")) as {
    parts: { id: string; stage: Input }[];
  };
  const part = c.parts.find((p) => p.id === id);
  if (part === undefined) throw new Error(id);
  return structuredClone(part.stage);
};
type Verdicts = z.infer<typeof ruleSetResultSchema>;
const verdict = (r: Verdicts | undefined, id: string) => {
  const v = r?.verdicts.find((x) => x.ruleId === id);
  if (v === undefined) throw new Error(`no verdict ${id}`);
  return v;
};

describe("verdicts of the reverse-current and bridge analyses", () => {
  const { app } = testApp();
  const call = async (proc: string, input: Input): Promise<unknown> => {
    const r = await postTrpc(app, proc, input);
    if (r.status !== 200) throw new Error(JSON.stringify(r.body));
    return (r.body as { result: { data: unknown } }).result.data;
  };

  describe("turnOff: absorbed energy against the temperature-derated avalanche rating", () => {
    it("passes with the controller's 1 µs delay: little current has built up when the MOSFET turns off", async () => {
      const out = turnOffOutput.parse(await call("turnOff", { ...example("turnOff"), ruleSet: "default" }));
      if (out.outcome !== "blocks" || out.clamp === undefined) throw new Error(out.outcome);
      const v = verdict(out.rules, "avalanche-energy");
      expect(v.outcome).toBe("pass");
      // Hand-computed threshold: 50 mJ·(175 − 85)/(175 − 25) = 30 mJ (linear EAS derating to Tj(max)).
      expect(v.threshold).toBeCloseTo(0.03, 12);
      expect(v.values["absorbedEnergyJ"]).toBe(out.clamp.absorbedJ);
      expect(out.rules?.ruleSet.id).toBe("default");
    });

    it("fails with a 10 µs delay against a 5 mJ rating: the reverse current rises for longer and the loop inductance hands its energy to the clamp", async () => {
      const out = turnOffOutput.parse(
        await call("turnOff", {
          ...example("turnOff"),
          turnOff: { reverseThresholdV: "20 mV", turnOffDelayS: "10 us" },
          avalancheRatingJ: "5 mJ",
          ruleSet: "default",
        }),
      );
      if (out.outcome !== "blocks" || out.clamp === undefined) throw new Error(out.outcome);
      const v = verdict(out.rules, "avalanche-energy");
      expect(v.outcome).toBe("fail");
      expect(v.threshold).toBeCloseTo(0.005 * (90 / 150), 12);
      // Closed form of unclamped inductive switching, ½·L·I²·Vcl/(Vcl − Vs) with the current at
      // turn-off: the exact loop response's absorbed energy lies within 5 % of it.
      const absorbed = v.values["absorbedEnergyJ"] as number;
      expect(Math.abs(absorbed - out.clamp.clampedFormulaJ) / out.clamp.clampedFormulaJ).toBeLessThan(0.05);
      expect(absorbed).toBeGreaterThan(0.003);
      expect(out.rules?.outcome).toBe("fail");
    });

    it("a P-FET drains the output back into the shorted input before it turns off: it fails reverse-current blocking where hold-up is required", async () => {
      const out = turnOffOutput.parse(
        await call("turnOff", {
          ...example("turnOff"),
          stage: { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" },
          ruleSet: "default",
          ruleMetrics: { holdUpRequired: true },
        }),
      );
      expect(out.outcome).toBe("does-not-block");
      // Common practice: a MOSFET channel conducts both ways; the output drains into the shorted input.
      // Its gate at ground, the channel turns off once the output has fallen to about its threshold
      // (issue 19 item 11); the loop current then goes into the body diode's avalanche, which the
      // avalanche rule reads (here well within the 30 mJ rating).
      const avalanche = verdict(out.rules, "avalanche-energy");
      expect(avalanche.notApplicableCode).toBeNull();
      expect(avalanche.values["absorbedEnergyJ"]).toBeGreaterThan(0);
      expect(verdict(out.rules, "reverse-current-blocking").outcome).toBe("fail");
    });

    it("energy absorbed by a stage without an avalanche rating leaves the set incomplete, saying what to give", async () => {
      const stage = catalogStage("demo-ideal-diode-60v-3mohm") as { mosfet: Input };
      delete stage.mosfet["avalancheEnergyJ"];
      const input = { ...example("turnOff"), stage, ruleSet: "default" };
      delete (input as Input)["avalancheRatingJ"];
      const out = turnOffOutput.parse(await call("turnOff", input));
      const v = verdict(out.rules, "avalanche-energy");
      expect(v.notApplicableCode).toBe("missing-value");
      expect(v.reason).toMatch(/avalancheRatingJ/);
      expect(out.rules?.outcome).toBe("incomplete");
    });
  });

  describe("turnOff: a repeating event's energy against the repetitive avalanche rating EAR", () => {
    it("the example's repeating event is held to the part's 4 mJ EAR (threshold = the rating)", async () => {
      const out = turnOffOutput.parse(await call("turnOff", { ...example("turnOff"), ruleSet: "default" }));
      if (out.outcome !== "blocks" || out.clamp === undefined) throw new Error(out.outcome);
      const v = verdict(out.rules, "avalanche-energy-repetitive");
      expect(v.outcome).toBe("pass");
      expect(v.threshold).toBe(0.004);
      expect(v.values["absorbedEnergyJ"]).toBe(out.clamp.absorbedJ);
    });

    it("fails with a 10 µs delay: the energy is within the 50 mJ single-pulse rating but above the 4 mJ EAR", async () => {
      const out = turnOffOutput.parse(
        await call("turnOff", {
          ...example("turnOff"),
          turnOff: { reverseThresholdV: "20 mV", turnOffDelayS: "10 us" },
          ruleSet: "default",
        }),
      );
      expect(verdict(out.rules, "avalanche-energy").outcome).toBe("pass");
      const v = verdict(out.rules, "avalanche-energy-repetitive");
      expect(v.outcome).toBe("fail");
      expect(v.values["absorbedEnergyJ"] as number).toBeGreaterThan(0.004);
    });

    it("a one-off event is out of the rule's scope; a repeating one on a MOSFET without EAR leaves the set incomplete", async () => {
      const once = turnOffOutput.parse(
        await call("turnOff", { ...example("turnOff"), repetitive: false, ruleSet: "default" }),
      );
      expect(verdict(once.rules, "avalanche-energy-repetitive").notApplicableCode).toBe("precondition");
      const stage = catalogStage("demo-ideal-diode-60v-3mohm") as { mosfet: Input };
      delete stage.mosfet["repetitiveAvalancheEnergyJ"];
      const out = turnOffOutput.parse(await call("turnOff", { ...example("turnOff"), stage, ruleSet: "default" }));
      const v = verdict(out.rules, "avalanche-energy-repetitive");
      expect(v.notApplicableCode).toBe("missing-value");
      expect(v.reason).toMatch(/repetitiveAvalancheEnergyJ/);
      expect(out.rules?.outcome).toBe("incomplete");
    });
  });

  describe("holdUp: hold-up time against the requirement", () => {
    // Closed form (energy balance, ESR neglected): C·(V0² − Vmin²)/2 = P·t → t = C·(144 − 64)/(2·20 W).
    const closedForm = (capacitanceF: number) => (capacitanceF * (12 * 12 - 8 * 8)) / (2 * 20);
    const run = async (capacitance: string) =>
      holdUpOutput.parse(
        await call("holdUp", {
          ...example("holdUp"),
          capacitor: { capacitanceF: capacitance, esrOhm: "30 mOhm" },
          input: { kind: "open" },
          ruleSet: "default",
        }),
      );

    it("1500 µF holds a 20 W load for about 3 ms: passes 2 ms and the 1.25× margin", async () => {
      const out = await run("1500 uF");
      const [schottky] = out.stages;
      const v = verdict(schottky?.rules, "hold-up-time");
      expect(v.outcome).toBe("pass");
      expect(verdict(schottky?.rules, "hold-up-margin").outcome).toBe("pass");
      const t = v.values["holdUpS"] as number;
      expect(t).toBeLessThan(closedForm(1.5e-3));
      expect((closedForm(1.5e-3) - t) / closedForm(1.5e-3)).toBeLessThan(0.03);
      expect(schottky?.rules?.outcome).toBe("pass");
    });

    it("470 µF holds it for under 1 ms: fails the 2 ms requirement", async () => {
      const out = await run("470 uF");
      for (const s of out.stages) {
        const v = verdict(s.rules, "hold-up-time");
        expect(v.outcome).toBe("fail");
        expect(v.values["holdUpS"] as number).toBeLessThan(closedForm(470e-6));
        expect(v.threshold).toBe(0.002);
      }
    });

    it("with a required hold-up, the P-FET fails reverse-current blocking: the output drains into a shorted input", async () => {
      const out = holdUpOutput.parse(await call("holdUp", { ...example("holdUp"), ruleSet: "default" }));
      const pfet = out.stages[1];
      expect(pfet?.result.outcome).toBe("drains-back");
      const v = verdict(pfet?.rules, "reverse-current-blocking");
      expect(v.outcome).toBe("fail");
      expect(v.values).toEqual({ blocksReverseCurrent: false, holdUpRequired: true });
    });

    it("without requiredHoldUpS the hold-up rules are out of scope, not gaps", async () => {
      const input = { ...example("holdUp"), input: { kind: "open" }, ruleSet: "default" };
      delete (input as Input)["requiredHoldUpS"];
      const out = holdUpOutput.parse(await call("holdUp", input));
      const v = verdict(out.stages[0]?.rules, "hold-up-time");
      expect(v.notApplicableCode).toBe("not-required");
      // Nothing else of the set is in scope for an open input without a requirement: the set says
      // so ("not-applicable"), and never "incomplete" (a gap) nor "pass" (nothing was proven).
      expect(out.stages[0]?.rules?.outcome).toBe("not-applicable");
    });
  });

  describe("oring: reverse-current blocking and the reverse current per branch", () => {
    it("two ideal diodes pass; the hotter branch is named on the junction rules", async () => {
      const out = oringOutput.parse(await call("oring", { ...example("oring"), ruleSet: "default" }));
      if (out.outcome !== "solved") throw new Error(out.outcome);
      expect(out.rules?.outcome).toBe("pass");
      const tj = verdict(out.rules, "tj-limit");
      const hottest = out.branches.reduce((a, b) => (b.tjC > a.tjC ? b : a));
      expect(tj.element).toBe(hottest.name);
      expect(tj.values["tjWorstC"]).toBe(hottest.tjC);
      expect(verdict(out.rules, "reverse-current-blocking").values).toEqual({
        blocksReverseCurrent: true,
        parallelSources: true,
      });
    });

    it("two P-FETs fail: the 12.6 V source drives current back into the 12 V one through the lower channel", async () => {
      const pf = { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" };
      const out = oringOutput.parse(
        await call("oring", {
          sources: [
            { name: "A", openCircuitV: "12.6 V", internalResistanceOhm: "50 mOhm", stage: pf },
            { name: "B", openCircuitV: "12 V", internalResistanceOhm: "50 mOhm", stage: pf },
          ],
          load: { kind: "constant-current", currentA: 2 },
          ambientC: 25,
          ruleSet: "default",
          ruleMetrics: { reverseCurrentBudgetA: 0.01 },
        }),
      );
      if (out.outcome !== "solved") throw new Error(out.outcome);
      expect(verdict(out.rules, "reverse-current-blocking").outcome).toBe("fail");
      const budget = verdict(out.rules, "reverse-current-budget");
      expect(budget.outcome).toBe("fail");
      expect(budget.element).toBe("B");
      expect(budget.reason).toMatch(/^B: /);
      // Kirchhoff with two equal branch resistances R (source + channel): I_B = I_load/2 − ΔV/(2R).
      const r = out.branches.map((b) => 0.05 + Math.abs(b.stageV / b.currentA));
      const rMean = ((r[0] ?? 0) + (r[1] ?? 0)) / 2;
      const expected = -(1 - 0.6 / (2 * rMean));
      expect(Math.abs((budget.values["reverseCurrentA"] as number) - expected) / expected).toBeLessThan(0.02);
    });
  });

  describe("batteryCharge: back-drain of the source", () => {
    it("the ideal diode blocks (pass); the P-FET lets the target drain a flat source (fail)", async () => {
      const out = batteryChargeOutput.parse(
        await call("batteryCharge", { ...example("batteryCharge"), ruleSet: "default" }),
      );
      const [schottky, ideal, pfet] = out.stages;
      expect(verdict(ideal?.rules, "battery-back-drain").outcome).toBe("pass");
      expect(verdict(schottky?.rules, "battery-back-drain").outcome).toBe("pass");
      // Common practice: a MOSFET channel conducts both ways once enhanced.
      const drain = verdict(pfet?.rules, "battery-back-drain");
      expect(drain.outcome).toBe("fail");
      expect(pfet?.metrics.targetCanDrainSource).toBe(true);
      // The junction rules read the peak over the charge.
      const tj = verdict(schottky?.rules, "tj-limit");
      expect(tj.values["tjWorstC"]).toBe(schottky?.metrics.peakStageTjC);
    });
  });

  describe("bridgeDc: reverse voltage on the blocking pair", () => {
    it("the 60 V active bridge passes; the 45 V Schottky bridge it replaces fails the 80 % derating at 42.5 V", async () => {
      const out = bridgeDcOutput.parse(await call("bridgeDc", { ...example("bridgeDc"), ruleSet: "default" }));
      expect(out.rules?.outcome).toBe("pass");
      const v = verdict(out.compareToRules, "diode-reverse-steady");
      expect(v.outcome).toBe("fail");
      expect(v.threshold).toBeCloseTo(36, 12);
      // KVL around the bridge: a blocking element sees the load voltage plus the drop of the
      // conducting element on its line.
      const pos = out.compareTo?.positive;
      if (pos === undefined || !("elements" in pos)) throw new Error("positive polarity");
      const conducting = pos.elements.find((e) => e.role === "conducting");
      expect(v.values["reverseVMaxV"]).toBeCloseTo(pos.loadV + (conducting?.dropV ?? Number.NaN), 9);
      // The four elements see the same (each blocks in one polarity): no element is singled out.
      expect(v.element).toBeUndefined();
    });
  });

  describe("bridgeAc: element peak current and the capacitor's ripple rating", () => {
    const rectifier = { ...catalogStage("demo-pn-rectifier-3a-100v"), peakRepetitiveCurrentA: "8 A" };
    const base = { ...example("bridgeAc"), bridge: { all: rectifier }, compareTo: undefined, ruleSet: "default" };

    it("with 1 mH leakage the charging pulse stays under an 8 A IFRM; a stiff source (no inductance, 50 mΩ) drives it above", async () => {
      const soft = bridgeAcOutput.parse(await call("bridgeAc", base));
      const stiff = bridgeAcOutput.parse(
        await call("bridgeAc", { ...base, leakageInductanceH: 0, sourceResistanceOhm: "50 mOhm" }),
      );
      const a = verdict(soft.rules, "element-peak-current");
      const b = verdict(stiff.rules, "element-peak-current");
      expect(a.outcome).toBe("pass");
      expect(b.outcome).toBe("fail");
      expect(b.threshold).toBe(8);
      // Charge balance: the same load charge in a shorter pulse means a higher peak (textbook).
      if (!("steadyState" in soft.bridge) || !("steadyState" in stiff.bridge)) throw new Error("no steady state");
      const angle = (o: typeof soft.bridge) =>
        "steadyState" in o ? Math.max(...o.steadyState.elements.map((e) => e.conductionAngleDeg)) : Number.NaN;
      expect(angle(stiff.bridge)).toBeLessThan(angle(soft.bridge));
      // The bridge is symmetric: every element carries the same pulse, one pair in each half
      // period (half-wave symmetry), so no element is singled out (as for bridgeDc above).
      expect(b.element).toBeUndefined();
      const peaks = stiff.bridge.steadyState.elements.map((e) => e.peakCurrentA);
      expect(Math.max(...peaks) - Math.min(...peaks)).toBeLessThan(1e-9 * Math.max(...peaks));
    });

    it("capacitor ripple: 2.5 A rating passes, 1.5 A fails; the ripple is the rectified current less its mean", async () => {
      const ok = bridgeAcOutput.parse(await call("bridgeAc", base));
      const low = bridgeAcOutput.parse(await call("bridgeAc", { ...base, capacitorRippleRatingA: "1.5 A" }));
      expect(verdict(ok.rules, "capacitor-ripple").outcome).toBe("pass");
      const v = verdict(low.rules, "capacitor-ripple");
      expect(v.outcome).toBe("fail");
      if (!("steadyState" in low.bridge)) throw new Error("no steady state");
      const s = low.bridge.steadyState;
      // Parseval: the capacitor carries |i_source| − I_load, so I_C,rms² = I_s,rms² − I_dc² (exact for
      // a constant load current; the resistive load's small ripple current makes it approximate).
      const estimate = Math.sqrt(s.sourceRmsCurrentA ** 2 - s.loadCurrentA ** 2);
      expect(Math.abs((v.values["capacitorRippleCurrentA"] as number) - estimate) / estimate).toBeLessThan(0.03);
      // Without a rating the rule is out of scope (the issue: "capacitor ripple current if rated").
      const unrated = { ...base };
      delete (unrated as Input)["capacitorRippleRatingA"];
      const u = bridgeAcOutput.parse(await call("bridgeAc", unrated));
      expect(verdict(u.rules, "capacitor-ripple").notApplicableCode).toBe("not-required");
    });
  });

  it("refuses ruleMetrics that the analysis computes, naming the field", async () => {
    const r = await postTrpc(app, "holdUp", { ...example("holdUp"), ruleSet: "default", ruleMetrics: { holdUpS: 1 } });
    expect(r.status).toBe(400);
    expect(JSON.stringify(r.body)).toContain("ruleMetrics");
  });
});
