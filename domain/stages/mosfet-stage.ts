import type { ReversePath } from "../checks/reverse-path.js";
import { channelResistanceOhm } from "../physics/mosfet-channel.js";
import type { ThermalPath } from "../physics/thermal-path.js";
import { scaleMosfet } from "./scale-parts.js";
import type { StageScale } from "./scale-stage.js";
import type { MosfetModel } from "./stage-model.js";

/** What the stage kinds built on one discrete MOSFET part (`mosfet`) share: its ratings and scaling. */
export const mosfetRatings = {
  tjMaxC: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.tjMaxC,
  breakdownV: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.vdsMaxV,
  reverseRatingV: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.vdsMaxV,
  avalancheEnergyJ: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.avalancheEnergyJ,
  peakRepetitiveCurrentA: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.peakRepetitiveCurrentA,
  blockingJunction: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.bodyDiode,
  reverseLeakage: (stage: { readonly mosfet: MosfetModel }) => stage.mosfet.offStateLeakage,
  forwardDiode: () => undefined,
  ratedRdsOn: (stage: { readonly mosfet: MosfetModel }) => {
    const top = stage.mosfet.channel.rdsOnPoints.at(-1);
    return top === undefined ? undefined : { rdsOnOhm: top.rdsOnOhm, gateSourceV: top.gateSourceV };
  },
};

export function scaleMosfetStage<S extends { readonly mosfet: MosfetModel }>(
  stage: S,
  s: StageScale,
  thermal: ThermalPath,
): S {
  return Object.assign({}, stage, { mosfet: scaleMosfet(stage.mosfet, s), thermal });
}

/** Part ratings of the MOSFET, by vocabulary name, in the order the rule inputs list them. */
export function mosfetPart(m: MosfetModel): Record<string, number> {
  const part: Record<string, number> = { vdsMaxV: m.vdsMaxV, vgsMaxV: m.vgsMaxV };
  const top = m.channel.rdsOnPoints.at(-1);
  if (top !== undefined) part["vgsOnV"] = top.gateSourceV;
  if (m.avalancheCurrentA !== undefined) part["avalancheCurrentA"] = m.avalancheCurrentA;
  if (m.repetitiveAvalancheEnergyJ !== undefined) part["repetitiveAvalancheEnergyJ"] = m.repetitiveAvalancheEnergyJ;
  return part;
}

export const NO_AVALANCHE_CURRENT = "the MOSFET states no avalanche current rating (mosfet.avalancheCurrentA)";

/** The MOSFET's avalanche ratings it does not state (each a gap in the rules that read it). */
export function mosfetMissing(m: MosfetModel): Record<string, string> {
  const out: Record<string, string> = {};
  if (m.avalancheCurrentA === undefined) out["part.avalancheCurrentA"] = NO_AVALANCHE_CURRENT;
  if (m.repetitiveAvalancheEnergyJ === undefined)
    out["part.repetitiveAvalancheEnergyJ"] =
      "the MOSFET states no repetitive avalanche energy rating (mosfet.repetitiveAvalancheEnergyJ)";
  return out;
}

/** A MOSFET whose channel is off conducts reverse current through its body diode (as a diode). */
export function bodyDiodePath(m: MosfetModel): ReversePath {
  return { kind: "diode", seriesOhm: m.bodyDiode.seriesResistanceOhm };
}

/** The channel's on-resistance at a gate drive, ohm; undefined below threshold. */
export function onOhm(m: MosfetModel, gateSourceV: number, tK: number): number | undefined {
  return channelResistanceOhm(m.channel, gateSourceV, tK);
}
