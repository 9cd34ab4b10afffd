import { describe, expect, it } from "vitest";
import { STAGE_KINDS } from "../../../contracts/stage.js";
import { missionEnergy } from "../../../domain/checks/energy.js";
import { STAGE_KIND_LIST } from "../../../domain/rules/metric-vocabulary.js";
import { dieLossW, solveOperatingPoint } from "../../../domain/solve/electrothermal-point.js";
import { diodeStage } from "../../../domain/stages/diode-stage.js";
import { integratedSwitch } from "../../../domain/stages/integrated-switch.js";
import { nfetBackToBack } from "../../../domain/stages/nfet-back-to-back.js";
import { nfetIdealDiode } from "../../../domain/stages/nfet-ideal-diode.js";
import { nfetLowSide } from "../../../domain/stages/nfet-low-side.js";
import { pfetHighSide } from "../../../domain/stages/pfet-high-side.js";
import {
  controllerLossW,
  quiescentLossW,
  STAGE_BEHAVIOURS,
  type StageBehaviours,
} from "../../../domain/stages/stage-behaviours.js";
import type { StageModel } from "../../../domain/stages/stage-model.js";
import { idealDiode } from "../../helpers/stages.js";

describe("the stage behaviour record", () => {
  it("has one behaviour for every kind the contract, the domain and the rules know", () => {
    expect(Object.keys(STAGE_BEHAVIOURS).sort()).toEqual([...STAGE_KINDS].sort());
    expect([...STAGE_KIND_LIST].sort()).toEqual([...STAGE_KINDS].sort());
  });

  it("is refused by the compiler when a kind or a member is missing", () => {
    // tsc (npm test's typecheck) fails if either line below compiles: an unused @ts-expect-error is an error.
    // @ts-expect-error: a record without the back-to-back kind is incomplete
    const missingKind: StageBehaviours = {
      "pn-diode": diodeStage,
      "schottky-diode": diodeStage,
      "pfet-high-side": pfetHighSide,
      "nfet-low-side": nfetLowSide,
      "nfet-ideal-diode": nfetIdealDiode,
      "integrated-switch": integratedSwitch,
    };
    const { reversePath: _dropped, ...withoutReversePath } = nfetBackToBack;
    // @ts-expect-error: a behaviour without its reverse path is incomplete
    const missingMember: StageBehaviours = { ...STAGE_BEHAVIOURS, "nfet-back-to-back": withoutReversePath };
    expect(Object.keys(missingKind)).not.toContain("nfet-back-to-back");
    expect(Object.keys(missingMember["nfet-back-to-back"])).not.toContain("reversePath");
  });
});

describe("quiescent loss: one definition, at the voltage across the control", () => {
  // Conservation: the controller draws Iq from the stage's input terminal to ground, so it
  // dissipates Iq·V(stage input), the supply less the source drop (I + Iq)·Rs; the rest of the
  // power Iq draws from the supply heats the wiring, not the stage. With 10 mA and 1 Ω at 12 V
  // and 1 A: V(input) = 12 − 1.01 = 10.99 V, 0.1099 W (the open-circuit supply would give 0.12 W).
  const stage: StageModel = (() => {
    const s = idealDiode(0.005, { rth: 40 });
    return s.kind === "nfet-ideal-diode" ? { ...s, controller: { ...s.controller, quiescentA: 0.01 } } : s;
  })();
  const load = { kind: "constant-current" as const, currentA: 1 };

  it("gives Iq·V(stage input) for a separate controller, and puts it in the die only for an integrated switch", () => {
    const r = solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 1, load, ambientC: 25, rthKPerW: 40 });
    if (!("point" in r)) throw new Error(r.outcome);
    expect(r.point.stageInputV).toBeCloseTo(10.99, 12);
    expect(quiescentLossW(stage, r.point.stageInputV)).toBeCloseTo(0.1099, 12);
    expect(controllerLossW(stage, r.point.stageInputV)).toBeCloseTo(0.1099, 12);
    expect(dieLossW(stage, r.point)).toBe(r.point.forward.lossW);
  });

  it("is what the mission energy counts (the stage input, not the open-circuit supply)", () => {
    const e = missionEnergy(stage, [{ hoursPerYear: 1000, loadScale: 1, ambientC: 25 }], 12, 1, load);
    const r = solveOperatingPoint({ stage, supplyV: 12, sourceResistanceOhm: 1, load, ambientC: 25, rthKPerW: 40 });
    if (!("point" in r)) throw new Error(r.outcome);
    expect(e.lossEnergyKWhPerYear).toBeCloseTo(((r.point.dieLossW + 0.01 * 10.99) * 1000) / 1000, 12);
    expect(Math.abs(e.lossEnergyKWhPerYear - ((r.point.dieLossW + 0.01 * 12) * 1000) / 1000)).toBeGreaterThan(0.01);
  });
});
