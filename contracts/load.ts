import { z } from "zod";
import { quantity } from "./quantity.js";

export const load = z
  .discriminatedUnion("kind", [
    z.strictObject({
      kind: z.literal("constant-current"),
      currentA: quantity("A", "load current", { ge: 0, le: 1e5 }),
    }),
    z.strictObject({
      kind: z.literal("resistive"),
      resistanceOhm: quantity("ohm", "load resistance", { gt: 0, le: 1e12 }),
    }),
    z.strictObject({
      kind: z.literal("constant-power"),
      powerW: quantity("W", "input power drawn by the converter", { gt: 0, le: 1e6 }),
      minVoltageV: quantity("V", "lowest input voltage at which the converter operates", { ge: 0, le: 1e4 }),
    }),
  ])
  .meta({
    description: "the load behind the stage: constant current, resistive, or constant power (a DC/DC converter input)",
  });
export type LoadInput = z.input<typeof load>;
