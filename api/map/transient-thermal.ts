import type { TransientThermal } from "../../domain/checks/start-up.js";
import { totalRthKPerW } from "../../domain/physics/thermal-path.js";
import type { StageModel } from "../../domain/stages/stage-model.js";

export type TransientThermalInput =
  | { kind: "foster"; terms: { rKPerW: number; tauS: number }[] }
  | { kind: "single-pole"; heatCapacityJPerK: number }
  | undefined;

/** A candidate's transient thermal model: a Foster network, one pole from RthJA·C, or quasi-static. */
export function transientThermalOf(t: TransientThermalInput, stage: StageModel): TransientThermal {
  if (t === undefined) return { kind: "quasi-static" };
  if (t.kind === "foster") return { kind: "foster", terms: t.terms };
  const rth = totalRthKPerW(stage.thermal);
  return { kind: "foster", terms: [{ rKPerW: rth, tauS: rth * t.heatCapacityJPerK }] };
}

