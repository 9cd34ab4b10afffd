import type { z } from "zod";
import type { transientThermal } from "../../contracts/review.js";
import type { TransientThermal } from "../../domain/checks/start-up.js";
import { fitFoster } from "../../domain/fit/foster-fit.js";
import { totalRthKPerW } from "../../domain/physics/thermal-path.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import { gateFit, refusedFit } from "./fit-gate.js";

export type TransientThermalInput = z.output<typeof transientThermal> | undefined;
type ZthCurve = Extract<NonNullable<TransientThermalInput>, { kind: "zth-points" }>;

/** A candidate's transient thermal model: a Foster network, one pole from RthJA·C, Zth points fitted, or quasi-static. */
export function transientThermalOf(t: TransientThermalInput, stage: StageModel, path: (string | number)[], assumptions: string[]): TransientThermal {
  if (t === undefined) return { kind: "quasi-static" };
  if (t.kind === "foster") return { kind: "foster", terms: t.terms };
  if (t.kind === "zth-points") return { kind: "foster", terms: fitZthCurve(t, totalRthKPerW(stage.thermal), path, assumptions).fit.params.terms };
  const rth = totalRthKPerW(stage.thermal);
  return { kind: "foster", terms: [{ rKPerW: rth, tauS: rth * t.heatCapacityJPerK }] };
}

/**
 * Zth(t) points → a Foster network (foster-fit.ts) whose ΣR is the given steady value, or the
 * default's: refused naming the points where no network follows them, gated at 5 % of Zth
 * (acceptFit overrides), the residuals in `assumptions`.
 */
export function fitZthCurve(t: Omit<ZthCurve, "kind">, defaultSteadyKPerW: number | undefined, path: (string | number)[], assumptions: string[]) {
  const steady = t.steadyKPerW ?? defaultSteadyKPerW;
  if (t.steadyKPerW === undefined && steady !== undefined) assumptions.push(`${path.join(".")}: the Foster network's sum of R held at the stage's thermal path, ${steady} K/W`);
  const fit = fitFoster(t.points, { ...(t.stages === undefined ? {} : { stages: t.stages }), ...(steady === undefined ? {} : { steadyKPerW: steady }) });
  if (!fit.ok) throw refusedFit([...path, "points"], fit.reason, fit.points);
  const k = fit.params.terms.length;
  const exact = (steady === undefined ? 2 * k : 2 * k - 1) === t.points.length;
  const where = path.length === 0 ? "zth" : path.join(".");
  const what = `${where}: a ${k}-stage Foster network fitted${steady === undefined ? "" : ` with its sum of R held at ${steady} K/W`}`;
  const describe = (i: number) => `${t.points[i]?.timeS} s, ${t.points[i]?.zthKPerW} K/W`;
  if (!exact) assumptions.push(gateFit(fit.quality, t.acceptFit, [...path, "points"], what, "K/W", t.points.length, describe));
  return { fit, exact };
}
