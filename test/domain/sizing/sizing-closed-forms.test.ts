import { describe, expect, it } from "vitest";
import { requirement as requirementSchema } from "../../../contracts/requirement.js";
import { reverseSteady } from "../../../domain/checks/reverse-steady.js";
import { JUNCTION_DEFAULTS } from "../../../domain/physics/diode.js";
import { builtInRuleSetStore } from "../../../domain/rules/built-in-sets.js";
import { forwardLimit } from "../../../domain/sizing/forward-limit.js";
import { leakageLimit } from "../../../domain/sizing/leakage-limit.js";
import { turnOffDelayLimits } from "../../../domain/sizing/turn-off-delay.js";
import type { DiodeStage, StageModel } from "../../../domain/stages/stage-model.js";
import { toReviewRequirement } from "../../../api/map/requirement.js";
import { sizingContext, type TurnOffRequest } from "../../../api/map/sizing-context.js";
import { siBodyDiode } from "../../helpers/stages.js";
import { relativeError } from "../../helpers/tolerance.js";

const rules = (() => {
  const r = builtInRuleSetStore().get("default");
  if (!r.ok) throw new Error("no default rule set");
  return r.set;
})();

/** A sizing context as the procedures build it, from a contract requirement. */
function context(
  raw: unknown,
  stage: StageModel,
  turnOff?: TurnOffRequest,
  spec: Record<string, unknown> = { kind: stage.kind },
) {
  const r = requirementSchema.parse(raw);
  const req = toReviewRequirement(r, []);
  return sizingContext(r, req, rules, { spec: spec as never, model: stage }, {}, turnOff);
}

const fixed12 = {
  supply: { class: "custom", minV: 12, nominalV: 12, maxV: 12 },
  loadLevels: [1],
  transients: [],
  reverse: { voltageV: 12, durationS: 60 },
};

describe("largest Rds(on): closed form of the self-heating equation", () => {
  // Closed form (docs/references.md, linear coefficient a): Tj = (Ta + I²·R25·Rth·(1 − 25a)) / (1 − I²·R25·Rth·a).
  // Solved for R25 at Tj = the rule's limit: R25 = (Tj − Ta) / (I²·Rth·(1 + a·(Tj − 25))).
  it.each([
    { a: 0.005, rth: 30, ta: 85, i: 10 },
    { a: 0.004, rth: 60, ta: 40, i: 3 },
    { a: 0.007, rth: 12, ta: 105, i: 20 },
  ])("a = $a /K, Rth = $rth K/W, Ta = $ta °C, I = $i A", ({ a, rth, ta, i }) => {
    const law = {
      law: "points" as const,
      points: [
        { tempK: 273.15 - 60, factor: 1 + a * -85 },
        { tempK: 273.15 + 300, factor: 1 + a * 275 },
      ],
    };
    const stage: StageModel = {
      kind: "nfet-low-side",
      mosfet: {
        channel: { rdsOnPoints: [{ gateSourceV: 3, rdsOnOhm: 0.01 }], thresholdV: 2, tempLaw: law },
        // A body diode that takes no share of the current (the closed form has the channel alone).
        bodyDiode: { ...siBodyDiode, saturationCurrentA: 1e-24 },
        vdsMaxV: 60,
        vgsMaxV: 20,
        tjMaxC: 175,
      },
      thermal: { kind: "junction-ambient", rthJaKPerW: rth },
    };
    const ctx = context(
      { ...fixed12, load: { kind: "constant-current", currentA: i }, ambient: { minC: ta, maxC: ta } },
      stage,
    );
    const r = forwardLimit(ctx, stage, ctx.assess(stage), "rdsOn");
    const tj = 175 - 25; // rule tj-margin of the default set
    const expected = (tj - ta) / (i * i * rth * (1 + a * (tj - 25)));
    expect(r.item.outcome).toBe("limit");
    expect(r.item.source?.kind === "rule" ? r.item.source.ruleId : "").toBe("tj-margin");
    expect(relativeError(r.item.value ?? 0, expected)).toBeLessThan(1e-6);
  });

  it("impossible when the ambient alone is above the junction target: a reason, no number", () => {
    const stage: StageModel = {
      kind: "nfet-low-side",
      mosfet: {
        channel: {
          rdsOnPoints: [{ gateSourceV: 3, rdsOnOhm: 0.01 }],
          thresholdV: 2,
          tempLaw: { law: "power", exponent: 2.3 },
        },
        bodyDiode: siBodyDiode,
        vdsMaxV: 60,
        vgsMaxV: 20,
        tjMaxC: 175,
      },
      thermal: { kind: "junction-ambient", rthJaKPerW: 20 },
    };
    const ctx = context(
      { ...fixed12, load: { kind: "constant-current", currentA: 5 }, ambient: { minC: 155, maxC: 155 } },
      stage,
    );
    const r = forwardLimit(ctx, stage, ctx.assess(stage), "rdsOn");
    expect(r.item.outcome).toBe("impossible");
    expect(r.item.value).toBeUndefined();
    expect(r.item.reason).toContain("155 °C ambient alone reaches the 150 °C junction limit");
  });
});

describe("longest turn-off delay: the exact series R-L-C response solved for time", () => {
  // Textbook under-damped series R-L-C with a constant-current load I, input shorted at t = 0,
  // i(0) = I, v_C(0) = V0: i(t) = I − (R·I + V0)/(L·ω)·e^(−αt)·sin(ωt), α = R/2L, ω = √(1/LC − α²).
  // The controller trips where i = −Vth/Rds and must turn off before i = −Imax.
  it.each([
    { r: 0.01, l: 2e-6, c: 100e-6, iLoad: 5, v0: 12, rds: 0.005, vth: 0.025, imax: 40 },
    { r: 0.05, l: 0.5e-6, c: 470e-6, iLoad: 2, v0: 24, rds: 0.003, vth: 0.03, imax: 60 },
  ])("R $r Ω, L $l H, C $c F, Imax $imax A", ({ r, l, c, iLoad, v0, rds, vth, imax }) => {
    const stage: StageModel = {
      kind: "nfet-ideal-diode",
      mosfet: {
        channel: {
          rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: rds }],
          thresholdV: 2,
          tempLaw: { law: "power", exponent: 0 },
        },
        bodyDiode: siBodyDiode,
        vdsMaxV: 60,
        vgsMaxV: 20,
        tjMaxC: 175,
      },
      controller: {
        startV: 3,
        gateDrive: [{ inputV: 3, gateSourceV: 10 }],
        regulatedDropV: 0,
        quiescentA: 0,
        gateReleaseFraction: 0,
      },
      thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
    };
    const turnOff: TurnOffRequest = {
      loop: { resistanceOhm: r, inductanceH: l },
      capacitor: { capacitanceF: c, esrOhm: 0 },
      outputV: v0,
      reverseThresholdV: vth,
      peakReverseCurrentMaxA: imax,
    };
    const ctx = context(
      { ...fixed12, load: { kind: "constant-current", currentA: iLoad }, ambient: { minC: 25, maxC: 25 } },
      stage,
      turnOff,
    );
    if (ctx.turnOff === undefined) throw new Error("no turn-off event");
    const item = turnOffDelayLimits(ctx, stage, ctx.turnOff)[0];
    const rt = r + rds;
    const alpha = rt / (2 * l);
    const w = Math.sqrt(1 / (l * c) - alpha * alpha);
    const i = (t: number) => iLoad - ((rt * iLoad + v0) / (l * w)) * Math.exp(-alpha * t) * Math.sin(w * t);
    const when = (level: number) => {
      let lo = 0;
      let hi = Math.PI / (2 * w); // i falls monotonically to its first minimum within a quarter period here
      for (let k = 0; k < 200; k += 1) {
        const mid = 0.5 * (lo + hi);
        if (i(mid) > level) lo = mid;
        else hi = mid;
      }
      return 0.5 * (lo + hi);
    };
    const expected = when(-imax) - when(-vth / rds);
    expect(item?.outcome).toBe("limit");
    expect(relativeError(item?.value ?? 0, expected)).toBeLessThan(1e-7);
  });
});

describe("largest reverse leakage", () => {
  const diode = (eg: number): DiodeStage => ({
    kind: "schottky-diode",
    diode: {
      saturationCurrentA: 1e-6,
      ideality: 1.05,
      seriesResistanceOhm: 0.02,
      energyGapEv: eg,
      saturationTempExponent: 0,
      nominalTempK: 298.15,
    },
    reverseLeakage: { currentA: 1e-4, tempK: 298.15 },
    reverseRatingV: 60,
    tjMaxC: 150,
    thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
  });
  const raw = {
    ...fixed12,
    reverse: { voltageV: 16, durationS: 60 },
    load: { kind: "constant-current", currentA: 1 },
    ambient: { minC: 70, maxC: 70 },
  };

  // Energy balance at the stable point: Tj = Ta + Rth·VR·IR(Tj), so at Tj = 125 °C (150 − 25 K)
  // IR = (125 − 70)/(50·16) = 68.75 mA for a leakage law mild enough to have a stable root there.
  it("a mild leakage law: the junction sits at its target, IR = (Tj − Ta)/(Rth·VR)", () => {
    const stage = diode(0.15);
    const ctx = context(raw, stage);
    const item = leakageLimit(ctx, stage);
    expect(item.outcome).toBe("limit");
    expect(relativeError(item.value ?? 0, (125 - 70) / (50 * 16))).toBeLessThan(1e-6);
  });

  // A steep law (leakage doubling every ~10 K) folds before the target: the limit is the edge of
  // thermal runaway. Check by the reverse-steady analysis itself, 0.1 % either side of the limit.
  it("a steep leakage law: the limit is the runaway edge, a stable point just below and none above", () => {
    const stage = diode(JUNCTION_DEFAULTS.schottky.energyGapEv);
    const ctx = context(raw, stage);
    const item = leakageLimit(ctx, stage);
    expect(item.outcome).toBe("limit");
    expect(item.reason).toContain("runaway");
    const s = Number(item.conditions?.["scaleFactor"]);
    const at = (f: number) => reverseSteady(stage, 16, 70, { currentA: 1e-4 * s * f, tempK: 298.15 });
    const below = at(0.999);
    expect(below.outcome).toBe("blocks");
    expect(below.outcome === "blocks" ? below.tjC : 999).toBeLessThan(125);
    expect(at(1.001).outcome).toBe("leakage-runaway");
  });
});
