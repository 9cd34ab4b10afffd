import { z } from "zod";
import { quantity, volts } from "./quantity.js";

/** How a test repeats its pulse: the clamp's junction is followed over the whole train. */
export const pulseRepetition = z
  .strictObject({
    periodS: quantity("s", "time from one pulse's start to the next", { gt: 0, le: 1e5 }),
    count: z.number().int().min(1).max(1e9).meta({ description: "number of pulses in the test" }),
  })
  .meta({ description: "how the test repeats the pulse (a built-in pulse: the standard's interval and count)" });

/** A built-in pulse with the test's own repetition in place of the standard's. */
export const repeatedBuiltInPulse = z.strictObject({
  builtIn: z.string().min(1).max(64).meta({ description: "a built-in transient id" }),
  repetition: pulseRepetition,
});

export const customPulse = z.strictObject({
  id: z.string().min(1).max(64),
  title: z.string().max(200).optional(),
  baseV: quantity("V", "supply the pulse rides on (0: supply disconnected)", { ge: -10_000, le: 10_000 }),
  amplitudeV: quantity("V", "signed amplitude of the exponential above the base", { ge: -10_000, le: 10_000 }),
  sourceResistanceOhm: quantity("ohm", "internal resistance Ri of the pulse source", { gt: 0, le: 1e6 }),
  riseS: quantity("s", "rise time (not used by the energy integral)", { ge: 0, le: 10 }).optional(),
  decayS: quantity("s", "decay time td", { gt: 0, le: 100 }),
  decayConvention: z
    .enum(["to-10-percent", "to-50-percent", "time-constant"])
    .optional()
    .meta({ description: "td to 10 % of the peak (τ = td/ln 10, default), to half value (τ = td/ln 2) or τ itself" }),
  clampedAtV: volts("a centrally suppressed pulse: the input is held at this level").optional(),
  repetition: pulseRepetition.optional(),
});
