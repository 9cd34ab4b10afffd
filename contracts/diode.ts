import { z } from "zod";
import { curvePoints, forwardPoint } from "./curve-points.js";
import { quantity, ratio, temperatureC } from "./quantity.js";

export { forwardPoint };

const energyGapEv = z
  .number()
  .gt(0.1)
  .lte(5)
  .meta({ description: "activation energy Eg of the Is(T) law, eV (default: 1.11 PN, 0.69 Schottky)", unit: "eV" });
const vfTempCoVPerK = quantity(
  "V/K",
  "linear forward-voltage temperature coefficient at constant current (about −2 mV/K for silicon); replaces the Eg/XTI law",
  { ge: -0.05, le: 0.05 },
);
const saturationTempExponent = z
  .number()
  .gte(0)
  .lte(10)
  .meta({ description: "Is temperature exponent XTI (default: 3 PN, 2 Schottky)", unit: "1" });

export const diodeShockley = z.strictObject({
  model: z.literal("shockley"),
  saturationCurrentA: quantity("A", "saturation current Is at the nominal temperature", { gt: 0, le: 1 }),
  ideality: ratio("ideality (emission) factor n", { ge: 0.5, le: 10 }),
  seriesResistanceOhm: quantity("ohm", "series resistance Rs", { ge: 0, le: 1e3 }),
  energyGapEv: energyGapEv.optional(),
  saturationTempExponent: saturationTempExponent.optional(),
  vfTempCoVPerK: vfTempCoVPerK.optional(),
  nominalTempC: temperatureC("temperature at which Is holds (default 25 °C)").optional(),
});

export const diodePoints = z.strictObject({
  model: z.literal("points"),
  points: curvePoints(forwardPoint, {
    min: 2,
    max: 64,
    description:
      "two or more (I, Vf, T) points, read off the datasheet's curves at one temperature or several; two fit Is and n, three also Rs (exactly); four or more fit Is, n, Rs by least squares, and Eg too where they span two temperatures and neither Eg nor vfTempCoVPerK is given",
  }),
  seriesResistanceOhm: quantity("ohm", "series resistance to hold with two points (default 0)", {
    ge: 0,
    le: 1e3,
  }).optional(),
  energyGapEv: energyGapEv.optional(),
  saturationTempExponent: saturationTempExponent.optional(),
  vfTempCoVPerK: vfTempCoVPerK.optional(),
  temperatureLaw: z.enum(["eg-xti", "linear"]).optional().meta({
    description:
      "the Vf temperature law the points fit: eg-xti (default: the SPICE Is(T) law, Eg fitted where the points allow) or linear (a Vf shift at constant current, vfTempCoVPerK, fitted from four points or more at two temperatures or more; give vfTempCoVPerK instead to hold it)",
  }),
  acceptFit: z.boolean().optional().meta({
    description:
      "use a least-squares fit whose worst residual exceeds 2 % of Vf (default false: such a fit is refused, naming the point)",
  }),
});

/** One temperature law: a linear Vf coefficient (given, or fitted: temperatureLaw linear) or the Eg/XTI law, not both. */
export function oneTemperatureLaw(
  d: {
    vfTempCoVPerK?: number | undefined;
    energyGapEv?: number | undefined;
    saturationTempExponent?: number | undefined;
    temperatureLaw?: "eg-xti" | "linear" | undefined;
  },
  ctx: z.RefinementCtx,
): void {
  const egXti = d.energyGapEv !== undefined || d.saturationTempExponent !== undefined;
  if (d.vfTempCoVPerK !== undefined && (egXti || d.temperatureLaw === "eg-xti")) {
    ctx.addIssue({
      code: "custom",
      path: ["vfTempCoVPerK"],
      message: "give either a linear Vf temperature coefficient or the Eg/XTI law, not both",
    });
  }
  if (d.temperatureLaw === "linear" && egXti) {
    ctx.addIssue({
      code: "custom",
      path: ["temperatureLaw"],
      message: "the linear law takes no Eg/XTI: drop energyGapEv and saturationTempExponent, or drop temperatureLaw",
    });
  }
  if (d.temperatureLaw === "linear" && d.vfTempCoVPerK !== undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["temperatureLaw"],
      message:
        "vfTempCoVPerK already chooses the linear law and holds its value: drop temperatureLaw to hold it, or drop vfTempCoVPerK to fit it",
    });
  }
}

export const diode = z
  .discriminatedUnion("model", [diodeShockley, diodePoints])
  .superRefine(oneTemperatureLaw)
  .meta({ description: "a junction: Shockley parameters, or datasheet (I, Vf, T) points that backstop fits" });
export type DiodeInput = z.input<typeof diode>;
export type DiodeSpec = z.output<typeof diode>;
