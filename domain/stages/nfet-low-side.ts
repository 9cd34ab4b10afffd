import { clampV } from "./gate-drive.js";
import { mosfetForward } from "./mosfet-forward.js";
import { onOhm } from "./mosfet-stage.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import { channelOrBodyDiode, gateFromOutputPath, supplyGated, supplyGateDrive } from "./supply-gated-fet.js";
import type { NFetLowSideStage } from "./stage-model.js";

/**
 * An N-channel MOSFET in the ground return, gate tied to the supply: Vgs = min(Vin, clamp).
 * Reverse: its gate-source sees the output (the positive rail against the module's ground), so it
 * conducts backwards until the output, lagged by the gate's R·C, falls below threshold; then the
 * body diode blocks.
 */
export const nfetLowSide: StageBehaviour<NFetLowSideStage> = {
  forward: (stage, currentA, tK, inputV) =>
    mosfetForward(stage.mosfet.channel, stage.mosfet.bodyDiode, clampV(inputV, stage.gateClampV), currentA, tK, 0),
  ...supplyGated,
  driveAtInput: (stage, inputV) => supplyGateDrive(stage, inputV, inputV),
  // Its gate is fed from the positive rail and its source is the module's ground: Vgs is the
  // output capacitor's voltage, not the input's (ngspice on the circuit under a negative pulse,
  // test/domain/review/pulse-back-conduction-low-side.test.ts: the channel stays on ~16 us after
  // the input went to −150 V). The loop is the P-FET's with the FET in the other rail.
  reversePath: (stage, tK, _before, _after, outputV) =>
    gateFromOutputPath(
      stage,
      tK,
      outputV,
      "a low-side N-FET with its gate fed from the positive rail keeps Vgs = V(output) (the rail against the module's ground, its source): it conducts backwards until the output falls below its threshold",
    ),
  // Steady reverse, the output above the input: the same gate reference, the output (rightV).
  reverseConduction: (stage, _leftV, rightV, tK) =>
    channelOrBodyDiode(stage, onOhm(stage.mosfet, clampV(rightV, stage.gateClampV), tK)),
  reverseStress: (stage, reverseV) => ({
    stress: {
      blockingElement: "body-diode",
      partVoltageV: reverseV,
      ratingV: stage.mosfet.vdsMaxV,
      gateSourceV: 0,
      note: "the gate is pulled to the source side: the channel is off and the body diode in the return blocks",
    },
    junction: stage.mosfet.bodyDiode,
  }),
};
