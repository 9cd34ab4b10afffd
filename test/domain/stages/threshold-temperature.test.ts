import { describe, expect, it } from "vitest";
import { toStageModel } from "../../../api/map/stage-model.js";
import { stageSpec } from "../../../contracts/stage.js";
import { type ChannelParams, channelResistanceOhm, thresholdAtV } from "../../../domain/physics/mosfet-channel.js";
import { mosfetForward } from "../../../domain/stages/mosfet-forward.js";
import { siBodyDiode } from "../../helpers/stages.js";

// Sources: Vth(T) = Vth(25 °C) + k·(T − 25 °C), a datasheet's linear threshold coefficient
// (docs/references.md, MOSFETs: the coefficient's typical size is memory); below the lowest
// Rds(on) point the channel follows the square-law triode scaling R ∝ 1/(Vgs − Vth) (textbook),
// so with Vth(T) in place of Vth the resistance there is a closed form.
const k = -0.005;
const channel: ChannelParams = {
  rdsOnPoints: [{ gateSourceV: 4.5, rdsOnOhm: 0.01 }],
  thresholdV: 2,
  thresholdTempCoVPerK: k,
  // exponent 0: no mobility change, so only the threshold moves the resistance
  tempLaw: { law: "power", exponent: 0 },
};
const K = (c: number) => c + 273.15;

describe("the gate threshold against junction temperature", () => {
  it("moves linearly by its coefficient and is held without one", () => {
    expect(thresholdAtV(channel, K(-40))).toBeCloseTo(2 + 0.005 * 65, 12);
    expect(thresholdAtV(channel, K(125))).toBeCloseTo(2 - 0.005 * 100, 12);
    expect(thresholdAtV(channel, K(25))).toBe(2);
    const { thresholdTempCoVPerK: _k, ...held } = channel;
    expect(thresholdAtV(held, K(-40))).toBe(2);
  });

  it("moves the zero of the triode segment: R = R1·(V1 − Vth(T))/(Vgs − Vth(T)) below the lowest point", () => {
    // Vgs 3 V: cold −40 °C Vth 2.325 V → 10 mΩ·2.175/0.675; 25 °C → 10 mΩ·2.5/1; 125 °C Vth 1.5 V → 10 mΩ·3/1.5.
    expect(channelResistanceOhm(channel, 3, K(-40))).toBeCloseTo((0.01 * 2.175) / 0.675, 12);
    expect(channelResistanceOhm(channel, 3, K(25))).toBeCloseTo((0.01 * 2.5) / 1, 12);
    expect(channelResistanceOhm(channel, 3, K(125))).toBeCloseTo((0.01 * 3) / 1.5, 12);
    // At and above the datasheet point the threshold does not matter (the point's own Rds(on)).
    expect(channelResistanceOhm(channel, 4.5, K(-40))).toBeCloseTo(0.01, 12);
  });

  it("leaves a gate drive between the 25 °C and the cold threshold on the body diode when cold", () => {
    const cold = mosfetForward(channel, siBodyDiode, 2.2, 1, K(-40), 0);
    const warm = mosfetForward(channel, siBodyDiode, 2.2, 1, K(25), 0);
    expect(cold.mode).toBe("body-diode");
    expect(warm.mode).toBe("partially-enhanced");
  });
});

describe("the contract's threshold figures", () => {
  const spec = (mosfet: Record<string, unknown>) => ({
    kind: "pfet-high-side",
    mosfet: {
      rdsOn: [{ gateSourceV: 4.5, rdsOnOhm: "20 mOhm" }],
      thresholdV: 2,
      vgsMaxV: 20,
      vdsMaxV: 40,
      tjMaxC: 150,
      bodyDiode: { model: "shockley", saturationCurrentA: "8 nA", ideality: 1.4, seriesResistanceOhm: "10 mOhm" },
      ...mosfet,
    },
    thermal: { kind: "junction-ambient", rthJaKPerW: 60 },
  });
  const coefficient = (mosfet: Record<string, unknown>) => {
    const m = toStageModel(stageSpec.parse(spec(mosfet)), { kind: "junction-ambient", rthJaKPerW: 60 }, ["stage"], []);
    return m.kind === "pfet-high-side" ? m.mosfet.channel.thresholdTempCoVPerK : Number.NaN;
  };
  it("takes Vth at a second temperature as the line through it and the 25 °C value", () => {
    // 2 V at 25 °C, 1.5 V at 125 °C: (1.5 − 2)/100 = −5 mV/K.
    expect(coefficient({ thresholdAtTj: { thresholdV: 1.5, tjC: 125 } })).toBeCloseTo(-0.005, 15);
    expect(coefficient({ thresholdTempCoVPerK: -0.004 })).toBe(-0.004);
    expect(coefficient({})).toBeUndefined();
  });
  it("refuses both at once, a rising threshold and a second figure at 25 °C, naming the field", () => {
    const issue = (mosfet: Record<string, unknown>) =>
      stageSpec.safeParse(spec(mosfet)).error?.issues.map((i) => `${i.path.join(".")}: ${i.message}`) ?? [];
    expect(issue({ thresholdTempCoVPerK: -0.004, thresholdAtTj: { thresholdV: 1.5, tjC: 125 } })).toEqual([
      "mosfet.thresholdAtTj: give either thresholdTempCoVPerK or thresholdAtTj, not both",
    ]);
    expect(issue({ thresholdAtTj: { thresholdV: 2.5, tjC: 125 } })[0]).toMatch(
      /mosfet\.thresholdAtTj\.thresholdV: gives a threshold coefficient of 5\.00 mV\/K/,
    );
    expect(issue({ thresholdAtTj: { thresholdV: 1.9, tjC: 25.5 } })[0]).toMatch(/thresholdAtTj\.tjC: must differ/);
    expect(issue({ thresholdTempCoVPerK: 0.001 })[0]).toMatch(/mosfet\.thresholdTempCoVPerK/);
  });
});
