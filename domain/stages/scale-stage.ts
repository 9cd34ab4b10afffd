import type { DiodeParams } from "../physics/diode.js";
import type { ChannelParams } from "../physics/mosfet-channel.js";
import type { ThermalPath } from "../physics/thermal-path.js";
import type { MosfetModel, StageModel } from "./stage-model.js";

/** Multiplicative tolerances applied to a stage: datasheet maximum against typical, or a sample. */
export interface StageScale {
  /** Rds(on) (and an integrated switch's on-resistance) × this. */
  readonly rdsOnFactor: number;
  /** Forward voltage at 25 °C × this (ideality and series resistance scaled; the temperature shift kept). */
  readonly forwardVoltageFactor: number;
  /** Every thermal resistance of the path × this. */
  readonly rthFactor: number;
  /** Added to a controller's or integrated switch's start voltage, V (datasheet maximum − typical, or a sample); absent: 0. */
  readonly startShiftV?: number;
  /** Added to a MOSFET's gate threshold Vth, V (datasheet maximum − typical, or a sample); absent: 0. */
  readonly thresholdShiftV?: number;
}

export const UNSCALED: StageScale = { rdsOnFactor: 1, forwardVoltageFactor: 1, rthFactor: 1 };

/**
 * Scale a stage. A diode's forward voltage n·Vt·ln(I/Is + 1) + I·Rs scales exactly by k at the
 * nominal temperature when n and Rs scale by k with Is held; the Is(T) shift with temperature is
 * kept, so the part keeps its temperature coefficient.
 */
export function scaleStage(stage: StageModel, s: StageScale): StageModel {
  const startShiftV = s.startShiftV ?? 0;
  const thresholdShiftV = s.thresholdShiftV ?? 0;
  if (s.rdsOnFactor === 1 && s.forwardVoltageFactor === 1 && s.rthFactor === 1 && startShiftV === 0 && thresholdShiftV === 0) return stage;
  // Object.assign rather than a spread followed by fields: in V8 a spread clone that then gets a
  // field takes a slow path (~1 µs each here), and the scaled stage is read in every circuit solve.
  const thermal = scaleThermal(stage.thermal, s.rthFactor);
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return Object.assign({}, stage, { diode: scaleDiode(stage.diode, s.forwardVoltageFactor), thermal });
    case "pfet-high-side":
    case "nfet-low-side":
      return Object.assign({}, stage, { mosfet: scaleMosfet(stage.mosfet, s), thermal });
    case "nfet-ideal-diode":
      return Object.assign({}, stage, {
        mosfet: scaleMosfet(stage.mosfet, s),
        controller: startShiftV === 0 ? stage.controller : Object.assign({}, stage.controller, { startV: Math.max(0, stage.controller.startV + startShiftV) }),
        thermal,
      });
    case "integrated-switch":
      return Object.assign({}, stage, {
        startV: Math.max(0, stage.startV + startShiftV),
        channel: scaleChannel(stage.channel, s.rdsOnFactor),
        belowStart: stage.belowStart.mode === "body-diode" ? { mode: "body-diode" as const, bodyDiode: scaleDiode(stage.belowStart.bodyDiode, s.forwardVoltageFactor) } : stage.belowStart,
        thermal,
      });
  }
}

export function scaleDiode(d: DiodeParams, k: number): DiodeParams {
  return k === 1 ? d : Object.assign({}, d, { ideality: d.ideality * k, seriesResistanceOhm: d.seriesResistanceOhm * k });
}

function scaleChannel(c: ChannelParams, k: number): ChannelParams {
  return k === 1 ? c : Object.assign({}, c, { rdsOnPoints: c.rdsOnPoints.map((p) => ({ gateSourceV: p.gateSourceV, rdsOnOhm: p.rdsOnOhm * k })) });
}

function scaleMosfet(m: MosfetModel, s: StageScale): MosfetModel {
  const channel = scaleChannel(m.channel, s.rdsOnFactor);
  const shift = s.thresholdShiftV ?? 0;
  // A threshold shifted past a datasheet Rds(on) point drops that point (channelConductance25S skips points at or below Vth).
  const thresholdV = Math.max(0, m.channel.thresholdV + shift);
  return Object.assign({}, m, { channel: shift === 0 ? channel : Object.assign({}, channel, { thresholdV }), bodyDiode: scaleDiode(m.bodyDiode, s.forwardVoltageFactor) });
}

export function scaleThermal(t: ThermalPath, k: number): ThermalPath {
  if (k === 1) return t;
  return t.kind === "junction-ambient"
    ? { kind: t.kind, rthJaKPerW: t.rthJaKPerW * k }
    : { kind: t.kind, rthJcKPerW: t.rthJcKPerW * k, rthCsKPerW: t.rthCsKPerW * k, rthSaKPerW: t.rthSaKPerW * k };
}
