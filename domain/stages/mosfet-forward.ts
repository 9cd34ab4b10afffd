import { type DiodeParams, diodeCurrentA } from "../physics/diode.js";
import { type ChannelParams, channelResistanceOhm, fullEnhancementV } from "../physics/mosfet-channel.js";
import { channelWithBodyDiodeV, type ForwardState, junctionState } from "./conduction.js";

/**
 * A MOSFET channel at a given gate drive in parallel with its body diode.
 * With regulatedDropV > 0 (an ideal-diode controller), the controller lowers the gate until the
 * drop equals regulatedDropV whenever the fully driven channel would drop less; the drop is then
 * held at regulatedDropV (mode "regulated-drop"). Below threshold the body diode carries it all.
 */
export function mosfetForward(
  channel: ChannelParams,
  bodyDiode: DiodeParams,
  gateSourceV: number,
  currentA: number,
  tK: number,
  regulatedDropV: number,
): ForwardState {
  const rOhm = channelResistanceOhm(channel, gateSourceV, tK);
  if (rOhm === undefined) return { ...junctionState(bodyDiode, currentA, tK, "body-diode"), gateSourceV };
  const mode = gateSourceV >= fullEnhancementV(channel) ? "fully-enhanced" : "partially-enhanced";
  if (regulatedDropV > 0 && currentA * rOhm < regulatedDropV) {
    const bodyA = Math.min(currentA, Math.max(0, diodeCurrentA(bodyDiode, regulatedDropV, tK)));
    return {
      mode: "regulated-drop",
      dropV: regulatedDropV,
      lossW: regulatedDropV * currentA,
      channelCurrentA: currentA - bodyA,
      bodyDiodeCurrentA: bodyA,
      gateSourceV,
      channelResistanceOhm: currentA > 0 ? regulatedDropV / Math.max(currentA - bodyA, 1e-300) : rOhm,
      bodyDiodeTimeFraction: 0,
    };
  }
  const dropV = channelWithBodyDiodeV(rOhm, bodyDiode, currentA, tK);
  const channelA = dropV / rOhm;
  return {
    mode,
    dropV,
    lossW: dropV * currentA,
    channelCurrentA: channelA,
    bodyDiodeCurrentA: Math.max(0, currentA - channelA),
    gateSourceV,
    channelResistanceOhm: rOhm,
    bodyDiodeTimeFraction: 0,
  };
}

/** Time-average of a gated state and the body-diode state, for a duty-cycled charge pump. */
export function blendWithBodyDiode(on: ForwardState, body: ForwardState, releaseFraction: number): ForwardState {
  if (releaseFraction <= 0) return on;
  const f = releaseFraction;
  return {
    ...on,
    dropV: (1 - f) * on.dropV + f * body.dropV,
    lossW: (1 - f) * on.lossW + f * body.lossW,
    channelCurrentA: (1 - f) * on.channelCurrentA,
    bodyDiodeCurrentA: (1 - f) * on.bodyDiodeCurrentA + f * body.bodyDiodeCurrentA,
    bodyDiodeTimeFraction: f,
  };
}
