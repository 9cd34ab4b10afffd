import type { DiodeSpec } from "../../contracts/diode.js";
import { cToK } from "../../domain/physics/constants.js";
import { DEFAULT_NOMINAL_TEMP_K, type DiodeParams, JUNCTION_DEFAULTS } from "../../domain/physics/diode.js";
import { type DiodeFitResult, fitDiode } from "../../domain/physics/diode-fit.js";
import { inputProblem } from "../input-problem.js";
import { gateFit, refusedFit } from "./fit-gate.js";

export type Junction = keyof typeof JUNCTION_DEFAULTS;
type PointsSpec = Extract<DiodeSpec, { model: "points" }>;

/** Contract diode → domain Shockley parameters, fitting datasheet points where given. */
export function toDiodeParams(
  spec: DiodeSpec,
  junction: Junction,
  path: (string | number)[],
  assumptions: string[],
): DiodeParams {
  if (spec.model === "points") return fitDiodePoints(spec, junction, path, assumptions).params;
  const defaults = JUNCTION_DEFAULTS[junction];
  pushLawDefaults(spec, junction, path, assumptions, false);
  return {
    saturationCurrentA: spec.saturationCurrentA,
    ideality: spec.ideality,
    seriesResistanceOhm: spec.seriesResistanceOhm,
    energyGapEv: spec.energyGapEv ?? defaults.energyGapEv,
    saturationTempExponent: spec.saturationTempExponent ?? defaults.saturationTempExponent,
    nominalTempK: spec.nominalTempC === undefined ? DEFAULT_NOMINAL_TEMP_K : cToK(spec.nominalTempC),
    ...(spec.vfTempCoVPerK === undefined ? {} : { linearTempCoVPerK: spec.vfTempCoVPerK }),
  };
}

/** The Eg/XTI defaults a diode falls back on, in `assumptions` (an Eg the points fit is not a default). */
function pushLawDefaults(
  spec: DiodeSpec,
  junction: Junction,
  path: (string | number)[],
  assumptions: string[],
  egFitted: boolean,
): void {
  const defaults = JUNCTION_DEFAULTS[junction];
  const linear = spec.model === "points" && spec.temperatureLaw === "linear";
  if (
    linear ||
    spec.vfTempCoVPerK !== undefined ||
    (spec.energyGapEv !== undefined && spec.saturationTempExponent !== undefined)
  )
    return;
  const kind = junction === "pn" ? "PN" : "Schottky";
  if (egFitted) {
    if (spec.saturationTempExponent === undefined)
      assumptions.push(
        `${path.join(".")}: XTI ${defaults.saturationTempExponent} (SPICE level-1 default for a ${kind} junction, common practice); Eg fitted to the points`,
      );
    return;
  }
  assumptions.push(
    `${path.join(".")}: Eg ${spec.energyGapEv ?? defaults.energyGapEv} eV, XTI ${spec.saturationTempExponent ?? defaults.saturationTempExponent} ` +
      `(SPICE level-1 defaults for a ${kind} junction, common practice)`,
  );
}

/**
 * Fit a points diode: two or three points exactly (as always), four or more by least squares,
 * gated at 2 % of Vf (acceptFit overrides) with the fit's residuals in `assumptions`.
 */
export function fitDiodePoints(
  spec: PointsSpec,
  junction: Junction,
  path: (string | number)[],
  assumptions: string[],
): Extract<DiodeFitResult, { ok: true }> {
  const defaults = JUNCTION_DEFAULTS[junction];
  const keys = spec.points.map((p) => `${p.currentA} A at ${p.tempC ?? 25} °C`);
  const twin = keys.findIndex((k, i) => keys.indexOf(k) !== i);
  if (twin >= 0) {
    const first = keys.indexOf(keys[twin] as string);
    throw inputProblem(
      "fit-failed",
      [...path, "points", twin],
      `points ${first} and ${twin} share the same current and temperature (${keys[twin]}; a point without tempC is at 25 °C): give each point its tempC, or drop one`,
    );
  }
  const untimed = spec.points.flatMap((p, i) => (p.tempC === undefined ? [i] : []));
  if (untimed.length > 0)
    assumptions.push(
      `${[...path, "points"].join(".")}[${untimed.join(", ")}].tempC: 25 °C (default: the datasheet's usual room-temperature curve)`,
    );
  const fit = fitDiode(
    spec.points.map((p) => ({ currentA: p.currentA, voltageV: p.voltageV, tempK: cToK(p.tempC ?? 25) })),
    {
      energyGapEv: spec.energyGapEv ?? defaults.energyGapEv,
      saturationTempExponent: spec.saturationTempExponent ?? defaults.saturationTempExponent,
      nominalTempK: DEFAULT_NOMINAL_TEMP_K,
      fitEnergyGap: spec.energyGapEv === undefined && spec.vfTempCoVPerK === undefined,
      fitLinearTempCo: spec.temperatureLaw === "linear",
      ...(spec.vfTempCoVPerK === undefined ? {} : { linearTempCoVPerK: spec.vfTempCoVPerK }),
      ...(spec.seriesResistanceOhm === undefined ? {} : { seriesResistanceOhm: spec.seriesResistanceOhm }),
    },
  );
  if (!fit.ok) {
    if (fit.points.length === 0) throw inputProblem("fit-failed", [...path, "points"], fit.message);
    const defaulted = fit.points.filter((i) => untimed.includes(i));
    const note = defaulted.length === 0 ? "" : ` (point ${defaulted.join(", ")} gives no tempC and is taken at 25 °C)`;
    throw refusedFit([...path, "points"], fit.message + note, fit.points);
  }
  pushLawDefaults(spec, junction, path, assumptions, fit.fitted.includes("energyGapEv"));
  if (!fit.exact) {
    const pt = (i: number) => {
      const p = spec.points[i];
      return p === undefined ? "" : `${p.currentA} A, ${p.voltageV} V, ${p.tempC ?? 25} °C`;
    };
    const law = fit.fitted.includes("linearTempCoVPerK")
      ? ", linear Vf temperature coefficient fitted"
      : fit.fitted.includes("energyGapEv")
        ? ", Eg fitted"
        : spec.vfTempCoVPerK === undefined
          ? " fitted (Eg held)"
          : " fitted (linear Vf temperature coefficient held)";
    assumptions.push(
      gateFit(
        fit.quality,
        spec.acceptFit,
        [...path, "points"],
        `${path.join(".")}: Is, n, Rs${law}`,
        "V",
        spec.points.length,
        pt,
      ),
    );
  }
  return fit;
}
