import { describe, expect, it } from "vitest";
import { alongProfile } from "../../../domain/checks/start-up.js";
import { solveOperatingPoint } from "../../../domain/solve/electrothermal-point.js";
import type { IntegratedSwitchStage } from "../../../domain/stages/stage-model.js";
import { relativeError } from "../../helpers/tolerance.js";

// An integrated switch's current limit and overvoltage cut-off in the steady operating point.
// Checked against closed forms: in current limit the switch is a current source I_lim, so a
// resistive load sits at V_load = I_lim·R and the switch dissipates (V_in − I_lim·R)·I_lim
// (Kirchhoff's voltage law and P = V·I, common practice); below the limit nothing changes.
const base: IntegratedSwitchStage = {
  kind: "integrated-switch",
  channel: {
    rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: 0.05 }],
    thresholdV: 1,
    tempLaw: { law: "power", exponent: 0 },
  },
  internalGateV: 10,
  startV: 4,
  belowStart: { mode: "blocks" },
  regulatedDropV: 0,
  quiescentA: 0,
  maxVoltageV: 40,
  blocksReverseCurrent: false,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 10 },
};
const at = (stage: IntegratedSwitchStage, supplyV: number, load: Parameters<typeof solveOperatingPoint>[0]["load"]) =>
  solveOperatingPoint({ stage, supplyV, sourceResistanceOhm: 0, load, ambientC: 25, rthKPerW: 10 });

describe("integrated switch current limit in the operating point", () => {
  it("a resistive load that would draw more than the limit sits at I_lim·R; the switch drops and dissipates the rest", () => {
    // 12 V into 2 Ω through 0.05 Ω would be 5.85 A; a 2 A limit holds 2 A: V_load = 4 V, P = 8 V × 2 A = 16 W.
    const r = at({ ...base, currentLimitA: 2, tjMaxC: 250 }, 12, { kind: "resistive", resistanceOhm: 2 });
    if (!("point" in r)) throw new Error(`expected a point, got ${r.outcome}`);
    expect(r.point.forward.mode).toBe("current-limit");
    expect(r.point.currentA).toBe(2);
    expect(relativeError(r.point.loadV, 2 * 2)).toBeLessThan(1e-12);
    expect(relativeError(r.point.forward.dropV, 12 - 4)).toBeLessThan(1e-12);
    expect(relativeError(r.point.dieLossW, (12 - 4) * 2)).toBeLessThan(1e-12);
    // Tj = Ta + Rth·P = 25 + 10 × 16 = 185 °C (the thermal path, closed form)
    expect(relativeError(r.point.tjC, 25 + 10 * 16)).toBeLessThan(1e-6);
  });

  it("a design whose limiting switch overheats is over-temperature, not solved", () => {
    const r = at({ ...base, currentLimitA: 2 }, 12, { kind: "resistive", resistanceOhm: 2 });
    expect(r.outcome).toBe("over-temperature");
  });

  it("below the limit the point is the one without a limit, bit for bit", () => {
    const load = { kind: "resistive" as const, resistanceOhm: 6 };
    const free = at(base, 12, load);
    const limited = at({ ...base, currentLimitA: 2.5 }, 12, load);
    expect(limited).toEqual(free);
    if (!("point" in free)) throw new Error("expected a point");
    expect(free.point.forward.mode).toBe("fully-enhanced");
    expect(free.point.currentA).toBeLessThan(2.5);
  });

  it("a constant-current or constant-power load above the limit collapses, with the limit named", () => {
    const cc = at({ ...base, currentLimitA: 2 }, 12, { kind: "constant-current", currentA: 3 });
    expect(cc.outcome).toBe("load-collapse");
    if (cc.outcome === "load-collapse") expect(cc.reason).toContain("2 A current limit");
    const cp = at({ ...base, currentLimitA: 2 }, 12, { kind: "constant-power", powerW: 30, minVoltageV: 8 });
    expect(cp.outcome).toBe("load-collapse");
    const under = at({ ...base, currentLimitA: 2 }, 12, { kind: "constant-current", currentA: 1.5 });
    expect(under.outcome).toBe("solved");
  });
});

describe("integrated switch overvoltage cut-off in the operating point", () => {
  it("above the cut-off the switch is open and says so; at or below it conducts as before", () => {
    const stage = { ...base, overvoltageCutoffV: 18 };
    const load = { kind: "resistive" as const, resistanceOhm: 10 };
    const open = at(stage, 24, load);
    expect(open.outcome).toBe("stage-off");
    if (open.outcome === "stage-off") {
      expect(open.reason).toContain("18 V overvoltage cut-off");
      expect(open.stageInputV).toBe(24);
    }
    expect(at(stage, 16, load)).toEqual(at(base, 16, load));
    expect(at(stage, 24, { kind: "constant-current", currentA: 1 }).outcome).toBe("stage-off");
  });
});

describe("integrated switch protections along a supply profile", () => {
  it("the samples show the limit (load at I_lim·R) and the cut-off (load unpowered, counted as dropout)", () => {
    const stage = { ...base, currentLimitA: 2, overvoltageCutoffV: 20, tjMaxC: 250 };
    const profile = [
      { timeS: 0, voltageV: 6 },
      { timeS: 1, voltageV: 12 },
      { timeS: 2, voltageV: 24 },
    ];
    const r = alongProfile(stage, profile, { kind: "resistive", resistanceOhm: 2 }, 0, 25, { kind: "quasi-static" }, 4);
    const at = (t: number) => r.samples.find((x) => x.timeS === t);
    // 6 V into 2.05 Ω: 2.93 A > 2 A, already limiting: V_load = 2 A × 2 Ω = 4 V at every supply up to the cut-off
    expect(at(0)?.mode).toBe("current-limit");
    expect(at(1)?.loadV).toBeCloseTo(4, 12);
    expect(at(1)?.lossW).toBeCloseTo((12 - 4) * 2, 12);
    expect(at(2)?.mode).toBe("stage-off");
    expect(at(2)?.loadV).toBe(0);
    expect(r.minLoadV).toBe(0);
    // 24 V reached at t = 2 s only: the samples above 20 V (t > 1.667 s) are the dropout, one step of 0.25 s before the end
    expect(r.dropoutTimeS).toBeCloseTo(0.25, 12);
  });
});
