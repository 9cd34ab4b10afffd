import { describe, expect, it } from "vitest";
import { junctionLeakageA, reverseSteady } from "../../../domain/checks/reverse-steady.js";
import { alongProfile } from "../../../domain/checks/start-up.js";
import { thermalSizing } from "../../../domain/checks/thermal-sizing.js";
import { transientStress } from "../../../domain/checks/transient-stress.js";
import { BOLTZMANN_J_PER_K, cToK, ELEMENTARY_CHARGE_C } from "../../../domain/physics/constants.js";
import { findTransient } from "../../../domain/review/transient-library.js";
import type { StageModel } from "../../../domain/stages/stage-model.js";
import { idealDiode, lowSideFet } from "../../helpers/stages.js";
import { relativeError } from "../../helpers/tolerance.js";

const schottkyDiode = {
  saturationCurrentA: 5e-6,
  ideality: 1.05,
  seriesResistanceOhm: 0.02,
  energyGapEv: 0.69,
  saturationTempExponent: 2,
  nominalTempK: cToK(25),
};
const schottky: StageModel = {
  kind: "schottky-diode",
  diode: schottkyDiode,
  reverseRatingV: 45,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
};

describe("steady reverse polarity", () => {
  // Closed form: d ln Is/dT = XTI/(n·T) + Eg·q/(n·k·T²) for the SPICE Is(T) law, so the leakage
  // doubles every ln 2 / (that) kelvin (docs/references.md: about 8 K near room temperature for 0.6 eV).
  it("Schottky leakage doubles at the interval the Is(T) law predicts", () => {
    const t = cToK(85);
    const n = schottkyDiode.ideality;
    const slope = 2 / (n * t) + (0.69 * ELEMENTARY_CHARGE_C) / (n * BOLTZMANN_J_PER_K * t * t);
    const doublingK = Math.LN2 / slope;
    const ratio =
      junctionLeakageA(schottkyDiode, 14, t + doublingK / 2) / junctionLeakageA(schottkyDiode, 14, t - doublingK / 2);
    expect(ratio).toBeCloseTo(2, 2);
    expect(doublingK).toBeGreaterThan(6);
    expect(doublingK).toBeLessThan(12);
  });

  it("the diode blocks, its leakage power heats it self-consistently (Tj = Ta + Rth·V·I(Tj))", () => {
    const r = reverseSteady(schottky, 14, 85);
    expect(r.outcome).toBe("blocks");
    if (r.outcome !== "blocks") return;
    expect(r.stress.blockingElement).toBe("diode");
    expect(r.stress.ratingV).toBe(45);
    expect(Math.abs(r.tjC - (85 + 40 * r.leakagePowerW))).toBeLessThan(1e-6);
  });

  it("reports reverse leakage runaway when the thermal path is poor", () => {
    const leaky: StageModel = {
      ...schottky,
      diode: { ...schottkyDiode, saturationCurrentA: 2e-3 },
      thermal: { kind: "junction-ambient", rthJaKPerW: 200 },
    };
    expect(reverseSteady(leaky, 28, 85).outcome).toBe("leakage-runaway");
  });
});

describe("transients", () => {
  const ctx = {
    supplyNominalV: 13.5,
    supplyMaxV: 16,
    reverseV: 14,
    outputHeldV: 13.5,
    deratingFactor: 0.8,
    clampToStandoffRatio: 1.3,
  };
  it("a negative pulse stresses the blocking diode with |Us| + the held output, and sizes the clamp window", () => {
    const pulse = findTransient("iso7637-2-pulse-1-12v");
    if (pulse === undefined) throw new Error("pulse 1");
    const r = transientStress(schottky, pulse, ctx);
    expect(r.polarity).toBe("negative");
    expect(r.stresses[0]?.seenV).toBeCloseTo(150 + 13.5, 9);
    expect(r.stresses[0]?.exceeds).toBe(true);
    if (r.clamp.needed !== true) throw new Error("a clamp is needed");
    expect(r.clamp.clampMaxV).toBeCloseTo(45 * 0.8 - 13.5, 9);
    expect(r.clamp.standoffMinV).toBe(14);
    if (r.clamp.atClampMax.conducts !== true) throw new Error("conducts");
    // Ipk = (|Us| − Vc)/Ri with the pulse riding on 0 V (docs/references.md).
    expect(r.clamp.atClampMax.peakCurrentA).toBeCloseTo((150 - 22.5) / 10, 9);
  });

  it("a P-FET does not block: the pulse reaches the load side", () => {
    const pfet: StageModel = {
      kind: "pfet-high-side",
      mosfet: (lowSideFet(0.01, 40, { law: "power", exponent: 2.3 }) as Extract<StageModel, { kind: "nfet-low-side" }>)
        .mosfet,
      thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
    };
    const pulse = findTransient("iso7637-2-pulse-1-12v");
    if (pulse === undefined) throw new Error("pulse 1");
    expect(transientStress(pfet, pulse, ctx).reachesLoad).toBe(true);
  });

  it("a centrally suppressed load dump is held at its level", () => {
    const pulse = findTransient("iso16750-2-load-dump-b-12v");
    if (pulse === undefined) throw new Error("load dump b");
    const stage = {
      ...idealDiode(0.003),
      controller: {
        startV: 3,
        gateDrive: [{ inputV: 3, gateSourceV: 10 }],
        regulatedDropV: 0.02,
        quiescentA: 1e-4,
        gateReleaseFraction: 0,
        maxInputV: 30,
      },
    } as StageModel;
    const r = transientStress(stage, pulse, ctx);
    expect(r.peakOpenCircuitV).toBe(35);
    expect(r.stresses[0]?.exceeds).toBe(true);
    // A module clamp below the central 35 V takes the test-A generator's whole current (ISO 16750-2
    // test B on the bench): Ipk = (Us − Vc)/Ri at the severe corner, Us 101 V, Ri 4 ohm (clamp-energy.ts closed form).
    if (r.clamp.needed !== true || r.clamp.atClampMax.conducts !== true)
      throw new Error("a module clamp is needed and conducts");
    expect(r.clamp.clampMaxV).toBeCloseTo(30 * 0.8, 9);
    expect(r.clamp.atClampMax.peakCurrentA).toBeCloseTo((101 - 24) / 4, 9);
  });

  it("a design clamp below the central suppressor absorbs the load dump; one above it does not conduct", () => {
    const pulse = findTransient("iso16750-2-load-dump-b-12v");
    if (pulse === undefined) throw new Error("load dump b");
    const below = transientStress(schottky, pulse, { ...ctx, inputClamp: { standoffV: 26, clampV: 30 } });
    expect(below.inputPeakV).toBe(30);
    if (below.designClamp?.duty.conducts !== true) throw new Error("the module clamp conducts");
    // Same closed form as test A through Ri 4 ohm from UA = 14 V (docs/references.md).
    expect(below.designClamp.duty.peakCurrentA).toBeCloseTo((101 - 30) / 4, 9);
    const above = transientStress(schottky, pulse, { ...ctx, inputClamp: { standoffV: 30, clampV: 40 } });
    expect(above.inputPeakV).toBe(35);
    expect(above.designClamp?.duty.conducts).toBe(false);
  });
});

describe("start-up profile", () => {
  // Closed form: a linear dip from 12 V to 2 V and back crosses a 4 V start voltage at known
  // times; the controller runs only above it, so the body-diode time is the time spent below.
  it("the body diode carries the load exactly while the input is below the start voltage", () => {
    const stage = idealDiode(0.003, { startV: 4, rth: 30 });
    const profile = [
      { timeS: 0, voltageV: 12 },
      { timeS: 0.1, voltageV: 2 },
      { timeS: 0.2, voltageV: 12 },
    ];
    const r = alongProfile(
      stage,
      profile,
      { kind: "constant-current", currentA: 2 },
      0,
      25,
      { kind: "foster", terms: [{ rKPerW: 30, tauS: 5 }] },
      2000,
    );
    const below = (2 * 0.1 * (4 - 2)) / 10;
    expect(Math.abs(r.bodyDiodeTimeS - below)).toBeLessThan(2 * (0.1 / 2000));
    expect(r.maxTjC).toBeGreaterThan(r.samples[0]?.tjC ?? 0);
    expect(r.minLoadV).toBeLessThan(2);
  });
});

describe("thermal sizing", () => {
  // Closed form: with loss independent of Tj, Tj = Ta + Rth·P, so Rth,max = (Ttarget − Ta)/P.
  it("matches (target − Ta)/P when the loss does not depend on temperature", () => {
    const s = lowSideFet(0.01, 50, { law: "power", exponent: 0 });
    const cond = {
      supplyV: 12,
      ambientC: 60,
      load: { kind: "constant-current" as const, currentA: 10 },
      sourceResistanceOhm: 0,
      stage: s,
    };
    const sink = { kind: "junction-case-sink" as const, rthJcKPerW: 2, rthCsKPerW: 0.5, rthSaKPerW: 97.5 };
    const r = thermalSizing([cond], sink, 100, 125);
    expect(r.outcome).toBe("heatsink-needed");
    if (r.outcome !== "heatsink-needed") return;
    expect(relativeError(r.maxTotalRthKPerW, (125 - 60) / 1)).toBeLessThan(1e-5);
    expect(relativeError(r.maxSinkRthKPerW, 65 - 2.5)).toBeLessThan(1e-5);
  });
  it("says so when the ambient alone reaches the target", () => {
    const s = lowSideFet(0.01, 50, { law: "power", exponent: 0 });
    const r = thermalSizing(
      [
        {
          supplyV: 12,
          ambientC: 130,
          load: { kind: "constant-current", currentA: 1 },
          sourceResistanceOhm: 0,
          stage: s,
        },
      ],
      s.thermal,
      50,
      125,
    );
    expect(r.outcome).toBe("impossible");
  });
});
