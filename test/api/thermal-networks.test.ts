import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { toStageModel } from "../../api/map/stage-model.js";
import { transientThermalOf } from "../../api/map/transient-thermal.js";
import { transientThermal } from "../../contracts/review.js";
import { stageSpec } from "../../contracts/stage.js";
import { cauerToFoster } from "../../domain/physics/cauer.js";
import { zthKPerW } from "../../domain/physics/foster.js";
import { demoContext } from "../helpers/app.js";

// Sources: conservation at t → ∞ (a network's ΣR is the steady path it stands for), and the
// cascade of a junction-case network with the case-to-ambient node checked against ngspice in
// test/domain/thermal-networks.test.ts (docs/references.md, Thermal).
const parts = JSON.parse(readFileSync(join(projectRoot(), "examples", "catalog", "demo-parts.json"), "utf8")) as {
  parts: { id: string; stage: Record<string, unknown> }[];
};
const pfet = parts.parts.find((p) => p.id === "demo-pfet-40v-12mohm")?.stage as Record<string, unknown>;
const thermal = { kind: "junction-ambient" as const, rthJaKPerW: 45 };
const model = toStageModel(stageSpec.parse({ ...pfet, thermal }), thermal, ["stage"], []);
const map = (t: unknown, assumptions: string[] = []) =>
  transientThermalOf(transientThermal.parse(t), model, ["candidates", 0, "transientThermal"], assumptions);
const terms = (t: ReturnType<typeof map>) => (t.kind === "foster" ? t.terms : []);

describe("transient thermal networks against the steady path", () => {
  it("refuses a junction-ambient Foster network whose ΣR (2 K/W) is not the 45 K/W path, naming the field", () => {
    expect(() =>
      map({
        kind: "foster",
        terms: [
          { rKPerW: 0.5, tauS: 1e-3 },
          { rKPerW: 1.5, tauS: 0.1 },
        ],
      }),
    ).toThrow(
      /candidates\.0\.transientThermal\.terms: the network's ΣR = 2 K\/W is not the stage's junction-to-ambient thermal path 45 K\/W.*scope "junction-case"/,
    );
  });
  it("accepts a network within 5 % of the path", () => {
    expect(
      terms(
        map({
          kind: "foster",
          terms: [
            { rKPerW: 3, tauS: 0.01 },
            { rKPerW: 40, tauS: 30 },
          ],
        }),
      ),
    ).toHaveLength(2);
  });
  it("cascades a junction-case Foster network with one case-to-ambient term (ΣR = the path; upper-bound sentence)", () => {
    const assumptions: string[] = [];
    const out = terms(
      map(
        {
          kind: "foster",
          terms: [
            { rKPerW: 0.5, tauS: 1e-3 },
            { rKPerW: 1.5, tauS: 0.1 },
          ],
          scope: "junction-case",
          caseToAmbientHeatCapacityJPerK: 4,
        },
        assumptions,
      ),
    );
    expect(out.reduce((s, x) => s + x.rKPerW, 0)).toBeCloseTo(45, 9);
    expect(out[2]).toEqual({ rKPerW: 43, tauS: 172 });
    expect(assumptions.join(" ")).toMatch(/upper bound/);
  });
  it("a junction-case network needs the rest of the path's heat capacity (field named)", () => {
    expect(() => map({ kind: "foster", terms: [{ rKPerW: 2, tauS: 0.1 }], scope: "junction-case" })).toThrow(
      /caseToAmbientHeatCapacityJPerK/,
    );
  });
  it("a Cauer ladder is taken as its Foster equivalent, and a junction-case ladder gains the case node exactly", () => {
    const stages = [
      { rKPerW: 0.5, cJPerK: 0.01 },
      { rKPerW: 1.5, cJPerK: 0.3 },
    ];
    const out = terms(map({ kind: "cauer", stages, scope: "junction-case", caseToAmbientHeatCapacityJPerK: 4 }));
    const ladder = cauerToFoster([...stages, { rKPerW: 43, cJPerK: 4 }]);
    for (const t of [1e-3, 0.1, 10, 1000]) expect(zthKPerW(out, t)).toBeCloseTo(zthKPerW(ladder, t), 9);
    expect(() => map({ kind: "cauer", stages })).toThrow(/transientThermal\.stages: the network's ΣR = 2 K\/W/);
  });
});

describe("through the review procedure (the batch and HTTP invoker)", () => {
  const example = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
    input: { requirement: Record<string, unknown>; candidates: Record<string, unknown>[] };
  };
  const { monteCarlo: _mc, ...plain } = example.input as Record<string, unknown>;
  const withThermal = (transient: unknown) => ({
    ...plain,
    candidates: [
      { stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" }, transientThermal: transient },
    ],
  });
  const invoke = procedureInvoker(demoContext())("review");
  it("a Foster network of ΣR 2 K/W on the 45 K/W path is refused with the field's path", async () => {
    if (invoke === undefined) throw new Error("no review");
    await expect(invoke(withThermal({ kind: "foster", terms: [{ rKPerW: 2, tauS: 0.1 }] }))).rejects.toThrow(
      /candidates\.0\.transientThermal\.terms/,
    );
  });
  it("a Cauer ladder and its Foster equivalent give the same start-up result", async () => {
    if (invoke === undefined) throw new Error("no review");
    const stages = [
      { rKPerW: 2, cJPerK: 0.005 },
      { rKPerW: 13, cJPerK: 0.08 },
      { rKPerW: 30, cJPerK: 2 },
    ];
    const foster = cauerToFoster(stages);
    const a = JSON.stringify(
      ((await invoke(withThermal({ kind: "cauer", stages }))) as { candidates: { startUp?: unknown }[] }).candidates[0]
        ?.startUp,
    );
    const b = JSON.stringify(
      ((await invoke(withThermal({ kind: "foster", terms: foster }))) as { candidates: { startUp?: unknown }[] })
        .candidates[0]?.startUp,
    );
    expect(a).toBeDefined();
    expect(a).toBe(b);
  });
});
