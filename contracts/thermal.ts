import { z } from "zod";
import { quantity } from "./quantity.js";

const rth = (what: string) => quantity("K/W", what, { ge: 0, le: 10_000 });

/** Steady-state thermal path from junction to ambient (JEDEC JESD51 definitions). */
export const thermalPath = z
  .discriminatedUnion("kind", [
    z.strictObject({
      kind: z.literal("junction-ambient"),
      rthJaKPerW: rth("junction-to-ambient thermal resistance θJA in the application"),
    }),
    z.strictObject({
      kind: z.literal("junction-case-sink"),
      rthJcKPerW: rth("junction-to-case θJC"),
      rthCsKPerW: rth("case-to-sink (interface) θCS"),
      rthSaKPerW: rth("sink-to-ambient θSA"),
    }),
  ])
  .meta({ description: "junction-to-ambient thermal path: θJA alone, or θJC + θCS + θSA" });
export type ThermalPathInput = z.input<typeof thermalPath>;
