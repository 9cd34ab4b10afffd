import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { demoContext } from "../helpers/app.js";
import { KNOWN_BAD } from "./designs.js";

// The MOSFET-stress designs are each bad for their one effect alone. The hot-start avalanche
// design: its energy is within the 25 °C rating and above that rating derated to the event's
// 150 °C, by the closed form EAS·(Tjmax − Tj)/(Tjmax − 25) = 1 mJ·25/150 (common practice,
// docs/references.md "MOSFETs"). The cold-breakdown design: below.
type Clamp = {
  absorbedJ: number;
  avalancheRatingJ: number;
  avalancheRatingAtTjJ: number;
  withinAvalancheRating: boolean;
};
type Out = {
  candidates: {
    turnOff: { tjC: number; event: { outcome: string; clamp?: Clamp; metrics: Record<string, number> } };
  }[];
};

/** The review of a known-bad design's bad variant (under a rule set when given). */
async function reviewBad(id: string, ruleSet?: string): Promise<unknown> {
  const d = KNOWN_BAD.find((x) => x.id === id);
  if (d === undefined) throw new Error(`design ${id} missing`);
  const call = procedureInvoker(demoContext())("review");
  if (call === undefined) throw new Error("no review");
  return call(ruleSet === undefined ? d.bad : { ...d.bad, ruleSet });
}

describe("ideal-diode-avalanche-energy-hot-start", () => {
  it("absorbs less than EAS at 25 °C and more than EAS derated to 150 °C; the result reports both", async () => {
    const out = (await reviewBad("ideal-diode-avalanche-energy-hot-start")) as Out;
    const t = out.candidates[0]?.turnOff;
    expect(t?.tjC).toBe(150);
    const c = t?.event.clamp;
    if (c === undefined) throw new Error("no clamp phase");
    const derated = (1e-3 * (175 - 150)) / (175 - 25);
    expect(c.absorbedJ).toBeLessThan(1e-3);
    expect(c.absorbedJ).toBeGreaterThan(derated);
    expect(c.avalancheRatingJ).toBe(1e-3);
    expect(c.avalancheRatingAtTjJ).toBeCloseTo(derated, 15);
    expect(c.withinAvalancheRating).toBe(false);
    expect(t?.event.metrics["avalancheEnergyRatio"]).toBeCloseTo(c.absorbedJ / derated, 12);
  });
});

describe("ideal-diode-vds-breakdown-cold", () => {
  it("stresses the MOSFET within its 25 °C rating and above its breakdown at −40 °C (default set)", async () => {
    const out = (await reviewBad("ideal-diode-vds-breakdown-cold", "default")) as {
      candidates: { metrics: Record<string, number>; rules: { verdicts: { ruleId: string; outcome: string }[] } }[];
    };
    const c = out.candidates[0];
    if (c === undefined) throw new Error("no candidate");
    // Closed form: 60 V·(1 + 0.001·(−40 − 25)) = 56.1 V.
    expect(c.metrics["vdsBreakdownColdV"]).toBeCloseTo(56.1, 12);
    const seen = c.metrics["reverseTransientVMaxV"] as number;
    expect(seen).toBeGreaterThan(56.1);
    expect(seen).toBeLessThan(60);
    expect(c.rules.verdicts.find((v) => v.ruleId === "fet-vds-reverse-transient")?.outcome).toBe("pass");
    expect(c.rules.verdicts.find((v) => v.ruleId === "fet-vds-reverse-transient-cold")?.outcome).toBe("fail");
  });
});
