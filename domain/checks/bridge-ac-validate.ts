import type { AcSourceAndFilter } from "../solve/ac-bridge-circuit.js";

interface AcInputs extends AcSourceAndFilter {
  readonly ambientC: number;
}

/**
 * The checks the AC model needs before it can integrate: a finite positive frequency, voltage and
 * capacitance, non-negative resistances and inductance, a positive load. The contract checks the
 * same; the domain repeats them so no caller can feed it a NaN-producing model.
 */
export function validateAcModel(m: AcInputs): { path: string; reason: string } | undefined {
  const positive: readonly [string, number][] = [
    ["sourceRmsV", m.sourceRmsV],
    ["frequencyHz", m.frequencyHz],
    ["capacitanceF", m.capacitanceF],
  ];
  for (const [path, v] of positive) {
    if (!(Number.isFinite(v) && v > 0))
      return { path, reason: `${path} must be a finite number above zero (got ${v})` };
  }
  const nonNegative: readonly [string, number][] = [
    ["sourceResistanceOhm", m.sourceResistanceOhm],
    ["leakageInductanceH", m.leakageInductanceH],
    ["esrOhm", m.esrOhm],
  ];
  for (const [path, v] of nonNegative) {
    if (!(Number.isFinite(v) && v >= 0))
      return { path, reason: `${path} must be a finite number of zero or more (got ${v})` };
  }
  if (!Number.isFinite(m.ambientC)) return { path: "ambientC", reason: "ambientC must be finite" };
  const l = m.load;
  const [path, v] =
    l.kind === "resistive"
      ? ["load.resistanceOhm", l.resistanceOhm]
      : l.kind === "constant-current"
        ? ["load.currentA", l.currentA]
        : ["load.powerW", l.powerW];
  if (!(Number.isFinite(v) && v > 0)) return { path, reason: `${path} must be a finite number above zero (got ${v})` };
  return undefined;
}
