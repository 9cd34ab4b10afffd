import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext } from "../helpers/app.js";

// An integrated switch's thermal shutdown at the review's steady corners, against the closed form
// of a switch held at its current limit (docs/references.md, the integrated switch at its current
// limit): the load sets its own voltage I_lim·R, the switch drops V_in − I_lim·R and dissipates
// that drop × I_lim, plus its quiescent current × V_in on the same die: Tj = Ta + Rth·P. The part is
// invented.

type Verdict = { ruleId: string; outcome: string; values: Record<string, number | boolean> };
type Corner = {
  conditions: { supplyV: number; ambientC: number };
  outcome: string;
  mode?: string;
  tjC?: number;
  loadV?: number;
};
type Cand = { verdict: string; corners: Corner[]; rules: { verdicts: Verdict[] } };
type Out = { candidates: Cand[]; assumptions: string[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};

const LIMIT_A = 3;
const LOAD_OHM = 4;
const RTH = 5;
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
  currentLimitA: LIMIT_A,
  tjMaxC: 175,
  thermal: { kind: "junction-ambient", rthJaKPerW: RTH },
  reverseRatingV: 60,
  ...o,
});
const input = (stage: Record<string, unknown>, load: unknown = { kind: "resistive", resistanceOhm: LOAD_OHM }) => ({
  requirement: {
    supply: { class: "vehicle-12v-b" },
    load,
    ambient: { minC: -40, maxC: 85 },
    transients: [],
  },
  candidates: [{ stage }],
});
const shutdownRule = (c: Cand | undefined) =>
  c?.rules.verdicts.find((v) => v.ruleId === "switch-thermal-shutdown-in-service");

describe("review: an integrated switch's thermal shutdown in steady service", () => {
  it("the hot corner at the current limit sits at Ta + Rth·((V_in − I_lim·R)·I_lim + Iq·V_in)", async () => {
    const out = await call(input(sw({ thermalShutdownC: 140 })));
    const c = out.candidates[0];
    const hot = c?.corners.find((k) => k.conditions.supplyV === 16 && k.conditions.ambientC === 85);
    expect(hot?.mode).toBe("current-limit");
    expect(hot?.loadV).toBeCloseTo(LIMIT_A * LOAD_OHM, 9);
    // 85 + 5 × ((16 − 12) × 3 + 0.2 mA × 16 V) = 145.016 °C (the vehicle class's source is stiff here)
    expect(hot?.tjC).toBeCloseTo(85 + RTH * ((16 - LIMIT_A * LOAD_OHM) * LIMIT_A + IQ_A * 16), 6);
  });

  it("a corner past the shutdown fails the rule, one below passes, and the latched-off reading is said", async () => {
    const bad = await call(input(sw({ thermalShutdownC: 140 })));
    expect(shutdownRule(bad.candidates[0])?.outcome).toBe("fail");
    expect(shutdownRule(bad.candidates[0])?.values["thermalShutdownInService"]).toBe(true);
    expect(bad.candidates[0]?.verdict).toBe("fail");
    expect(bad.assumptions.some((a) => a.includes("140 °C thermal shutdown") && a.includes("latched off"))).toBe(true);
    const good = await call(input(sw({ thermalShutdownC: 150 })));
    expect(shutdownRule(good.candidates[0])?.outcome).toBe("pass");
    expect(shutdownRule(good.candidates[0])?.values["thermalShutdownInService"]).toBe(false);
  });

  it("a corner in thermal runaway reaches a shutdown within the search", async () => {
    // 5 A through 25 mΩ rising with Tj and 80 K/W: no stable point at the hot corners.
    const out = await call(
      input(sw({ currentLimitA: 6, thermalShutdownC: 150, thermal: { kind: "junction-ambient", rthJaKPerW: 80 } }), {
        kind: "constant-current",
        currentA: 5,
      }),
    );
    expect(out.candidates[0]?.corners.some((k) => k.outcome === "thermal-runaway")).toBe(true);
    expect(shutdownRule(out.candidates[0])?.outcome).toBe("fail");
  });

  it("the operating point at the limit: 12 V open circuit, 4 Ω, 2 A limit, 10 K/W at 85 °C is 85 + 10·(4·2 + Iq·12) °C", async () => {
    const op = procedureInvoker(demoContext())("operatingPoint");
    if (op === undefined) throw new Error("operatingPoint missing");
    const at = async (thermalShutdownC: number) =>
      (await op({
        stage: sw({ currentLimitA: 2, thermalShutdownC, thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
        supplyV: 12,
        load: { kind: "resistive", resistanceOhm: LOAD_OHM },
        ambientC: 85,
        ruleSet: "default",
      })) as {
        outcome: string;
        point: { tjC: number };
        rules: { verdicts: { ruleId: string; outcome: string }[] };
      };
    const hot = await at(160);
    // the load at I_lim·R = 8 V, the switch dropping 12 − 8 = 4 V at 2 A: 8 W + 0.2 mA × 12 V
    expect(hot.point.tjC).toBeCloseTo(85 + 10 * (4 * 2 + IQ_A * 12), 6);
    const rule = (r: typeof hot) => r.rules.verdicts.find((v) => v.ruleId === "switch-thermal-shutdown-in-service");
    expect(rule(hot)?.outcome).toBe("fail");
    expect(rule(await at(170))?.outcome).toBe("pass");
  });

  it("a switch without a thermal shutdown leaves the rule out of scope", async () => {
    const out = await call(input(sw({})));
    expect(shutdownRule(out.candidates[0])?.outcome).toBe("not-applicable");
  });
});
