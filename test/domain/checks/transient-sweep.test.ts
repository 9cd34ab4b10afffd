import { describe, expect, it } from "vitest";
import { clampExponential, tauFromDecay } from "../../../domain/checks/clamp-energy.js";
import { SWEEP_RI_POINTS, SWEEP_TD_POINTS, sweptTransientStress } from "../../../domain/checks/transient-sweep.js";
import { transientStress } from "../../../domain/checks/transient-stress.js";
import { findTransient, type TransientPulse } from "../../../domain/review/transient-library.js";
import type { StageModel } from "../../../domain/stages/stage-model.js";
import { idealDiode } from "../../helpers/stages.js";

const pulseOf = (id: string): TransientPulse => {
  const p = findTransient(id);
  if (p === undefined) throw new Error(id);
  return p;
};
const ctx = {
  supplyNominalV: 13.5,
  supplyMaxV: 16,
  reverseV: 14,
  outputHeldV: 13.5,
  deratingFactor: 0.8,
  clampToStandoffRatio: 1.3,
  overvoltageV: 24,
};
const stage = idealDiode(0.003) as StageModel;

describe("load dump A swept over the standard's Ri and td ranges", () => {
  const pulse = pulseOf("iso16750-2-load-dump-a-12v");
  const clamp = { standoffV: 26, clampV: 40 };
  const results = sweptTransientStress(stage, pulse, { ...ctx, inputClamp: clamp });
  const worst = (f: string) => results.find((r) => r.sweep?.worstOf.includes(f as never));

  it("puts the clamp's worst energy and peak current at the lowest Ri (the longest td for energy), the worst input peak at the highest Ri", () => {
    // ISO 16750-2 test A, 12 V: Us 79-101 V paired with Ri 0.5-4 ohm, td 40-400 ms, UA 14 V (docs/references.md).
    const e = worst("clampEnergyJ");
    expect(e?.sweep?.sourceResistanceOhm).toBe(0.5);
    expect(e?.sweep?.decayS).toBeCloseTo(0.4, 12);
    expect(e?.sweep?.peakOpenCircuitV).toBeCloseTo(79, 12);
    expect(worst("clampPeakCurrentA")?.sweep?.sourceResistanceOhm).toBe(0.5);
    expect(e?.sweep?.points).toBe(SWEEP_RI_POINTS * SWEEP_TD_POINTS);
    // Without the design clamp, the open-circuit peak is worst at Ri 4 ohm, Us 101 V.
    const bare = sweptTransientStress(stage, pulse, ctx).find((r) => r.sweep?.worstOf.includes("inputPeakV"));
    expect(bare?.sweep?.sourceResistanceOhm).toBe(4);
    expect(bare?.inputPeakV).toBeCloseTo(101, 12);
  });

  it("reports the closed form at the worst point (E = Vc*Q, Ipk = (Us - Vc)/Ri) and the low-Ri energy is about 4x the severe-corner pulse's", () => {
    const e = worst("clampEnergyJ");
    if (e?.designClamp?.duty.conducts !== true) throw new Error("the clamp conducts");
    const closed = clampExponential(
      {
        baseV: 14,
        amplitudeV: 79 - 14,
        tauS: tauFromDecay(0.4, "to-10-percent"),
        sourceResistanceOhm: 0.5,
        riseS: 10e-3,
      },
      40,
    );
    if (closed.conducts !== true) throw new Error("closed form conducts");
    expect(e.designClamp.duty.energyJ).toBeCloseTo(closed.energyJ, 9);
    expect(e.designClamp.duty.peakCurrentA).toBeCloseTo((79 - 40) / 0.5, 9);
    // The single severe-corner pulse (Us 101 V, Ri 4 ohm) understates the clamp's energy.
    const corner = transientStress(stage, pulse, { ...ctx, inputClamp: clamp });
    if (corner.designClamp?.duty.conducts !== true) throw new Error("corner conducts");
    expect(e.designClamp.duty.energyJ / corner.designClamp.duty.energyJ).toBeGreaterThan(3);
  });

  it("no grid point exceeds the reported worst (brute force over a finer grid stays within the grid's resolution)", () => {
    const e = worst("clampEnergyJ");
    if (e?.designClamp?.duty.conducts !== true) throw new Error("conducts");
    let finest = 0;
    for (let i = 0; i <= 40; i += 1) {
      const ri = 0.5 + (3.5 * i) / 40;
      const peak = 79 + 22 * ((ri - 0.5) / 3.5);
      const d = clampExponential(
        {
          baseV: 14,
          amplitudeV: peak - 14,
          tauS: tauFromDecay(0.4, "to-10-percent"),
          sourceResistanceOhm: ri,
          riseS: 10e-3,
        },
        40,
      );
      if (d.conducts === true) finest = Math.max(finest, d.energyJ);
    }
    expect(finest).toBeCloseTo(e.designClamp.duty.energyJ, 9);
  });
});

describe("IEC 61000-4-5 surge on a DC power port", () => {
  it("drives the combination wave's short-circuit current Voc/2 ohm (1 kV: 500 A) less Vc/Z into a clamp", () => {
    // IEC 61000-4-5: effective output impedance = open-circuit peak / short-circuit peak = 2 ohm (docs/references.md).
    const pulse = pulseOf("iec61000-4-5-surge-1kv-line-line");
    const r = transientStress(stage, pulse, {
      ...ctx,
      supplyNominalV: 24,
      supplyMaxV: 28.8,
      inputClamp: { standoffV: 33, clampV: 53 },
    });
    if (r.designClamp?.duty.conducts !== true) throw new Error("conducts");
    expect(r.designClamp.duty.peakCurrentA).toBeCloseTo((1000 - (53 - 24)) / 2, 9);
    expect(r.inputPeakV).toBe(53);
    // Exponential tail to half value at 20 us: tau = 20 us / ln 2.
    expect(r.tauS).toBeCloseTo(20e-6 / Math.LN2, 15);
    const earth = transientStress(stage, pulseOf("iec61000-4-5-surge-1kv-line-earth"), {
      ...ctx,
      supplyNominalV: 24,
      supplyMaxV: 28.8,
      inputClamp: { standoffV: 33, clampV: 53 },
    });
    if (earth.designClamp?.duty.conducts !== true) throw new Error("conducts");
    expect(earth.designClamp.duty.peakCurrentA).toBeCloseTo((1000 - 29) / 12, 9);
  });
  it("a negative surge stresses the blocking element", () => {
    const r = transientStress(stage, pulseOf("iec61000-4-5-surge-0.5kv-line-line-negative"), {
      ...ctx,
      supplyNominalV: 24,
      supplyMaxV: 28.8,
    });
    expect(r.polarity).toBe("negative");
    expect(r.stresses[0]?.seenV).toBeCloseTo(500 - 24 + 13.5, 9);
  });
});
