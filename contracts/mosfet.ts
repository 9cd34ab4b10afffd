import { z } from "zod";
import { curvePoints, rdsFactorPoint, rdsOnVgsPoint } from "./curve-points.js";
import { diode } from "./diode.js";
import { quantity, temperatureC } from "./quantity.js";

const volts = (d: string) => quantity("V", d, { gt: 0, le: 10_000 });

export const rdsTempLaw = z
  .discriminatedUnion("law", [
    z.strictObject({
      law: z.literal("power"),
      exponent: z.number().gte(0).lte(5).meta({ description: "α in Rds(T) = Rds(25 °C)·(T/298.15 K)^α", unit: "1" }),
    }),
    z.strictObject({
      law: z.literal("points"),
      points: curvePoints(rdsFactorPoint, {
        min: 2,
        max: 64,
        description: "normalised on-resistance against junction temperature, increasing Tj",
      }),
    }),
    z
      .strictObject({
        law: z.literal("power-fit"),
        points: curvePoints(rdsFactorPoint, {
          min: 2,
          max: 64,
          description: "normalised on-resistance against junction temperature, read off the datasheet's curve",
        }),
        acceptFit: z.boolean().optional().meta({
          description:
            "use a fit whose worst residual exceeds 5 % of Rds(on) (default false: refused, naming the point)",
        }),
      })
      .meta({
        description:
          "the power law (T/298.15 K)^α with α fitted to the points by least squares (the factor held at 1 at 25 °C)",
      }),
  ])
  .meta({ description: "temperature law of Rds(on) (default: power law, α = 2.3, common practice)" });

export const mosfet = z
  .strictObject({
    rdsOn: curvePoints(rdsOnVgsPoint, {
      min: 1,
      max: 64,
      description: "datasheet Rds(on) at 25 °C against gate drive, one point or more",
    }),
    rdsOnTemp: rdsTempLaw.optional(),
    thresholdV: volts("gate threshold voltage (magnitude), at 25 °C"),
    thresholdTempCoVPerK: z.number().min(-0.02).max(0).optional().meta({
      description:
        "temperature coefficient of the gate threshold, V/K (a datasheet's, typically −0.002 to −0.007: memory); Vth(Tj) = thresholdV + k·(Tj − 25 °C) in the forward law, the reverse paths and the review's cold gate overdrive (default: Vth held at its 25 °C value); or give thresholdAtTj",
      unit: "V/K",
    }),
    thresholdAtTj: z
      .strictObject({
        thresholdV: volts("gate threshold voltage (magnitude) at that junction temperature"),
        tjC: temperatureC("junction temperature of that figure (not 25 °C)"),
      })
      .optional()
      .meta({
        description:
          "the threshold at a second junction temperature (a datasheet's Vth(Tj) curve): the coefficient is the line through it and thresholdV at 25 °C",
      }),
    vgsMaxV: volts("absolute maximum gate-source voltage"),
    vdsMaxV: volts("drain-source voltage rating"),
    tjMaxC: temperatureC("maximum junction temperature"),
    bodyDiode: diode,
    avalancheEnergyJ: quantity(
      "J",
      "single-pulse avalanche energy rating EAS at 25 °C starting junction temperature (for the turn-off rules)",
      { gt: 0, le: 1e6 },
    ).optional(),
    peakRepetitiveCurrentA: quantity("A", "repetitive peak drain current rating (for the bridge rules)", {
      gt: 0,
      le: 1e5,
    }).optional(),
    avalancheCurrentA: quantity(
      "A",
      "single-pulse avalanche current rating IAS, the current at which EAS is rated (for the turn-off rules)",
      { gt: 0, le: 1e5 },
    ).optional(),
    offStateLeakage: z
      .strictObject({
        currentA: quantity(
          "A",
          "off-state drain current IDSS at the rated drain-source voltage, gate shorted to source",
          { gt: 0, le: 10 },
        ),
        tempC: temperatureC("junction temperature of that figure"),
      })
      .optional()
      .meta({
        description:
          "datasheet off-state leakage IDSS, scaled in temperature by the body diode's Is(T) law (default: Is(T) of the body diode model)",
      }),
    vdsTempCoPerK: z.number().min(0).max(0.003).optional().meta({
      description:
        "temperature coefficient of the drain-source breakdown voltage, per kelvin (0.001 = +0.1 %/K); the review derates vdsMaxV with it to the coldest ambient (default 0.001, memory)",
    }),
    repetitiveAvalancheEnergyJ: quantity(
      "J",
      "repetitive avalanche energy rating EAR, per event (for the turn-off rules when the event repeats)",
      { gt: 0, le: 1e6 },
    ).optional(),
    soa: z
      .array(
        z.strictObject({
          pulseWidthS: quantity("s", "single-pulse width of the line", { gt: 0, le: 1e4 }),
          points: z
            .array(
              z.strictObject({
                vdsV: volts("drain-source voltage"),
                idA: quantity("A", "drain current the line allows there", { gt: 0, le: 1e5 }),
              }),
            )
            .min(2)
            .max(16),
        }),
      )
      .min(1)
      .max(8)
      .optional()
      .meta({
        description:
          "datasheet single-pulse safe operating area at a 25 °C case: a line of points (Vds ascending) per pulse width, for the inrush check (absent: the inrush is checked through Tj alone)",
      }),
  })
  .superRefine((m, ctx) => {
    if (m.thresholdAtTj !== undefined && m.thresholdTempCoVPerK !== undefined)
      ctx.addIssue({
        code: "custom",
        path: ["thresholdAtTj"],
        message: "give either thresholdTempCoVPerK or thresholdAtTj, not both",
      });
    if (m.thresholdAtTj !== undefined && Math.abs(m.thresholdAtTj.tjC - 25) < 1)
      ctx.addIssue({
        code: "custom",
        path: ["thresholdAtTj", "tjC"],
        message: "must differ from 25 °C by 1 K or more (thresholdV is the 25 °C figure)",
      });
    else if (m.thresholdAtTj !== undefined) {
      const k = (m.thresholdAtTj.thresholdV - m.thresholdV) / (m.thresholdAtTj.tjC - 25);
      if (!(k >= -0.02 && k <= 0))
        ctx.addIssue({
          code: "custom",
          path: ["thresholdAtTj", "thresholdV"],
          message: `gives a threshold coefficient of ${(k * 1000).toPrecision(3)} mV/K: a power MOSFET's threshold falls with temperature, by at most 20 mV/K (give the figure at a higher Tj lower than thresholdV, or the reverse)`,
        });
    }
    m.rdsOn.forEach((p, i) => {
      if (p.gateSourceV <= m.thresholdV) {
        ctx.addIssue({
          code: "custom",
          path: ["rdsOn", i, "gateSourceV"],
          message: `must be above the threshold voltage (${m.thresholdV} V)`,
        });
      }
    });
    m.soa?.forEach((line, i) => {
      const prev = m.soa?.[i - 1];
      if (prev && !(line.pulseWidthS > prev.pulseWidthS))
        ctx.addIssue({ code: "custom", path: ["soa", i, "pulseWidthS"], message: "pulse widths must increase" });
      line.points.forEach((p, k) => {
        const before = line.points[k - 1];
        if (before && !(p.vdsV > before.vdsV))
          ctx.addIssue({ code: "custom", path: ["soa", i, "points", k, "vdsV"], message: "voltages must increase" });
      });
    });
    const law = m.rdsOnTemp;
    if (law?.law === "points") {
      law.points.forEach((p, i) => {
        const prev = law.points[i - 1];
        if (prev && !(p.tjC > prev.tjC))
          ctx.addIssue({
            code: "custom",
            path: ["rdsOnTemp", "points", i, "tjC"],
            message: "temperatures must increase",
          });
      });
    }
  });
export type MosfetInput = z.input<typeof mosfet>;
