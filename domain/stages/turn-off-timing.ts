/** Timing of a controller's reverse-current turn-off (ideal-diode controller, integrated switch). */
export interface ControllerTurnOff {
  /** Reverse drain-source voltage at which the comparator trips (magnitude), V. */
  readonly reverseThresholdV: number;
  /** Comparator and driver delay from the trip to the start of the gate discharge, s. */
  readonly turnOffDelayS: number;
  /** Gate charge to remove, C, and the driver's sink current, A: adds Qg/Isink when both given. */
  readonly gateChargeC?: number;
  readonly gateSinkCurrentA?: number;
}

export function gateDischargeS(c: ControllerTurnOff | undefined): number {
  if (c?.gateChargeC === undefined || c.gateSinkCurrentA === undefined || !(c.gateSinkCurrentA > 0)) return 0;
  return c.gateChargeC / c.gateSinkCurrentA;
}
