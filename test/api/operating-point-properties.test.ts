import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext } from "../helpers/app.js";

/** Every number anywhere in a value is finite (no NaN, no Infinity leaves the service). */
function allFinite(v: unknown): boolean {
  if (typeof v === "number") return Number.isFinite(v);
  if (Array.isArray(v)) return v.every(allFinite);
  if (v !== null && typeof v === "object") return Object.values(v).every(allFinite);
  return true;
}

const partIds = demoContext()
  .catalog.list()
  .map((p) => p.id);

describe("operatingPoint over random valid inputs (property, fast-check)", () => {
  const invoke = procedureInvoker(demoContext())("operatingPoint");
  it("always returns an explicit outcome with finite numbers", async () => {
    if (invoke === undefined) throw new Error("operatingPoint missing");
    const load = fc.oneof(
      fc.record({ kind: fc.constant("constant-current"), currentA: fc.double({ min: 0, max: 200, noNaN: true }) }),
      fc.record({ kind: fc.constant("resistive"), resistanceOhm: fc.double({ min: 1e-3, max: 1e6, noNaN: true }) }),
      fc.record({
        kind: fc.constant("constant-power"),
        powerW: fc.double({ min: 0.01, max: 5000, noNaN: true }),
        minVoltageV: fc.double({ min: 0, max: 50, noNaN: true }),
      }),
    );
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...partIds),
        fc.double({ min: 0.05, max: 200, noNaN: true }),
        fc.double({ min: 0, max: 2, noNaN: true }),
        load,
        fc.double({ min: -60, max: 150, noNaN: true }),
        async (partId, supplyV, sourceResistanceOhm, ld, ambientC) => {
          const r = (await invoke({
            stage: { kind: "catalog-part", partId },
            supplyV,
            sourceResistanceOhm,
            load: ld,
            ambientC,
          })) as { outcome: string };
          expect(typeof r.outcome).toBe("string");
          expect(allFinite(r)).toBe(true);
        },
      ),
      { numRuns: 1500, seed: 20261201 },
    );
  });

  it("a load above an integrated switch's current limit collapses, the answer naming the limit", async () => {
    if (invoke === undefined) throw new Error("operatingPoint missing");
    const r = (await invoke({
      stage: {
        kind: "integrated-switch",
        name: "limited switch",
        onResistanceOhm: 0.02,
        startV: 2.5,
        belowStart: "blocks",
        regulatedDropV: 0,
        quiescentA: 0,
        maxVoltageV: 60,
        currentLimitA: 4,
        tjMaxC: 150,
        thermal: { kind: "junction-ambient", rthJaKPerW: 10 },
      },
      supplyV: 12,
      load: { kind: "constant-current", currentA: 5 },
      ambientC: 25,
    })) as { outcome: string; currentLimitA?: number; reason?: string };
    expect(r.outcome).toBe("load-collapse");
    expect(r.currentLimitA).toBe(4);
    expect(r.reason).toContain("4 A current limit");
  });

  it("an integrated switch with a current limit and a cut-off: an explicit outcome with finite numbers", async () => {
    if (invoke === undefined) throw new Error("operatingPoint missing");
    await fc.assert(
      fc.asyncProperty(
        fc.double({ min: 0.05, max: 60, noNaN: true }),
        fc.double({ min: 0, max: 2, noNaN: true }),
        fc.oneof(
          fc.record({ kind: fc.constant("constant-current"), currentA: fc.double({ min: 0, max: 50, noNaN: true }) }),
          fc.record({ kind: fc.constant("resistive"), resistanceOhm: fc.double({ min: 1e-3, max: 1e6, noNaN: true }) }),
          fc.record({
            kind: fc.constant("constant-power"),
            powerW: fc.double({ min: 0.01, max: 2000, noNaN: true }),
            minVoltageV: fc.double({ min: 0, max: 50, noNaN: true }),
          }),
        ),
        fc.double({ min: 1e-3, max: 50, noNaN: true }),
        fc.double({ min: 1, max: 60, noNaN: true }),
        async (supplyV, sourceResistanceOhm, load, currentLimitA, overvoltageCutoffV) => {
          const r = (await invoke({
            stage: {
              kind: "integrated-switch",
              name: "property switch",
              onResistanceOhm: 0.02,
              startV: 2.5,
              belowStart: "blocks",
              regulatedDropV: 0,
              quiescentA: 2e-4,
              maxVoltageV: 60,
              currentLimitA,
              overvoltageCutoffV,
              overvoltageResponseS: 1e-5,
              tjMaxC: 150,
              thermal: { kind: "junction-ambient", rthJaKPerW: 55 },
            },
            supplyV,
            sourceResistanceOhm,
            load,
            ambientC: 25,
          })) as { outcome: string };
          expect(typeof r.outcome).toBe("string");
          expect(allFinite(r)).toBe(true);
        },
      ),
      { numRuns: 500, seed: 20261204 },
    );
  });
});
