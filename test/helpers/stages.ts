import { cToK } from "../../domain/physics/constants.js";
import type { DiodeParams } from "../../domain/physics/diode.js";
import type { RdsTempLaw } from "../../domain/physics/mosfet-channel.js";
import type { MosfetModel, StageModel } from "../../domain/stages/stage-model.js";

/** Builders for test stages (parameters chosen for the check at hand, not any real part). */
export const siBodyDiode: DiodeParams = {
  saturationCurrentA: 1e-8,
  ideality: 1.4,
  seriesResistanceOhm: 0.01,
  energyGapEv: 1.11,
  saturationTempExponent: 3,
  nominalTempK: cToK(25),
};

export function mosfet(
  rdsOnOhm: number,
  tempLaw: RdsTempLaw = { law: "power", exponent: 0 },
  extra: Partial<MosfetModel> = {},
): MosfetModel {
  return {
    channel: {
      rdsOnPoints: [
        { gateSourceV: 4.5, rdsOnOhm: rdsOnOhm * 1.5 },
        { gateSourceV: 10, rdsOnOhm },
      ],
      thresholdV: 2,
      tempLaw,
    },
    bodyDiode: siBodyDiode,
    vdsMaxV: 60,
    vgsMaxV: 20,
    tjMaxC: 175,
    ...extra,
  };
}

export function idealDiode(
  rdsOnOhm: number,
  opts: { startV?: number; regulatedDropV?: number; rth?: number; tempLaw?: RdsTempLaw } = {},
): StageModel {
  return {
    kind: "nfet-ideal-diode",
    mosfet: mosfet(rdsOnOhm, opts.tempLaw),
    controller: {
      startV: opts.startV ?? 3,
      gateDrive: [{ inputV: 3, gateSourceV: 10 }],
      regulatedDropV: opts.regulatedDropV ?? 0,
      quiescentA: 0,
      gateReleaseFraction: 0,
    },
    thermal: { kind: "junction-ambient", rthJaKPerW: opts.rth ?? 0 },
  };
}

export function lowSideFet(rdsOnOhm: number, rth: number, tempLaw: RdsTempLaw): StageModel {
  // One Rds(on) point at 3 V: the channel is a plain resistor at any drive above it.
  const m = mosfet(rdsOnOhm, tempLaw);
  return {
    kind: "nfet-low-side",
    mosfet: {
      ...m,
      channel: { ...m.channel, rdsOnPoints: [{ gateSourceV: 3, rdsOnOhm }] },
      bodyDiode: { ...siBodyDiode, saturationCurrentA: 1e-14 },
    },
    thermal: { kind: "junction-ambient", rthJaKPerW: rth },
  };
}

/**
 * The typical corner, given explicitly: a catalog part that carries its own datasheetMax is
 * otherwise judged at it (api/map/part-corner.ts); tests comparing with a typical-value model
 * pin the candidate here.
 */
export const TYPICAL = { rdsOnFactor: 1, forwardVoltageFactor: 1 } as const;
