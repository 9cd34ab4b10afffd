import { z } from "zod";
import { diodePoints, diodeShockley, oneTemperatureLaw } from "./diode.js";
import { curvePoints, rdsOnTjPoint, zthPoint } from "./curve-points.js";
import { provenance } from "./outcome.js";
import { quantity } from "./quantity.js";
import { reverseLeakageCurve } from "./stage.js";

const acceptFit = (bound: string) =>
  z
    .boolean()
    .optional()
    .meta({
      description: `use a least-squares fit whose worst residual exceeds ${bound} (default false: such a fit is refused, naming the point)`,
    });

const diodeForward = z.strictObject({
  curve: z.literal("diode-forward"),
  junction: z
    .enum(["pn", "schottky"])
    .meta({ description: "junction type: its SPICE Eg/XTI defaults (PN 1.11 eV/3, Schottky 0.69 eV/2)" }),
  diode: diodePoints.superRefine(oneTemperatureLaw),
});

const rdsOnTemperature = z.strictObject({
  curve: z.literal("rds-on-temperature"),
  points: curvePoints(rdsOnTjPoint, {
    min: 2,
    max: 64,
    description: "Rds(on) against junction temperature, at two temperatures or more",
  }),
  acceptFit: acceptFit("5 % of Rds(on)"),
});

/** Single-pulse Zth(t) points and how to fit them (the fit procedure's and a candidate's transient thermal form). */
export const zthCurveFields = {
  points: curvePoints(zthPoint, { min: 2, max: 64, description: "single-pulse Zth(t) points" }),
  steadyKPerW: quantity("K/W", "the steady thermal resistance the network's ΣR must equal (absent: ΣR fitted freely)", {
    gt: 0,
    le: 10_000,
  }).optional(),
  stages: z
    .number()
    .int()
    .min(1)
    .max(5)
    .optional()
    .meta({ description: "number of Foster stages (absent: the fewest of 1..5 within 5 % of Zth)" }),
  acceptFit: acceptFit("5 % of Zth"),
};
const zth = z.strictObject({ curve: z.literal("zth"), ...zthCurveFields });

const reverseLeakage = z.strictObject({ curve: z.literal("reverse-leakage"), ...reverseLeakageCurve.shape });

export const fitInput = z
  .discriminatedUnion("curve", [diodeForward, rdsOnTemperature, zth, reverseLeakage])
  .meta({ description: "a datasheet curve as points, to fit without running an analysis" });
export type FitInput = z.input<typeof fitInput>;
export type FitSpec = z.output<typeof fitInput>;

const fosterModel = z.strictObject({
  kind: z.literal("foster"),
  terms: z.array(z.strictObject({ rKPerW: z.number().meta({ unit: "K/W" }), tauS: z.number().meta({ unit: "s" }) })),
});
const leakageLaw = z
  .strictObject({
    law: z.literal("thermionic-emission"),
    barrierEv: z.number().meta({ description: "barrier height ΦB", unit: "eV" }),
    voltageExponent: z.number().meta({ description: "power m of the (VR/Vref)^m factor", unit: "1" }),
    refCurrentA: z.number().meta({ description: "IR at the reference point", unit: "A" }),
    refTempC: z.number().meta({ description: "reference junction temperature (25 °C)", unit: "degC" }),
    refVoltageV: z
      .number()
      .meta({ description: "reference reverse voltage (the highest VR of the points)", unit: "V" }),
  })
  .meta({
    description:
      "IR(T, VR) = Iref·(T/Tref)²·exp(−(ΦB/k)·(1/T − 1/Tref))·(VR/Vref)^m (thermionic emission over the barrier)",
  });

export const fitOutput = z.object({
  ...provenance,
  curve: z.enum(["diode-forward", "rds-on-temperature", "zth", "reverse-leakage"]),
  method: z.enum(["exact", "least-squares"]).meta({
    description:
      "exact: the points determine the parameters (zero residual); least-squares: more points than parameters",
  }),
  parameters: z
    .array(
      z.object({
        name: z.string(),
        value: z.number(),
        unit: z.string(),
        standardError: z.number().optional().meta({
          description:
            "from the Jacobian at the solution, s²·(JᵀJ)⁻¹ (absent: exact fit, parameter on a bound, or not meaningful)",
        }),
        fitted: z.boolean().meta({ description: "false: held at a given or default value" }),
      }),
    )
    .meta({ description: "the law's parameters" }),
  model: z
    .union([diodeShockley, z.strictObject({ law: z.literal("power"), exponent: z.number() }), fosterModel, leakageLaw])
    .meta({
      description:
        "the fitted law in the form a part takes (a Shockley diode, an Rds(on) temperature law, a Foster network, a leakage law)",
    }),
  quality: z.object({
    unit: z.string().meta({ description: "the curve's unit" }),
    rms: z.number().meta({ description: "RMS of model − point" }),
    worstPoint: z
      .number()
      .int()
      .meta({ description: "index of the worst point (largest residual as a share of the point's value)" }),
    worstResidual: z.number().meta({ description: "model − point at the worst point" }),
    worstFraction: z.number().meta({ description: "|worst residual| / point value" }),
    boundFraction: z.number().meta({ description: "the bound on worstFraction" }),
    withinBound: z.boolean(),
    converged: z.boolean().meta({
      description:
        "true only when the solver's convergence test passed; false: it stopped at its iteration cap or stalled before (such a fit is refused unless acceptFit)",
    }),
    iterations: z.number().int().meta({ description: "iterations the solver took" }),
    stopReason: z.string().optional().meta({
      description: "why the solver stopped before converging: its cap, or a stall and where (absent when converged)",
    }),
  }),
  residuals: z
    .array(z.object({ point: z.number().int(), measured: z.number(), modelled: z.number(), residual: z.number() }))
    .meta({ description: "per point, in the caller's order, in the curve's unit" }),
  assumptions: z.array(z.string()),
});
export type FitOutput = z.infer<typeof fitOutput>;
