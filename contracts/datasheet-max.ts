import { z } from "zod";
import { quantity } from "./quantity.js";

/**
 * A part's datasheet-maximum tolerance corner: the review's candidate, a catalog part and the
 * sizing take this one shape (absent: typical values only).
 */
export const datasheetMax = z
  .strictObject({
    rdsOnFactor: z
      .number()
      .gte(1)
      .lte(5)
      .optional()
      .meta({ description: "datasheet maximum ÷ typical Rds(on) (absent: 1, the typical)", unit: "1" }),
    forwardVoltageFactor: z
      .number()
      .gte(1)
      .lte(5)
      .optional()
      .meta({ description: "datasheet maximum ÷ typical forward voltage (absent: 1, the typical)", unit: "1" }),
    startV: quantity(
      "V",
      "datasheet maximum start voltage of the controller or integrated switch (the start checks and the datasheet-maximum corners use it)",
      { ge: 0, le: 10_000 },
    ).optional(),
    thresholdV: quantity(
      "V",
      "datasheet maximum gate threshold Vth(max) of the MOSFET, at 25 °C (the start checks, the cold gate overdrive of the review and the sizing, and the datasheet-maximum corners use it; the Monte Carlo draws Vth uniform up to it)",
      { ge: 0, le: 100 },
    ).optional(),
    thresholdMinV: quantity(
      "V",
      "datasheet minimum gate threshold Vth(min) of the MOSFET, at 25 °C (the turn-off event of the review and the sizing uses it: a lower threshold keeps a P-FET's or low-side N-FET's channel conducting backwards longer; the Monte Carlo draws Vth uniform down to it)",
      { ge: 0, le: 100 },
    ).optional(),
    reverseThresholdV: quantity(
      "V",
      "datasheet maximum reverse-current threshold of the controller (the review's turn-off event uses it)",
      { ge: 0, le: 10 },
    ).optional(),
    turnOffDelayS: quantity(
      "s",
      "datasheet maximum turn-off delay of the controller (the review's turn-off event uses it)",
      { ge: 0, le: 1 },
    ).optional(),
    currentLimitMinA: quantity(
      "A",
      "datasheet minimum current limit of an integrated switch (the steady corners are solved at it, their Tj and loss at whichever of it and the typical limit heats more; the inrush charges at it and switch-current-limit-above-load reads it; absent: the typical currentLimitA)",
      { gt: 0, le: 10_000 },
    ).optional(),
    overvoltageCutoffMinV: quantity(
      "V",
      "datasheet minimum overvoltage cut-off threshold of an integrated switch (switch-cutoff-above-supply reads it; absent: the typical overvoltageCutoffV)",
      { ge: 0, le: 10_000 },
    ).optional(),
    overvoltageCutoffMaxV: quantity(
      "V",
      "datasheet maximum overvoltage cut-off threshold of an integrated switch (the voltage reaching the load, load-overvoltage, uses it; absent: the typical overvoltageCutoffV)",
      { ge: 0, le: 10_000 },
    ).optional(),
  })
  .meta({ description: "the datasheet-maximum tolerance corner: the factors, and the limits the datasheet states" });
export type DatasheetMaxInput = z.input<typeof datasheetMax>;
export type DatasheetMax = z.output<typeof datasheetMax>;
