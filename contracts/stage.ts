import { z } from "zod";
import { curvePoints, leakagePoint } from "./curve-points.js";
import { diode } from "./diode.js";
import { mosfet, rdsTempLaw } from "./mosfet.js";
import { quantity, ratio, temperatureC } from "./quantity.js";
import { thermalPath } from "./thermal.js";

const volts = (d: string) => quantity("V", d, { gt: 0, le: 10_000 });
const name = z.string().min(1).max(200).optional().meta({ description: "a label for reports" });
const costEach = z
  .number()
  .gte(0)
  .lte(1e6)
  .optional()
  .meta({ description: "unit cost in the caller's currency, for ranking", unit: "currency" });

export const reverseLeakageCurve = z
  .strictObject({
    points: curvePoints(leakagePoint, {
      min: 2,
      max: 64,
      description: "IR(Tj, VR) points read off the datasheet's curves, at two junction temperatures or more",
    }),
    acceptFit: z.boolean().optional().meta({
      description: "use a fit whose worst residual exceeds 25 % of IR (default false: refused, naming the point)",
    }),
  })
  .meta({
    description:
      "reverse leakage curves: fitted to IR = Iref·(T/Tref)²·exp(−(ΦB/k)·(1/T − 1/Tref))·(VR/Vref)^m (thermionic emission over the barrier ΦB)",
  });

const leakageFigure = {
  currentA: quantity("A", "datasheet reverse current", { gt: 0, le: 10 }),
  tempC: temperatureC("junction temperature of that figure"),
};

const pnLeakagePoint = z
  .strictObject(leakageFigure)
  .meta({ description: "one figure at the rated voltage, scaled in temperature by the junction's Is(T) law" });

/** A Schottky's one datasheet figure and the thermionic-emission law that carries it in Tj and VR (schottky-leakage.ts). */
const schottkyLeakagePoint = z
  .strictObject({
    ...leakageFigure,
    reverseV: volts("reverse voltage of that figure (default: the rated reverse voltage)").optional(),
    barrierEv: z.number().gte(0.2).lte(1.5).optional().meta({
      description:
        "barrier height ΦB of IR ∝ T²·exp(−q·ΦB/(k·T)), eV (default 0.7 eV: toward the steep end of silicon power Schottky barriers, so hot leakage errs high)",
      unit: "eV",
    }),
    voltageExponent: ratio(
      "power m of IR ∝ VR^m (default 0: the figure's current at every reverse voltage up to it, an upper bound below it)",
      { ge: 0, le: 3 },
    ).optional(),
  })
  .meta({
    description:
      "one figure scaled by thermionic emission: IR = I·(T/T0)²·exp(−(ΦB/k)·(1/T − 1/T0))·(VR/V0)^m, independent of the forward fit",
  });

const diodeStage = (kind: "pn-diode" | "schottky-diode") =>
  z.strictObject({
    kind: z.literal(kind),
    name,
    costEach,
    diode,
    reverseRatingV: volts("repetitive peak reverse voltage rating VRRM"),
    reverseLeakage: z
      .union([kind === "schottky-diode" ? schottkyLeakagePoint : pnLeakagePoint, reverseLeakageCurve])
      .optional()
      .meta({
        description:
          kind === "schottky-diode"
            ? "datasheet reverse leakage: one figure scaled by thermionic emission over the barrier (barrierEv, default 0.7 eV), or IR(Tj, VR) points fitted to that law (default: the forward fit's Is at its nominal temperature, scaled by the same law)"
            : "datasheet reverse leakage: one figure at the rated voltage, or IR(Tj, VR) points fitted to the thermionic-emission law (default: Is(T) of the diode model)",
      }),
    tjMaxC: temperatureC("maximum junction temperature"),
    thermal: thermalPath,
    avalancheEnergyJ: quantity(
      "J",
      "single-pulse avalanche energy rating at 25 °C starting junction temperature (for the turn-off rules)",
      { gt: 0, le: 1e6 },
    ).optional(),
    peakRepetitiveCurrentA: quantity("A", "repetitive peak forward current rating IFRM (for the bridge rules)", {
      gt: 0,
      le: 1e5,
    }).optional(),
  });

export const controller = z
  .strictObject({
    startV: quantity("V", "input voltage from which the controller runs and drives the gate", { ge: 0, le: 10_000 }),
    gateDrive: z
      .array(
        z.strictObject({
          inputV: quantity("V", "input voltage", { ge: 0, le: 10_000 }),
          gateSourceV: quantity("V", "gate-source drive the charge pump delivers", { ge: 0, le: 100 }),
        }),
      )
      .min(1)
      .meta({ description: "gate drive against input voltage, increasing inputV; held flat outside" }),
    regulatedDropV: quantity("V", "forward drop the controller regulates to at light load (0: none)", { ge: 0, le: 1 }),
    quiescentA: quantity("A", "quiescent current from the input to ground", { ge: 0, le: 1 }),
    gateReleaseFraction: ratio("share of time a duty-cycled charge pump releases the gate (0 for a continuous pump)", {
      ge: 0,
      le: 1,
    }).optional(),
    maxInputV: volts("absolute maximum input voltage of the controller").optional(),
    reverseRatingV: volts("reverse voltage the controller's input withstands (magnitude)").optional(),
    reverseThresholdV: quantity("V", "reverse drop at which the controller turns the MOSFET off", {
      ge: 0,
      le: 10,
    }).optional(),
    turnOffDelayS: quantity("s", "delay from reverse threshold to gate off", { ge: 0, le: 1 }).optional(),
  })
  .superRefine((c, ctx) => {
    c.gateDrive.forEach((p, i) => {
      const prev = c.gateDrive[i - 1];
      if (prev && !(p.inputV > prev.inputV))
        ctx.addIssue({ code: "custom", path: ["gateDrive", i, "inputV"], message: "input voltages must increase" });
    });
  });

export const stageSpec = z
  .discriminatedUnion("kind", [
    diodeStage("pn-diode"),
    diodeStage("schottky-diode"),
    z.strictObject({
      kind: z.literal("pfet-high-side"),
      name,
      costEach,
      mosfet,
      gateClampV: volts("gate-source zener clamp").optional(),
      thermal: thermalPath,
    }),
    z.strictObject({
      kind: z.literal("nfet-low-side"),
      name,
      costEach,
      mosfet,
      gateClampV: volts("gate-source zener clamp").optional(),
      thermal: thermalPath,
    }),
    z.strictObject({ kind: z.literal("nfet-ideal-diode"), name, costEach, mosfet, controller, thermal: thermalPath }),
    z
      .strictObject({
        kind: z.literal("nfet-back-to-back"),
        name,
        costEach,
        mosfet: mosfet.meta({ description: "each of the two N-channel MOSFETs (the same part), sources joined" }),
        controller: controller.meta({
          description: "the controller or gate driver driving both gates from its charge pump",
        }),
        blocksReverseCurrent: z.boolean().optional().meta({
          description:
            "an ideal-diode controller that turns both FETs off on reverse current (default: true when the controller regulates a drop or states a reverse threshold; false: a plain gate driver, a load switch)",
        }),
        thermal: thermalPath.meta({ description: "thermal path of the pair: both FETs' losses heat it" }),
      })
      .meta({ description: "back-to-back N-channel MOSFETs (common source): blocks both ways when off" }),
    z
      .strictObject({
        kind: z.literal("integrated-switch"),
        name,
        costEach,
        onResistanceOhm: quantity("ohm", "on-resistance at 25 °C", { gt: 0, le: 1e3 }),
        onResistanceTemp: rdsTempLaw.optional(),
        startV: quantity("V", "input voltage from which the switch turns on (UVLO)", { ge: 0, le: 10_000 }),
        belowStart: z
          .enum(["body-diode", "blocks"])
          .meta({ description: "below start: the body diode conducts, or the switch blocks" }),
        bodyDiode: diode.optional(),
        regulatedDropV: quantity("V", "regulated forward drop (ideal-diode type; 0: plain switch)", { ge: 0, le: 1 }),
        quiescentA: quantity("A", "quiescent current", { ge: 0, le: 1 }),
        maxVoltageV: volts("absolute maximum input voltage"),
        reverseRatingV: volts("reverse voltage the switch blocks (absent: not rated for reverse)").optional(),
        avalancheEnergyJ: quantity(
          "J",
          "single-pulse energy its internal FET or clamp absorbs at 25 °C start (for the turn-off rules)",
          { gt: 0, le: 1e6 },
        ).optional(),
        blocksReverseCurrent: z.boolean().optional().meta({
          description: "turns off on reverse current (default: true when regulatedDropV > 0, i.e. an ideal-diode type)",
        }),
        currentLimitA: quantity("A", "current limit (also into the output capacitance at start-up)", {
          gt: 0,
          le: 1e4,
        }).optional(),
        thermalShutdownC: temperatureC(
          "junction temperature at which the switch shuts itself down (absent: no thermal shutdown)",
        ).optional(),
        afterThermalShutdown: z
          .discriminatedUnion("mode", [
            z.strictObject({ mode: z.literal("latched") }),
            z.strictObject({
              mode: z.literal("auto-retry"),
              hysteresisK: quantity(
                "K",
                "the junction cools by this below the shutdown before the switch turns on again",
                {
                  gt: 0,
                  le: 200,
                },
              ),
            }),
          ])
          .optional()
          .meta({
            description:
              "after a thermal shutdown: latched off until power is cycled, or auto-retry once the junction has cooled by hysteresisK (absent: latched)",
          }),
        overvoltageCutoffV: volts(
          "input voltage above which the switch opens, keeping a surge from the load (absent: no overvoltage cut-off)",
        ).optional(),
        overvoltageResponseS: quantity(
          "s",
          "time from the input crossing the cut-off threshold to the switch open (absent: taken as instant)",
          { ge: 0, le: 1 },
        ).optional(),
        overvoltageHysteresisV: quantity(
          "V",
          "hysteresis of the overvoltage cut-off: once open, the switch recloses only when its input falls below the threshold minus this (absent: 0)",
          { ge: 0, le: 10_000 },
        ).optional(),
        tjMaxC: temperatureC("maximum junction temperature"),
        thermal: thermalPath,
      })
      .superRefine((s, ctx) => {
        if (s.belowStart === "body-diode" && s.bodyDiode === undefined) {
          ctx.addIssue({ code: "custom", path: ["bodyDiode"], message: "required when belowStart is body-diode" });
        }
        if (s.afterThermalShutdown !== undefined && s.thermalShutdownC === undefined) {
          ctx.addIssue({
            code: "custom",
            path: ["afterThermalShutdown"],
            message:
              "a behaviour after thermal shutdown needs its temperature: give thermalShutdownC, or leave afterThermalShutdown out",
          });
        }
        if (s.overvoltageHysteresisV !== undefined && s.overvoltageCutoffV === undefined) {
          ctx.addIssue({
            code: "custom",
            path: ["overvoltageHysteresisV"],
            message: "a hysteresis needs its cut-off: give overvoltageCutoffV, or leave overvoltageHysteresisV out",
          });
        } else if (
          s.overvoltageHysteresisV !== undefined &&
          s.overvoltageCutoffV !== undefined &&
          s.overvoltageHysteresisV >= s.overvoltageCutoffV
        ) {
          ctx.addIssue({
            code: "custom",
            path: ["overvoltageHysteresisV"],
            message: `the hysteresis must be below the ${s.overvoltageCutoffV} V cut-off threshold (the switch recloses below threshold − hysteresis): give a smaller value`,
          });
        }
      }),
  ])
  .meta({ description: "a series protection stage, by kind" });
export type StageSpecInput = z.input<typeof stageSpec>;
export type StageSpec = z.output<typeof stageSpec>;

/** A stage named by its id in the parts catalog; the thermal path may be given for this board. */
export const catalogPartRef = z.strictObject({
  kind: z.literal("catalog-part"),
  partId: z.string().min(1).max(200).meta({ description: "id of a part in the parts catalog" }),
  thermal: thermalPath.optional(),
});

export const stageInput = z
  .discriminatedUnion("kind", [...stageSpec.options, catalogPartRef])
  .meta({ description: "a stage given inline, or a catalog part by id" });
export type StageInput = z.output<typeof stageInput>;

export const STAGE_KINDS = [
  "pn-diode",
  "schottky-diode",
  "pfet-high-side",
  "nfet-low-side",
  "nfet-ideal-diode",
  "integrated-switch",
  "nfet-back-to-back",
] as const;
