import type { z } from "zod";
import type { transientThermal } from "../../contracts/review.js";
import type { TransientThermal } from "../../domain/checks/start-up.js";
import { fitFoster } from "../../domain/fit/foster-fit.js";
import { cauerToFoster } from "../../domain/physics/cauer.js";
import type { FosterTerm } from "../../domain/physics/foster.js";
import { type ThermalPath, totalRthKPerW } from "../../domain/physics/thermal-path.js";
import { inputProblem } from "../input-problem.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import { gateFit, refusedFit } from "./fit-gate.js";

export type TransientThermalInput = z.output<typeof transientThermal> | undefined;
type ZthCurve = Extract<NonNullable<TransientThermalInput>, { kind: "zth-points" }>;

/** A candidate's transient thermal model: a Foster or Cauer network, one pole from RthJA·C, Zth points fitted, or quasi-static. */
export function transientThermalOf(
  t: TransientThermalInput,
  stage: StageModel,
  path: (string | number)[],
  assumptions: string[],
): TransientThermal {
  if (t === undefined) return { kind: "quasi-static" };
  if (t.kind === "foster" || t.kind === "cauer")
    return { kind: "foster", terms: networkTerms(t, stage.thermal, path, assumptions) };
  if (t.kind === "zth-points")
    return { kind: "foster", terms: fitZthCurve(t, totalRthKPerW(stage.thermal), path, assumptions).fit.params.terms };
  const rth = totalRthKPerW(stage.thermal);
  return { kind: "foster", terms: [{ rKPerW: rth, tauS: rth * t.heatCapacityJPerK }] };
}

/**
 * Zth(t) points → a Foster network (foster-fit.ts) whose ΣR is the given steady value, or the
 * default's: refused naming the points where no network follows them, gated at 5 % of Zth
 * (acceptFit overrides), the residuals in `assumptions`.
 */
export function fitZthCurve(
  t: Omit<ZthCurve, "kind">,
  defaultSteadyKPerW: number | undefined,
  path: (string | number)[],
  assumptions: string[],
) {
  const steady = t.steadyKPerW ?? defaultSteadyKPerW;
  if (t.steadyKPerW === undefined && steady !== undefined)
    assumptions.push(
      `${path.join(".")}: the Foster network's sum of R held at the stage's thermal path, ${steady} K/W`,
    );
  const fit = fitFoster(t.points, {
    ...(t.stages === undefined ? {} : { stages: t.stages }),
    ...(steady === undefined ? {} : { steadyKPerW: steady }),
  });
  if (!fit.ok) throw refusedFit([...path, "points"], fit.reason, fit.points);
  const k = fit.params.terms.length;
  const exact = (steady === undefined ? 2 * k : 2 * k - 1) === t.points.length;
  const where = path.length === 0 ? "zth" : path.join(".");
  const what = `${where}: a ${k}-stage Foster network fitted${steady === undefined ? "" : ` with its sum of R held at ${steady} K/W`}`;
  const describe = (i: number) => `${t.points[i]?.timeS} s, ${t.points[i]?.zthKPerW} K/W`;
  if (!exact)
    assumptions.push(gateFit(fit.quality, t.acceptFit, [...path, "points"], what, "K/W", t.points.length, describe));
  return { fit, exact };
}

type Network = Extract<NonNullable<TransientThermalInput>, { kind: "foster" | "cauer" }>;

/** Share by which a network's ΣR may differ from the steady path it stands for (datasheet networks are rounded). */
const STEADY_MATCH = 0.05;

/**
 * A Foster or Cauer network → the Foster terms of the junction-to-ambient Zth, its ΣR checked
 * against the stage's steady path (refused naming the fields beyond 5 %). A junction-case network
 * is cascaded with the rest of the path as one node (R = path − ΣR, C = caseToAmbientHeatCapacityJPerK):
 * a Cauer ladder gains that node as a last stage, exactly; a Foster network gains one term
 * R·(1 − e^(−t/(R·C))) in series — its chain passes the whole power to the case at once, so the
 * sum is an upper bound (docs/references.md, Thermal; test/domain/thermal-networks.test.ts against
 * ngspice on the ladder).
 */
function networkTerms(
  t: Network,
  thermal: ThermalPath,
  path: (string | number)[],
  assumptions: string[],
): FosterTerm[] {
  const where = path.join(".");
  const field = [...path, t.kind === "foster" ? "terms" : "stages"];
  const sumR =
    t.kind === "foster" ? t.terms.reduce((a, x) => a + x.rKPerW, 0) : t.stages.reduce((a, x) => a + x.rKPerW, 0);
  const total = totalRthKPerW(thermal);
  const fmt = (v: number) => Number(v.toPrecision(4));
  const mismatch = (want: number, what: string, fix: string) => {
    if (Math.abs(sumR - want) <= STEADY_MATCH * want) return;
    throw inputProblem(
      "invalid-input",
      field,
      `${field.join(".")}: the network's ΣR = ${fmt(sumR)} K/W is not the ${what} ${fmt(want)} K/W (beyond 5 %): ${fix}`,
    );
  };
  if (t.scope !== "junction-case") {
    mismatch(
      total,
      "stage's junction-to-ambient thermal path",
      `give the junction-to-ambient network, or scope "junction-case" with caseToAmbientHeatCapacityJPerK for a datasheet Zth(j-c) network`,
    );
    return t.kind === "foster" ? t.terms : cauerToFoster(t.stages);
  }
  if (thermal.kind === "junction-case-sink")
    mismatch(
      thermal.rthJcKPerW,
      "stage's thermal.rthJcKPerW",
      "give the junction-to-case network of that part, or set thermal.rthJcKPerW to its ΣR",
    );
  const restR = thermal.kind === "junction-case-sink" ? thermal.rthCsKPerW + thermal.rthSaKPerW : total - sumR;
  if (!(restR > 0)) {
    throw inputProblem(
      "invalid-input",
      field,
      `${field.join(".")}: the junction-case network's ΣR = ${fmt(sumR)} K/W leaves nothing of the stage's ${fmt(total)} K/W path for case to ambient: raise thermal, or give the network scope "junction-ambient"`,
    );
  }
  const restC = t.caseToAmbientHeatCapacityJPerK ?? 0;
  if (t.kind === "cauer") {
    assumptions.push(
      `${where}: the junction-case ladder cascaded with the case-to-ambient path as one node (${fmt(restR)} K/W, ${fmt(restC)} J/K)`,
    );
    return cauerToFoster([...t.stages, { rKPerW: restR, cJPerK: restC }]);
  }
  assumptions.push(
    `${where}: the junction-case Foster network in series with one case-to-ambient term (${fmt(restR)} K/W, τ ${fmt(restR * restC)} s); a Foster chain is not physical at the case, so this overstates Zth between the two time scales (an upper bound; a Cauer ladder cascades exactly)`,
  );
  return [...t.terms, { rKPerW: restR, tauS: restR * restC }];
}
