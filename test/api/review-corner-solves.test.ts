import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { reviewOutput } from "../../contracts/review.js";
import { demoContext } from "../helpers/app.js";

// A corner without an operating point fails the set by name (rule corner-solves): an integrated
// switch limiting at 6 A ahead of a 48 W constant-power load. Where the load needs more than the
// limit, I = P/V_load > 6 A, i.e. V_load < 8 V, the load collapses (no operating point); the corner
// rules (tj-limit, load-voltage-min, ...) stay unavailable there, as before, so without the new
// rule the set could only say incomplete.

const review = procedureInvoker(demoContext())("review");
const input = (currentLimitA: number) => ({
  requirement: {
    supply: { class: "vehicle-12v-b" },
    load: { kind: "constant-power", powerW: 48, minVoltageV: 5 },
    ambient: { minC: -40, maxC: 85 },
    transients: [],
  },
  candidates: [
    {
      stage: {
        kind: "integrated-switch",
        name: "test integrated switch",
        onResistanceOhm: "25 mOhm",
        startV: 2.5,
        belowStart: "blocks",
        regulatedDropV: "15 mV",
        quiescentA: "0.2 mA",
        maxVoltageV: 60,
        currentLimitA,
        tjMaxC: 150,
        thermal: { kind: "junction-ambient", rthJaKPerW: 10 },
        reverseRatingV: 60,
      },
    },
  ],
  ruleSet: "default",
});

describe("rule corner-solves through the review", () => {
  it("fails where corners have no operating point, naming each corner and why; the corner rules stay unavailable", async () => {
    if (review === undefined) throw new Error("review missing");
    const r = reviewOutput.parse(await review(input(6)));
    const c = r.candidates[0];
    if (c === undefined || c.rules === undefined) throw new Error("no candidate verdicts");
    const missing = c.worst.cornersWithoutOperatingPoint;
    expect(missing.length).toBeGreaterThan(0);
    expect(missing.length).toBeLessThan(c.corners.length);
    expect(missing.map((m) => m.corner)).toEqual(c.worst.unsolvedCorners);
    for (const m of missing) {
      const row = c.corners[m.corner];
      expect(row?.outcome).toBe(m.outcome);
      expect(row?.reason).toBe(m.reason);
      expect(m.name).toContain(`supply ${row?.conditions.supply} ${row?.conditions.supplyV} V`);
      // the closed form: the corner's load would need more than the 6 A limit at the supply
      expect((48 * (row?.conditions.loadScale ?? 0)) / (row?.conditions.supplyV ?? 1)).toBeGreaterThan(6 * 0.99);
    }
    const byId = new Map(c.rules.verdicts.map((v) => [v.ruleId, v]));
    const cs = byId.get("corner-solves");
    expect(cs?.outcome).toBe("fail");
    expect(cs?.values).toEqual({ cornersWithoutOperatingPoint: missing.length });
    expect(byId.get("tj-limit")?.outcome).toBe("not-applicable");
    expect(byId.get("tj-limit")?.reason).toMatch(/has no operating point/);
    expect(c.rules.outcome).toBe("fail");
    expect(c.verdict).toBe("fail");
  });

  it("passes with a limit that carries the load at every corner (10 A)", async () => {
    if (review === undefined) throw new Error("review missing");
    const r = reviewOutput.parse(await review(input(10)));
    const c = r.candidates[0];
    if (c === undefined || c.rules === undefined) throw new Error("no candidate verdicts");
    expect(c.worst.cornersWithoutOperatingPoint).toEqual([]);
    expect(c.rules.verdicts.find((v) => v.ruleId === "corner-solves")?.outcome).toBe("pass");
  });
});
