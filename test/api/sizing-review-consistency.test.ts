import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { sizingCatalogOutput } from "../../contracts/sizing.js";
import catalogExample from "../../examples/requests/sizing.catalog.json" with { type: "json" };
import specExample from "../../examples/requests/sizing.spec.json" with { type: "json" };
import { demoContext } from "../helpers/app.js";

// Soundness of sizing against the review (the procedure a release gate reads): over the demo
// catalog and a set of requirements, a part that sizing.catalog proposes (pass or warn) is never
// failed by the review of the same part on the same requirement at the same corner (its own
// datasheetMax). A part whose turn-off timing is unknown is "incomplete" in sizing and refused by
// the review, naming the field.
const ctx = demoContext();
const call = async (name: string, input: unknown) => {
  const f = procedureInvoker(ctx)(name);
  if (f === undefined) throw new Error(`${name} missing`);
  return f(input);
};
const event = (inputAfterV: number, gate: string, extra: Record<string, unknown> = {}) => ({
  loop: { resistanceOhm: "40 mOhm", inductanceH: "1 uH" },
  capacitor: { capacitanceF: "1000 uF", esrOhm: "10 mOhm" },
  outputV: 12,
  inputAfterV,
  gateLag: { resistanceOhm: gate, gateChargeC: "30 nC", atGateSourceV: "10 V" },
  loadReverseLimitV: "0.5 V",
  ...extra,
});
const base12 = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 1 },
  loadMinV: 6,
  ambient: { minC: -40, maxC: 85 },
  lossBudgetW: 1,
};
const REQUIREMENTS: Record<string, unknown> = {
  "sizing.catalog example": catalogExample.input.requirement,
  "sizing.spec example": specExample.input.requirement,
  "12 V, the class's pulses": base12,
  "12 V, a 0 V short": { ...base12, transients: [], turnOff: event(0, "10 kOhm") },
  "12 V, -14 V behind a 10 kOhm gate": { ...base12, transients: [], turnOff: event(-14, "10 kOhm") },
  "12 V, -14 V behind a 100 ohm gate": { ...base12, transients: [], turnOff: event(-14, "100 Ohm") },
  "12 V, a decay to -14 V, repeated": {
    ...base12,
    transients: [],
    turnOff: event(-14, "10 kOhm", {
      inputDecay: { startV: 0, timeConstantS: "50 us" },
      repetition: { periodS: 1, count: 10 },
    }),
  },
  "12 V, pulse 1 through the P-FET": { ...base12, transients: ["iso7637-2-pulse-1-12v"], turnOff: event(0, "10 kOhm") },
};

type Review = { candidates: { verdict: string; rankReason: string }[] };

describe("sizing never proposes a part the review fails (demo catalog)", () => {
  it.each(Object.entries(REQUIREMENTS))("%s", async (_name, requirement) => {
    const out = sizingCatalogOutput.parse(await call("sizing.catalog", { requirement }));
    expect(out.parts.length).toBe(ctx.catalog.list().length);
    for (const p of out.parts) {
      const dm = ctx.catalog.find(p.partId)?.datasheetMax;
      const candidate = { stage: { kind: "catalog-part", partId: p.partId }, ...(dm ? { datasheetMax: dm } : {}) };
      const run = call("review", { requirement, candidates: [candidate] });
      if (p.items.some((i) => i.id === "turnOffEvent")) {
        expect(p.verdict === "incomplete" || p.verdict === "fail").toBe(true);
        await expect(run).rejects.toMatchObject({
          cause: { issues: [{ path: ["requirement", "turnOff", "timing"] }] },
        });
        continue;
      }
      const r = ((await run) as Review).candidates[0];
      const proposed = p.verdict === "pass" || p.verdict === "warn";
      if (proposed && r?.verdict === "fail")
        throw new Error(`${p.partId}: sizing ${p.reason}, but the review fails it: ${r.rankReason}`);
      if (p.verdict === "pass") expect(r?.verdict).not.toBe("incomplete");
    }
  });

  it("the set is not vacuous: sizing proposes parts and the review fails others", async () => {
    let proposed = 0;
    let failed = 0;
    for (const requirement of Object.values(REQUIREMENTS)) {
      const out = sizingCatalogOutput.parse(await call("sizing.catalog", { requirement }));
      proposed += out.parts.filter((p) => p.verdict === "pass").length;
      failed += out.parts.filter((p) => p.verdict === "fail").length;
    }
    expect(proposed).toBeGreaterThan(5);
    expect(failed).toBeGreaterThan(5);
  });
});
