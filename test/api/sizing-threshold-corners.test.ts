import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { verdictOfItems } from "../../domain/sizing/catalog-match.js";
import type { SpecItem } from "../../domain/sizing/spec-item.js";
import { demoContext } from "../helpers/app.js";
import { KNOWN_BAD } from "../known-bad/designs.js";

// Source: Vth(T) = Vth(25 °C) + k·(T − 25 °C), the threshold's linear law (docs/references.md,
// MOSFETs); the rule gate-overdrive-cold reads gateOverdriveColdV > 0 (rulesets/default.json).
// The known-bad cold rail: a P-FET, Vth 1.5 V typical, k = −6 mV/K, on a 3.3 V rail down to 2.7 V,
// ambient −40 °C (designs.ts, pfet-below-threshold-when-cold).
const K = -0.006;
const T_MIN_C = -40;
const ctx = demoContext();
const call = async (name: string, input: unknown) => {
  const f = procedureInvoker(ctx)(name);
  if (f === undefined) throw new Error(`${name} missing`);
  return f(input);
};
type Cand = { stage: unknown; datasheetMax: Record<string, unknown> };
const design = (thresholdMaxV: number) => {
  const d = KNOWN_BAD.find((x) => x.id === "pfet-below-threshold-when-cold");
  if (d === undefined) throw new Error("design missing");
  const twin = d.twin as { requirement: unknown; candidates: Cand[] };
  const c = twin.candidates[0];
  if (c === undefined) throw new Error("candidate missing");
  return {
    requirement: twin.requirement,
    stage: c.stage,
    datasheetMax: { ...c.datasheetMax, thresholdV: thresholdMaxV },
  };
};
type Spec = { specifications: { items: SpecItem[] }[]; assumptions: string[] };
const sized = async (thresholdMaxV: number) => {
  const d = design(thresholdMaxV);
  const out = (await call("sizing.spec", {
    requirement: d.requirement,
    templates: [{ stage: d.stage, datasheetMax: d.datasheetMax }],
  })) as Spec;
  const items = out.specifications[0]?.items ?? [];
  const line = items.find((i) => i.id === "gateOverdriveColdMinV");
  if (line === undefined) throw new Error("no gateOverdriveColdMinV line");
  return { out, items, line };
};
const driveOf = async (thresholdMaxV: number) => {
  const d = design(thresholdMaxV);
  const r = (await call("review", {
    requirement: d.requirement,
    candidates: [{ stage: d.stage, datasheetMax: d.datasheetMax }],
  })) as { candidates: { metrics: Record<string, number> }[] };
  const drive = r.candidates[0]?.metrics["gateDriveMinV"];
  if (drive === undefined) throw new Error("no gateDriveMinV");
  return drive;
};

describe("sizing takes the review's gate threshold corners", () => {
  it("a part passing at the typical Vth but not at Vth(max) = 2.4 V at −40 °C is not proposed: Vgs − (Vth_max + k·(Tmin − 25)) < 0", async () => {
    const drive = await driveOf(2.4);
    const closedForm = drive - (2.4 + K * (T_MIN_C - 25));
    // At the typical 1.5 V it would pass: drive − 1.89 V > 0.
    expect(drive - (1.5 + K * (T_MIN_C - 25))).toBeGreaterThan(0);
    expect(closedForm).toBeLessThan(0);
    const { line, items, out } = await sized(2.4);
    expect(line.source?.kind === "rule" ? line.source.ruleId : undefined).toBe("gate-overdrive-cold");
    expect(line.value).toBeCloseTo(0, 9);
    expect(line.templateValue).toBeCloseTo(closedForm, 9);
    expect(line.meets).toBe(false);
    // The catalog's verdict of the same lines (domain/sizing/catalog-match.ts): a fail, not proposed.
    expect(verdictOfItems(items).verdict).toBe("fail");
    expect(
      out.assumptions.some((a) =>
        /templates\.0: gate threshold corners: the cold gate overdrive \(gateOverdriveColdV\) at Vth\(max\) 2\.4 V \(datasheetMax\.thresholdV\), moved by -0\.006 V\/K to the coldest ambient -40 °C: 2\.79 V there; a turn-off event at the typical Vth 1\.5 V/.test(
          a,
        ),
      ),
    ).toBe(true);
  });

  it("the twin's Vth(max) 2.0 V meets the line with the closed-form margin", async () => {
    const drive = await driveOf(2.0);
    const { line } = await sized(2.0);
    expect(line.meets).toBe(true);
    expect(line.templateValue).toBeCloseTo(drive - (2.0 + K * (T_MIN_C - 25)), 9);
  });

  it("the turn-off event's Vth(min) is the review's: said in assumptions, and refused above the typical value naming the field", async () => {
    const requirement = {
      supply: { class: "vehicle-24v-f" },
      load: { kind: "constant-current", currentA: 10 },
      ambient: { minC: -40, maxC: 85 },
      transients: [],
    };
    const turnOff = {
      loop: { resistanceOhm: 0.02, inductanceH: 1e-6 },
      capacitor: { capacitanceF: 470e-6, esrOhm: 0.03 },
      peakReverseCurrentMaxA: 50,
    };
    const template = (thresholdMinV: number) => ({
      stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
      datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, thresholdMinV },
    });
    const out = (await call("sizing.spec", { requirement, templates: [template(1.2)], turnOff })) as Spec;
    expect(
      out.assumptions.some((a) =>
        /templates\.0: .*a turn-off event at Vth\(min\) 1\.2 V \(datasheetMax\.thresholdMinV\)/.test(a),
      ),
    ).toBe(true);
    await expect(call("sizing.spec", { requirement, templates: [template(2.5)], turnOff })).rejects.toThrow(
      /above the stage's typical MOSFET gate threshold 2 V/,
    );
  });
});
