import type { ReversePath } from "../checks/reverse-path.js";
import { fullEnhancementV, thresholdAtV } from "../physics/mosfet-channel.js";
import { clampV } from "./gate-drive.js";
import { bodyDiodePath, mosfetMissing, mosfetPart, mosfetRatings, onOhm, scaleMosfetStage } from "./mosfet-stage.js";
import type { ReverseConduction } from "./stage-behaviour.js";
import type { NFetLowSideStage, PFetStage } from "./stage-model.js";

type SupplyGated = PFetStage | NFetLowSideStage;

/**
 * What a MOSFET whose gate is driven from the supply (a P-FET with its gate to ground, a low-side
 * N-FET with its gate to the supply) shares: no control (no start voltage, no quiescent current),
 * its gate-source sees the supply through the optional clamp, and it does not block reverse current.
 */
export const supplyGated = {
  ...mosfetRatings,
  startV: () => undefined,
  withStartV: <S extends SupplyGated>(stage: S) => stage,
  quiescentA: () => 0,
  quiescentHeatsDie: false,
  scale: scaleMosfetStage,
  forwardLimits: (stage: SupplyGated) => [
    {
      element: "gate-source" as const,
      ratingV: stage.mosfet.vgsMaxV,
      seenV: (v: number) => clampV(v, stage.gateClampV),
    },
  ],
  blocksReverseCurrent: () => false,
  needsTurnOffTiming: () => false,
  junctionRecovery: false,
  releasedGateDiode: () => undefined,
  gateDriveMetric: true,
  gateSourceClampV: (stage: SupplyGated) => ({ clampV: stage.gateClampV }),
  controllerReversePin: false,
  sizing: {
    forward: "rdsOn",
    reverseRating: "vdsMaxV",
    gateFromSupply: true,
    ratedGateDrive: true,
    control: false,
    leakage: false,
  } as const,
  describe: (stage: SupplyGated) => ({
    metrics: {},
    part: mosfetPart(stage.mosfet),
    missing: mosfetMissing(stage.mosfet),
  }),
};

/** The gate drive at a gate voltage taken from the supply (clamped), and its margin over full enhancement. */
export function supplyGateDrive(stage: SupplyGated, inputV: number, gateV: number) {
  const vgs = clampV(gateV, stage.gateClampV);
  return { inputV, gateSourceV: vgs, gateDriveMarginV: vgs - fullEnhancementV(stage.mosfet.channel) };
}

/** Steady reverse: the channel (with its body diode) while on at resistance r, else the body diode's leakage. */
export function channelOrBodyDiode(stage: SupplyGated, r: number | undefined): ReverseConduction {
  if (r === undefined)
    return { kind: "junction", diode: stage.mosfet.bodyDiode, leakage: stage.mosfet.offStateLeakage };
  return { kind: "channel", ohm: r, bodyDiode: stage.mosfet.bodyDiode };
}

/**
 * The reverse path of a FET whose gate is fed from the supply: its gate-source sees the output
 * (a P-FET's gate at the module's ground, its source at the output; a low-side N-FET's gate fed
 * from the positive rail, its source at the module's ground: both see the output capacitor's
 * voltage, up to the clamp), lagged by the gate's R·C. With the output up the channel stays on and
 * conducts backwards until that lagged voltage falls below threshold (pfet-gate-off.ts); a channel
 * already off is its body diode.
 */
export function gateFromOutputPath(stage: SupplyGated, tK: number, outputV: number, reason: string): ReversePath {
  const r = onOhm(stage.mosfet, clampV(outputV, stage.gateClampV), tK);
  if (r === undefined) return bodyDiodePath(stage.mosfet);
  return {
    kind: "channel-stays-on",
    channelOhm: r,
    thresholdV: thresholdAtV(stage.mosfet.channel, tK),
    reason,
    gateFromOutput: { clampV: stage.gateClampV },
  };
}
