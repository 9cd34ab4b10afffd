import { type DiodeAtT, type DiodeParams, diodeAt, forwardCurrentAtA } from "../physics/diode.js";
import {
  type ChannelParams,
  channelConductance25S,
  fullEnhancementV,
  rdsTempFactor,
  thresholdAtV,
} from "../physics/mosfet-channel.js";
import { channelWithBodyDiodeAtV, type ForwardState, junctionStateAt } from "./conduction.js";

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
  return mosfetForwardAt(channel, mosfetAt(channel, bodyDiode, tK), gateSourceV, currentA, regulatedDropV);
}

/** A MOSFET's temperature-dependent constants at one junction temperature: Rds(on)(T)/Rds(on)(25 °C), the gate threshold Vth(T) and the body diode's. */
export interface MosfetAtT {
  readonly rdsFactor: number;
  readonly thresholdV: number;
  readonly bodyDiode: DiodeAtT;
}

export function mosfetAt(channel: ChannelParams, bodyDiode: DiodeParams, tK: number): MosfetAtT {
  return {
    rdsFactor: rdsTempFactor(channel.tempLaw, tK),
    thresholdV: thresholdAtV(channel, tK),
    bodyDiode: diodeAt(bodyDiode, tK),
  };
}

/**
 * mosfetForward with the temperature-dependent constants formed once (mosfetAt): a stage that
 * tries several gate drives at one temperature (the P-FET's Vgs = Vin − drop) pays the
 * temperature laws once. Rds = (R(T)/R25) / G25(Vgs), as channelResistanceOhm.
 */
export function mosfetForwardAt(
  channel: ChannelParams,
  at: MosfetAtT,
  gateSourceV: number,
  currentA: number,
  regulatedDropV: number,
): ForwardState {
  const g = channelConductance25S(channel, gateSourceV, at.thresholdV);
  if (!(g > 0)) {
    const body = junctionStateAt(at.bodyDiode, currentA, "body-diode");
    return {
      mode: body.mode,
      dropV: body.dropV,
      lossW: body.lossW,
      channelCurrentA: body.channelCurrentA,
      bodyDiodeCurrentA: body.bodyDiodeCurrentA,
      bodyDiodeTimeFraction: body.bodyDiodeTimeFraction,
      gateSourceV,
    };
  }
  const rOhm = at.rdsFactor / g;
  const mode = gateSourceV >= fullEnhancementV(channel) ? "fully-enhanced" : "partially-enhanced";
  if (regulatedDropV > 0 && currentA * rOhm < regulatedDropV) {
    const bodyA = Math.min(currentA, Math.max(0, forwardCurrentAtA(at.bodyDiode, regulatedDropV)));
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
  const dropV = channelWithBodyDiodeAtV(rOhm, at.bodyDiode, currentA);
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

/** The same state at another gate drive (its conduction unchanged), field for field in the order mosfetForwardAt writes them. */
export function withGateSourceV(s: ForwardState, gateSourceV: number): ForwardState {
  if (s.channelResistanceOhm === undefined) {
    return {
      mode: s.mode,
      dropV: s.dropV,
      lossW: s.lossW,
      channelCurrentA: s.channelCurrentA,
      bodyDiodeCurrentA: s.bodyDiodeCurrentA,
      bodyDiodeTimeFraction: s.bodyDiodeTimeFraction,
      gateSourceV,
    };
  }
  return {
    mode: s.mode,
    dropV: s.dropV,
    lossW: s.lossW,
    channelCurrentA: s.channelCurrentA,
    bodyDiodeCurrentA: s.bodyDiodeCurrentA,
    gateSourceV,
    channelResistanceOhm: s.channelResistanceOhm,
    bodyDiodeTimeFraction: s.bodyDiodeTimeFraction,
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
