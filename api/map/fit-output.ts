import type { FitOutput, FitSpec } from "../../contracts/fit.js";
import { type FitQuality, withinBound } from "../../domain/fit/fit-quality.js";
import { kToC } from "../../domain/physics/constants.js";
import { fitDiodePoints } from "./diode-params.js";
import { fitLeakageCurve } from "./leakage-curve.js";
import { fitRdsTempCurve } from "./rds-temp-curve.js";
import { fitZthCurve } from "./transient-thermal.js";

type Parsed<C extends FitSpec["curve"]> = Extract<FitSpec, { curve: C }>;
type Body = Omit<FitOutput, "modelVersion" | "caution" | "assumptions" | "record">;
type Parameter = FitOutput["parameters"][number];

const param = (name: string, value: number, unit: string, fitted: boolean, standardError?: number): Parameter => ({
  name,
  value,
  unit,
  fitted,
  ...(standardError === undefined || !Number.isFinite(standardError) ? {} : { standardError }),
});

function qualityOf(q: FitQuality, unit: string): FitOutput["quality"] {
  return {
    unit,
    rms: q.rms,
    worstPoint: q.worstIndex,
    worstResidual: q.worst,
    worstFraction: q.worstFraction,
    boundFraction: q.boundFraction,
    withinBound: withinBound(q),
    converged: q.converged,
    iterations: q.iterations,
    ...(q.stopReason === undefined ? {} : { stopReason: q.stopReason }),
  };
}

const residualsOf = (measured: readonly number[], modelled: readonly number[]) =>
  measured.map((m, point) => ({
    point,
    measured: m,
    modelled: modelled[point] ?? 0,
    residual: (modelled[point] ?? 0) - m,
  }));

export function diodeForwardFit(input: Parsed<"diode-forward">, assumptions: string[]): Body {
  const fit = fitDiodePoints(input.diode, input.junction, ["diode"], assumptions);
  const p = fit.params;
  const se = fit.standardErrors;
  const has = (n: (typeof fit.fitted)[number]) => fit.fitted.includes(n);
  const linear = p.linearTempCoVPerK;
  return {
    curve: "diode-forward",
    method: fit.exact ? "exact" : "least-squares",
    parameters: [
      param(
        "saturationCurrentA",
        p.saturationCurrentA,
        "A",
        true,
        se.lnSaturationCurrent === undefined ? undefined : se.lnSaturationCurrent * p.saturationCurrentA,
      ),
      param("ideality", p.ideality, "1", true, se.ideality),
      param("seriesResistanceOhm", p.seriesResistanceOhm, "ohm", has("seriesResistanceOhm"), se.seriesResistanceOhm),
      ...(linear === undefined
        ? [
            param("energyGapEv", p.energyGapEv, "eV", has("energyGapEv"), se.energyGapEv),
            param("saturationTempExponent", p.saturationTempExponent, "1", false),
          ]
        : [param("vfTempCoVPerK", linear, "V/K", has("linearTempCoVPerK"), se.linearTempCoVPerK)]),
    ],
    model: {
      model: "shockley",
      saturationCurrentA: p.saturationCurrentA,
      ideality: p.ideality,
      seriesResistanceOhm: p.seriesResistanceOhm,
      ...(linear === undefined
        ? { energyGapEv: p.energyGapEv, saturationTempExponent: p.saturationTempExponent }
        : { vfTempCoVPerK: linear }),
      nominalTempC: kToC(p.nominalTempK),
    },
    quality: qualityOf(fit.quality, "V"),
    residuals: residualsOf(
      input.diode.points.map((pt) => pt.voltageV),
      fit.modelledV,
    ),
  };
}

export function rdsOnTemperatureFit(input: Parsed<"rds-on-temperature">, assumptions: string[]): Body {
  const { fit, exact } = fitRdsTempCurve(input, false, [], assumptions);
  return {
    curve: "rds-on-temperature",
    method: exact ? "exact" : "least-squares",
    parameters: [
      param("rdsOn25Ohm", fit.params.r25, "ohm", true, fit.standardErrors.r25),
      param("exponent", fit.params.exponent, "1", true, fit.standardErrors.exponent),
    ],
    model: { law: "power", exponent: fit.params.exponent },
    quality: qualityOf(fit.quality, "ohm"),
    residuals: residualsOf(
      input.points.map((p) => p.rdsOnOhm),
      fit.modelled,
    ),
  };
}

export function zthFit(input: Parsed<"zth">, assumptions: string[]): Body {
  const { fit, exact } = fitZthCurve(input, undefined, [], assumptions);
  return {
    curve: "zth",
    method: exact ? "exact" : "least-squares",
    parameters: [
      ...fit.params.terms.flatMap((t, i) => [
        param(`rKPerW[${i}]`, t.rKPerW, "K/W", true),
        param(`tauS[${i}]`, t.tauS, "s", true),
      ]),
      param("steadyKPerW", fit.params.steadyKPerW, "K/W", input.steadyKPerW === undefined),
    ],
    model: { kind: "foster", terms: fit.params.terms.map((t) => ({ rKPerW: t.rKPerW, tauS: t.tauS })) },
    quality: qualityOf(fit.quality, "K/W"),
    residuals: residualsOf(
      input.points.map((p) => p.zthKPerW),
      fit.modelled,
    ),
  };
}

export function reverseLeakageFit(input: Parsed<"reverse-leakage">, assumptions: string[]): Body {
  const { fit, fitsVoltage: fitM, exact } = fitLeakageCurve(input, [], assumptions);
  const l = fit.params;
  const se = fit.standardErrors;
  return {
    curve: "reverse-leakage",
    method: exact ? "exact" : "least-squares",
    parameters: [
      param("barrierEv", l.barrierEv, "eV", true, se.barrierEv),
      param("voltageExponent", l.voltageExponent, "1", fitM, se.voltageExponent),
      param("refCurrentA", l.refCurrentA, "A", true, se.refCurrentA),
    ],
    model: {
      law: "thermionic-emission",
      barrierEv: l.barrierEv,
      voltageExponent: l.voltageExponent,
      refCurrentA: l.refCurrentA,
      refTempC: kToC(l.refTempK),
      refVoltageV: l.refVoltageV,
    },
    quality: qualityOf(fit.quality, "A"),
    residuals: residualsOf(
      input.points.map((p) => p.currentA),
      fit.modelled,
    ),
  };
}
