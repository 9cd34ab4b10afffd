import { z } from "zod";
import { quantity } from "./quantity.js";

/** The start-up charge of the output capacitance each candidate is put through in the review. */
export const reviewInrush = z
  .strictObject({
    outputCapacitanceF: quantity("F", "capacitance at the stage's output, charged from 0 V at start-up", {
      gt: 0,
      le: 10,
    }),
    inputV: quantity(
      "V",
      "input the output charges to (default: the highest level the stage can be switched on at: the highest of the steady supply's top, the jump start, the long-term overvoltage and the abnormal limit)",
      {
        gt: 0,
        le: 10_000,
      },
    ).optional(),
    slewVPerS: quantity(
      "V/s",
      "output slew rate a controller's soft start or a gate RC sets (absent: the channel turns fully on at once, an integrated switch limits at its currentLimitA)",
      { gt: 0, le: 1e9 },
    ).optional(),
    currentLimitA: quantity(
      "A",
      "current a controller holds while it charges the output (a hot-swap or inrush controller's limit through its sense resistor) for a MOSFET stage; an integrated switch limits at the lower of this and its own currentLimitA (absent: the stage's own limit, if any)",
      { gt: 0, le: 1e5 },
    ).optional(),
    loopResistanceOhm: quantity(
      "ohm",
      "resistance in the charging loop besides the source's and the stage's (wiring, capacitor ESR; default 0)",
      { ge: 0, le: 1e6 },
    ).optional(),
    load: z
      .discriminatedUnion("kind", [
        z.strictObject({ kind: z.literal("none") }),
        z.strictObject({
          kind: z.literal("constant-current"),
          currentA: quantity("A", "load current during the charge", { ge: 0, le: 1e5 }),
        }),
        z.strictObject({
          kind: z.literal("resistive"),
          resistanceOhm: quantity("ohm", "load resistance during the charge", { gt: 0, le: 1e12 }),
        }),
        z.strictObject({
          kind: z.literal("constant-power"),
          powerW: quantity("W", "input power the converter draws once running (P/V at its input)", {
            gt: 0,
            le: 1e6,
          }),
          startV: quantity(
            "V",
            "input voltage at which the converter starts drawing (its undervoltage lockout's rising threshold)",
            { ge: 0, le: 1e4 },
          ),
        }),
      ])
      .optional()
      .meta({
        description:
          "the load during the charge (default: the requirement's load; a constant-power one starts drawing at its minVoltageV)",
      }),
  })
  .meta({
    description:
      "start-up inrush: each candidate charges the output capacitance; its Tj during the charge (the thermally limited SOA) and whether the charge completes (a current limit, a thermal shutdown)",
  });
