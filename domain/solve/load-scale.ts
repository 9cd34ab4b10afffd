import type { LoadModel } from "./load-model.js";

/** A load at a share of its full level: current or power × s, a resistance ÷ s (s > 0). */
export function scaleLoad(load: LoadModel, s: number): LoadModel {
  switch (load.kind) {
    case "constant-current":
      return { kind: load.kind, currentA: load.currentA * s };
    case "resistive":
      return { kind: load.kind, resistanceOhm: load.resistanceOhm / s };
    case "constant-power":
      return { kind: load.kind, powerW: load.powerW * s, minVoltageV: load.minVoltageV };
  }
}
