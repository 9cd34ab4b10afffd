import { describe, expect, it } from "vitest";
import { type OperatingPointModel, solveOperatingPoint } from "../../../domain/solve/electrothermal-point.js";
import { idealDiode } from "../../helpers/stages.js";

/**
 * A controller that starts at 4 V at its input, behind 1 Ω of source resistance, into 2 Ω. Running,
 * it lets I ≈ Vs/3 through and its input sits at about 2·Vs/3; below start its body diode drops
 * ~0.65 V and the input sits at about (2·Vs + 0.65)/3. Between Vs ≈ 5.7 V and 6 V neither state
 * holds its own input on the right side of the threshold (a real controller may chatter there).
 * Checks: the mode never flips back as the supply rises, the reported point is the one below start
 * until the running point keeps its input at the start voltage, and the junction obeys the
 * steady-state energy balance Tj = Ta + Rth·P (conservation; closed form).
 */
describe("an ideal-diode controller at its start threshold", () => {
  const stage = idealDiode(0.005, {
    startV: 4,
    regulatedDropV: 0.02,
    rth: 50,
    tempLaw: { law: "power", exponent: 2.3 },
  });
  const at = (supplyV: number) => {
    const m: OperatingPointModel = {
      stage,
      supplyV,
      sourceResistanceOhm: 1,
      load: { kind: "resistive", resistanceOhm: 2 },
      ambientC: 25,
      rthKPerW: 50,
    };
    const r = solveOperatingPoint(m);
    if (!("point" in r)) throw new Error(`${supplyV} V: ${r.outcome}`);
    return r.point;
  };
  const supplies = Array.from({ length: 401 }, (_, k) => 5 + k * 0.005);

  it("changes mode once, from body diode to running, as the supply rises", () => {
    const running = supplies.map((v) => at(v).forward.mode !== "body-diode");
    const firstOn = running.indexOf(true);
    expect(firstOn).toBeGreaterThan(0);
    expect(running.slice(firstOn).every((x) => x)).toBe(true);
    // running is reported only where it keeps its own input at the start voltage or above
    for (const v of supplies) {
      const p = at(v);
      if (p.forward.mode !== "body-diode") expect(p.stageInputV).toBeGreaterThanOrEqual(4);
    }
    // and the change sits where the running point's input reaches 4 V: Vs·2/3 + 0.02/3 ≈ 4 → ≈ 5.99 V
    const vOn = supplies[firstOn] as number;
    expect(vOn).toBeGreaterThan(5.9);
    expect(vOn).toBeLessThan(6.1);
  });

  it("puts the junction at Ta + Rth·P on both sides of the threshold", () => {
    for (const v of supplies) {
      const p = at(v);
      expect(Math.abs(p.tjC - (25 + 50 * p.dieLossW)), `${v} V, ${p.forward.mode}`).toBeLessThan(1e-6);
    }
  });

  it("flags the chatter band: running pulls the input below start, below start it sits above", () => {
    // Closed form of the band (above): the below-start input (2·Vs + Vf)/3 ≥ 4 V and the running
    // input ≈ 2·Vs/3 < 4 V, so about 5.7 V ≤ Vs < 6 V; outside it the state is self-consistent.
    expect(at(5.5).startChatter).toBeUndefined();
    expect(at(6.1).startChatter).toBeUndefined();
    const p = at(5.85);
    expect(p.forward.mode).toBe("body-diode");
    const c = p.startChatter;
    expect(c).toBeDefined();
    if (c === undefined) return;
    expect(c.startV).toBe(4);
    expect(c.belowStartInputV).toBe(p.stageInputV);
    expect(c.belowStartInputV).toBeGreaterThanOrEqual(4);
    expect(c.runningInputV).toBeLessThan(4);
    expect(Math.abs(c.runningInputV - (2 * 5.85) / 3)).toBeLessThan(0.02);
    for (const v of supplies) {
      const q = at(v);
      if (q.startChatter !== undefined) expect(q.forward.mode, `${v} V`).toBe("body-diode");
    }
  });
});
