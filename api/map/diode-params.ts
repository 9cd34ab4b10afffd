import type { DiodeSpec } from "../../contracts/diode.js";
import { cToK } from "../../domain/physics/constants.js";
import { DEFAULT_NOMINAL_TEMP_K, type DiodeParams, JUNCTION_DEFAULTS } from "../../domain/physics/diode.js";
import { fitDiode } from "../../domain/physics/diode-fit.js";
import { inputProblem } from "../input-problem.js";

export type Junction = keyof typeof JUNCTION_DEFAULTS;

/** Contract diode → domain Shockley parameters, fitting datasheet points where given. */
export function toDiodeParams(spec: DiodeSpec, junction: Junction, path: (string | number)[], assumptions: string[]): DiodeParams {
  const defaults = JUNCTION_DEFAULTS[junction];
  const linear = spec.vfTempCoVPerK === undefined ? {} : { linearTempCoVPerK: spec.vfTempCoVPerK };
  if (spec.vfTempCoVPerK === undefined && (spec.energyGapEv === undefined || spec.saturationTempExponent === undefined)) {
    assumptions.push(
      `${path.join(".")}: Eg ${spec.energyGapEv ?? defaults.energyGapEv} eV, XTI ${spec.saturationTempExponent ?? defaults.saturationTempExponent} ` +
        `(SPICE level-1 defaults for a ${junction === "pn" ? "PN" : "Schottky"} junction, common practice)`,
    );
  }
  const energyGapEv = spec.energyGapEv ?? defaults.energyGapEv;
  const saturationTempExponent = spec.saturationTempExponent ?? defaults.saturationTempExponent;
  if (spec.model === "shockley") {
    return {
      saturationCurrentA: spec.saturationCurrentA,
      ideality: spec.ideality,
      seriesResistanceOhm: spec.seriesResistanceOhm,
      energyGapEv,
      saturationTempExponent,
      nominalTempK: spec.nominalTempC === undefined ? DEFAULT_NOMINAL_TEMP_K : cToK(spec.nominalTempC),
      ...linear,
    };
  }
  const currents = new Set(spec.points.map((p) => `${p.currentA}@${p.tempC ?? 25}`));
  if (currents.size !== spec.points.length) {
    throw inputProblem("fit-failed", [...path, "points"], "two points share the same current and temperature");
  }
  const fit = fitDiode(
    spec.points.map((p) => ({ currentA: p.currentA, voltageV: p.voltageV, tempK: cToK(p.tempC ?? 25) })),
    {
      energyGapEv,
      saturationTempExponent,
      nominalTempK: DEFAULT_NOMINAL_TEMP_K,
      ...linear,
      ...(spec.seriesResistanceOhm === undefined ? {} : { seriesResistanceOhm: spec.seriesResistanceOhm }),
    },
  );
  if (!fit.ok) throw inputProblem("fit-failed", [...path, "points"], fit.message);
  return fit.params;
}
