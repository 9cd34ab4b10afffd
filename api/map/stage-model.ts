import type { StageSpec } from "../../contracts/stage.js";
import { cToK, kToC } from "../../domain/physics/constants.js";
import type { DiodeParams } from "../../domain/physics/diode.js";
import { DEFAULT_SCHOTTKY_BARRIER_EV } from "../../domain/physics/schottky-leakage.js";
import type { RdsTempLaw } from "../../domain/physics/mosfet-channel.js";
import type { ThermalPath } from "../../domain/physics/thermal-path.js";
import type { ControllerModel, DatasheetLeakage, MosfetModel, StageModel } from "../../domain/stages/stage-model.js";
import { inputProblem } from "../input-problem.js";
import { toDiodeParams } from "./diode-params.js";
import { fitLeakageCurve } from "./leakage-curve.js";
import { fitRdsTempCurve } from "./rds-temp-curve.js";

type MosfetSpec = Extract<StageSpec, { mosfet: unknown }>["mosfet"];
type TempLawSpec = NonNullable<MosfetSpec["rdsOnTemp"]>;

/** Default Rds(on) temperature exponent [common practice; docs/references.md, mobility exponents 2.2-2.33]. */
export const DEFAULT_RDS_EXPONENT = 2.3;

/** Contract stage → domain stage model; records every default it applies in `assumptions`. */
export function toStageModel(
  spec: StageSpec,
  thermal: ThermalPath,
  path: (string | number)[],
  assumptions: string[],
): StageModel {
  switch (spec.kind) {
    case "pn-diode":
    case "schottky-diode": {
      const diode = toDiodeParams(spec.diode, DIODE_TECHNOLOGY[spec.kind], [...path, "diode"], assumptions);
      return {
        kind: spec.kind,
        diode,
        reverseRatingV: spec.reverseRatingV,
        ...leakageOf(spec, diode, [...path, "reverseLeakage"], assumptions),
        tjMaxC: spec.tjMaxC,
        thermal,
        ...(spec.avalancheEnergyJ === undefined ? {} : { avalancheEnergyJ: spec.avalancheEnergyJ }),
        ...(spec.peakRepetitiveCurrentA === undefined ? {} : { peakRepetitiveCurrentA: spec.peakRepetitiveCurrentA }),
      };
    }
    case "pfet-high-side":
    case "nfet-low-side":
      return {
        kind: spec.kind,
        mosfet: toMosfet(spec.mosfet, [...path, "mosfet"], assumptions),
        ...(spec.gateClampV === undefined ? {} : { gateClampV: spec.gateClampV }),
        thermal,
      };
    case "nfet-ideal-diode":
      return {
        kind: spec.kind,
        mosfet: toMosfet(spec.mosfet, [...path, "mosfet"], assumptions),
        controller: toController(spec.controller),
        thermal,
      };
    case "nfet-back-to-back": {
      if ((spec.controller.gateReleaseFraction ?? 0) > 0) {
        throw inputProblem(
          "invalid-input",
          [...path, "controller", "gateReleaseFraction"],
          "must be 0 for a back-to-back pair: with the gates released the input-side FET blocks, so the pair has no body-diode path (give a continuous charge pump, 0)",
        );
      }
      return {
        kind: spec.kind,
        mosfet: toMosfet(spec.mosfet, [...path, "mosfet"], assumptions),
        controller: toController(spec.controller),
        blocksReverseCurrent: pairBlocksReverse(spec, path, assumptions),
        thermal,
      };
    }
    case "integrated-switch":
      return {
        kind: spec.kind,
        channel: {
          rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: spec.onResistanceOhm }],
          thresholdV: 1,
          tempLaw: toTempLaw(spec.onResistanceTemp, [...path, "onResistanceTemp"], assumptions),
        },
        internalGateV: 10,
        startV: spec.startV,
        belowStart:
          spec.belowStart === "body-diode" && spec.bodyDiode !== undefined
            ? {
                mode: "body-diode",
                bodyDiode: toDiodeParams(spec.bodyDiode, "pn", [...path, "bodyDiode"], assumptions),
              }
            : { mode: "blocks" },
        regulatedDropV: spec.regulatedDropV,
        quiescentA: spec.quiescentA,
        maxVoltageV: spec.maxVoltageV,
        ...(spec.reverseRatingV === undefined ? {} : { reverseRatingV: spec.reverseRatingV }),
        blocksReverseCurrent: blocksReverse(spec, path, assumptions),
        ...(spec.avalancheEnergyJ === undefined ? {} : { avalancheEnergyJ: spec.avalancheEnergyJ }),
        ...(spec.currentLimitA === undefined ? {} : { currentLimitA: spec.currentLimitA }),
        ...(spec.thermalShutdownC === undefined ? {} : { thermalShutdownC: spec.thermalShutdownC }),
        ...(spec.afterThermalShutdown === undefined ? {} : { afterThermalShutdown: spec.afterThermalShutdown }),
        ...overvoltageCutoff(spec, path, assumptions),
        tjMaxC: spec.tjMaxC,
        thermal,
      };
  }
}

type ControllerSpec = Extract<StageSpec, { kind: "nfet-ideal-diode" }>["controller"];

/** An integrated switch's overvoltage cut-off; without a response time it is taken as instant (declared). */
function overvoltageCutoff(
  spec: Extract<StageSpec, { kind: "integrated-switch" }>,
  path: readonly (string | number)[],
  assumptions: string[],
): { overvoltageCutoffV?: number; overvoltageResponseS?: number; overvoltageHysteresisV?: number } {
  if (spec.overvoltageCutoffV === undefined) return {};
  if (spec.overvoltageResponseS === undefined)
    assumptions.push(
      `${[...path, "overvoltageResponseS"].join(".")}: not given: the cut-off is taken as instant (the load sees its threshold ${spec.overvoltageCutoffV} V at most)`,
    );
  if (spec.overvoltageHysteresisV === undefined)
    assumptions.push(
      `${[...path, "overvoltageHysteresisV"].join(".")}: not given: the cut-off's hysteresis is taken as 0 (the switch recloses as soon as its input is back below the ${spec.overvoltageCutoffV} V threshold)`,
    );
  return {
    overvoltageCutoffV: spec.overvoltageCutoffV,
    ...(spec.overvoltageResponseS === undefined ? {} : { overvoltageResponseS: spec.overvoltageResponseS }),
    ...(spec.overvoltageHysteresisV === undefined ? {} : { overvoltageHysteresisV: spec.overvoltageHysteresisV }),
  };
}

/** The contract's diode kinds and the technology their forward fit assumes. */
const DIODE_TECHNOLOGY = { "pn-diode": "pn", "schottky-diode": "schottky" } as const;

function toController(c: ControllerSpec): ControllerModel {
  return {
    startV: c.startV,
    gateDrive: c.gateDrive,
    regulatedDropV: c.regulatedDropV,
    quiescentA: c.quiescentA,
    gateReleaseFraction: c.gateReleaseFraction ?? 0,
    ...(c.maxInputV === undefined ? {} : { maxInputV: c.maxInputV }),
    ...(c.reverseRatingV === undefined ? {} : { reverseRatingV: c.reverseRatingV }),
  };
}

function pairBlocksReverse(
  spec: Extract<StageSpec, { kind: "nfet-back-to-back" }>,
  path: (string | number)[],
  assumptions: string[],
): boolean {
  if (spec.blocksReverseCurrent !== undefined) return spec.blocksReverseCurrent;
  const blocks = spec.controller.regulatedDropV > 0 || spec.controller.reverseThresholdV !== undefined;
  assumptions.push(
    `${path.join(".")}: ${blocks ? "blocks" : "does not block"} reverse current (default: ${blocks ? "the controller regulates a drop or states a reverse threshold, an ideal-diode controller" : "the controller neither regulates a drop nor states a reverse threshold, a plain gate driver"})`,
  );
  return blocks;
}

/** The threshold's temperature coefficient, V/K: given, or the line through thresholdAtTj and the 25 °C value; absent: none. */
function thresholdTempCo(m: MosfetSpec): { thresholdTempCoVPerK?: number } {
  if (m.thresholdTempCoVPerK !== undefined) return { thresholdTempCoVPerK: m.thresholdTempCoVPerK };
  const at = m.thresholdAtTj;
  return at === undefined ? {} : { thresholdTempCoVPerK: (at.thresholdV - m.thresholdV) / (at.tjC - 25) };
}

function toMosfet(m: MosfetSpec, path: (string | number)[], assumptions: string[]): MosfetModel {
  return {
    channel: {
      rdsOnPoints: [...m.rdsOn].sort((a, b) => a.gateSourceV - b.gateSourceV),
      thresholdV: m.thresholdV,
      ...thresholdTempCo(m),
      tempLaw: toTempLaw(m.rdsOnTemp, [...path, "rdsOnTemp"], assumptions),
    },
    bodyDiode: toDiodeParams(m.bodyDiode, "pn", [...path, "bodyDiode"], assumptions),
    vdsMaxV: m.vdsMaxV,
    vgsMaxV: m.vgsMaxV,
    tjMaxC: m.tjMaxC,
    ...(m.avalancheEnergyJ === undefined ? {} : { avalancheEnergyJ: m.avalancheEnergyJ }),
    ...(m.peakRepetitiveCurrentA === undefined ? {} : { peakRepetitiveCurrentA: m.peakRepetitiveCurrentA }),
    ...(m.avalancheCurrentA === undefined ? {} : { avalancheCurrentA: m.avalancheCurrentA }),
    ...(m.soa === undefined ? {} : { soa: m.soa }),
    ...(m.offStateLeakage === undefined
      ? {}
      : { offStateLeakage: { currentA: m.offStateLeakage.currentA, tempK: cToK(m.offStateLeakage.tempC) } }),
    ...(m.repetitiveAvalancheEnergyJ === undefined ? {} : { repetitiveAvalancheEnergyJ: m.repetitiveAvalancheEnergyJ }),
    ...(m.vdsTempCoPerK === undefined ? {} : { vdsTempCoPerK: m.vdsTempCoPerK }),
  };
}

function toTempLaw(law: TempLawSpec | undefined, path: (string | number)[], assumptions: string[]): RdsTempLaw {
  if (law === undefined) {
    assumptions.push(
      `${path.join(".")}: Rds(on) scales as (T/298.15 K)^${DEFAULT_RDS_EXPONENT} (default exponent, common practice)`,
    );
    return { law: "power", exponent: DEFAULT_RDS_EXPONENT };
  }
  if (law.law === "power") return { law: "power", exponent: law.exponent };
  if (law.law === "power-fit")
    return { law: "power", exponent: fitRdsTempCurve(law, true, path, assumptions).fit.params.exponent };
  return { law: "points", points: law.points.map((p) => ({ tempK: cToK(p.tjC), factor: p.factor })) };
}

type DiodeSpec = Extract<StageSpec, { kind: "pn-diode" | "schottky-diode" }>;

/**
 * A diode's reverse leakage law. A Schottky's follows thermionic emission over its barrier
 * (schottky-leakage.ts), never the forward fit's Is(T), whose fitted n flattens it: from its one
 * figure, from its fitted curves, or, with neither, from the forward model's Is at its nominal
 * temperature. A PN diode's one figure is scaled by the junction's Is(T); with none, Is(T) itself.
 */
function leakageOf(
  spec: DiodeSpec,
  diode: DiodeParams,
  path: (string | number)[],
  assumptions: string[],
): { reverseLeakage?: DatasheetLeakage } {
  const l = spec.reverseLeakage;
  if (l !== undefined && "points" in l)
    return { reverseLeakage: { law: fitLeakageCurve(l, path, assumptions).fit.params } };
  if (spec.kind === "pn-diode")
    return l === undefined ? {} : { reverseLeakage: { currentA: l.currentA, tempK: cToK(l.tempC) } };
  const where = path.join(".");
  const figure = l as
    | { currentA: number; tempC: number; reverseV?: number; barrierEv?: number; voltageExponent?: number }
    | undefined;
  const barrierEv = figure?.barrierEv ?? DEFAULT_SCHOTTKY_BARRIER_EV;
  if (figure?.barrierEv === undefined) {
    assumptions.push(
      `${where}: barrier height ${DEFAULT_SCHOTTKY_BARRIER_EV} eV for the thermionic-emission leakage law (default, memory: silicon power Schottky barriers lie about 0.5–0.8 eV; the steep end makes hot leakage err high)`,
    );
  }
  if (figure === undefined) {
    assumptions.push(
      `${where}: no datasheet leakage: the forward model's Is at ${kToC(diode.nominalTempK)} °C taken as the reverse current there, carried in temperature by thermionic emission`,
    );
    return {
      reverseLeakage: {
        law: {
          refCurrentA: diode.saturationCurrentA,
          refTempK: diode.nominalTempK,
          refVoltageV: spec.reverseRatingV,
          barrierEv,
          voltageExponent: 0,
        },
      },
    };
  }
  const voltageExponent = figure.voltageExponent ?? 0;
  if (figure.voltageExponent === undefined)
    assumptions.push(
      `${where}: leakage taken independent of the reverse voltage (m = 0: the figure's current at every voltage, an upper bound below the figure's voltage)`,
    );
  return {
    reverseLeakage: {
      law: {
        refCurrentA: figure.currentA,
        refTempK: cToK(figure.tempC),
        refVoltageV: figure.reverseV ?? spec.reverseRatingV,
        barrierEv,
        voltageExponent,
      },
    },
  };
}

function blocksReverse(
  spec: Extract<StageSpec, { kind: "integrated-switch" }>,
  path: (string | number)[],
  assumptions: string[],
): boolean {
  if (spec.blocksReverseCurrent !== undefined) return spec.blocksReverseCurrent;
  const blocks = spec.regulatedDropV > 0;
  assumptions.push(
    `${path.join(".")}: ${blocks ? "blocks" : "does not block"} reverse current (default from regulatedDropV ${blocks ? "> 0: an ideal-diode type" : "= 0: a plain switch"})`,
  );
  return blocks;
}
