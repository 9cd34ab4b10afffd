import type { DiodeParams } from "../physics/diode.js";
import type { ChannelParams } from "../physics/mosfet-channel.js";
import type { ThermalPath } from "../physics/thermal-path.js";
import type { StageScale } from "./scale-stage.js";
import type { MosfetModel } from "./stage-model.js";

// Object.assign rather than a spread followed by fields: in V8 a spread clone that then gets a
// field takes a slow path (~1 µs each here), and the scaled stage is read in every circuit solve.

export function scaleDiode(d: DiodeParams, k: number): DiodeParams {
  return k === 1
    ? d
    : Object.assign({}, d, { ideality: d.ideality * k, seriesResistanceOhm: d.seriesResistanceOhm * k });
}

export function scaleChannel(c: ChannelParams, k: number): ChannelParams {
  return k === 1
    ? c
    : Object.assign({}, c, {
        rdsOnPoints: c.rdsOnPoints.map((p) => ({ gateSourceV: p.gateSourceV, rdsOnOhm: p.rdsOnOhm * k })),
      });
}

export function scaleMosfet(m: MosfetModel, s: StageScale): MosfetModel {
  const channel = scaleChannel(m.channel, s.rdsOnFactor);
  const shift = s.thresholdShiftV ?? 0;
  // A threshold shifted past a datasheet Rds(on) point drops that point (channelConductance25S skips points at or below Vth).
  const thresholdV = Math.max(0, m.channel.thresholdV + shift);
  return Object.assign({}, m, {
    channel: shift === 0 ? channel : Object.assign({}, channel, { thresholdV }),
    bodyDiode: scaleDiode(m.bodyDiode, s.forwardVoltageFactor),
  });
}

export function scaleThermal(t: ThermalPath, k: number): ThermalPath {
  if (k === 1) return t;
  return t.kind === "junction-ambient"
    ? { kind: t.kind, rthJaKPerW: t.rthJaKPerW * k }
    : { kind: t.kind, rthJcKPerW: t.rthJcKPerW * k, rthCsKPerW: t.rthCsKPerW * k, rthSaKPerW: t.rthSaKPerW * k };
}
