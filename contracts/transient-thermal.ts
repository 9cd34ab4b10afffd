import { z } from "zod";
import { zthCurveFields } from "./fit.js";
import { quantity } from "./quantity.js";

/** What a Foster or Cauer network spans, and the heat capacity of the rest of the path when it spans junction to case. */
const networkScope = {
  scope: z.enum(["junction-ambient", "junction-case"]).optional().meta({
    description:
      "what the network spans (default junction-ambient: its ΣR must be the stage's thermal path within 5 %); junction-case: a datasheet Zth(j-c) network, cascaded with the rest of the path as one node of caseToAmbientHeatCapacityJPerK",
  }),
  caseToAmbientHeatCapacityJPerK: quantity(
    "J/K",
    "heat capacity of the case-to-ambient path (board copper, heatsink), for a junction-case network",
    { gt: 0, le: 1e6 },
  ).optional(),
};

function needsCaseCapacity(
  t: { scope?: string | undefined; caseToAmbientHeatCapacityJPerK?: number | undefined },
  ctx: z.RefinementCtx,
): void {
  if (t.scope === "junction-case" && t.caseToAmbientHeatCapacityJPerK === undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["caseToAmbientHeatCapacityJPerK"],
      message: "a junction-case network needs the heat capacity of the rest of the path (board copper, heatsink), J/K",
    });
  }
  if (t.scope !== "junction-case" && t.caseToAmbientHeatCapacityJPerK !== undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["caseToAmbientHeatCapacityJPerK"],
      message: 'only a network with scope "junction-case" takes a case-to-ambient heat capacity',
    });
  }
}

export const transientThermal = z
  .discriminatedUnion("kind", [
    z
      .strictObject({
        kind: z.literal("foster"),
        terms: z
          .array(
            z.strictObject({
              rKPerW: quantity("K/W", "thermal resistance of the term", { gt: 0, le: 10_000 }),
              tauS: quantity("s", "time constant τ = R·C", { gt: 0, le: 1e6 }),
            }),
          )
          .min(1)
          .max(12),
        ...networkScope,
      })
      .superRefine(needsCaseCapacity),
    z
      .strictObject({
        kind: z.literal("cauer"),
        stages: z
          .array(
            z.strictObject({
              rKPerW: quantity("K/W", "resistance from this node to the next (the last: to ambient, or to the case)", {
                gt: 0,
                le: 10_000,
              }),
              cJPerK: quantity("J/K", "heat capacity from this node to ambient", { gt: 0, le: 1e6 }),
            }),
          )
          .min(1)
          .max(12)
          .meta({ description: "the ladder's stages, junction first" }),
        ...networkScope,
      })
      .superRefine(needsCaseCapacity)
      .meta({
        description:
          "a Cauer (ladder) network: physical nodes, so a junction-case ladder is cascaded with the case-to-ambient path exactly",
      }),
    z.strictObject({
      kind: z.literal("single-pole"),
      heatCapacityJPerK: quantity("J/K", "heat capacity of the junction-to-ambient path", { gt: 0, le: 1e6 }),
    }),
    z.strictObject({ kind: z.literal("zth-points"), ...zthCurveFields }).meta({
      description:
        "single-pulse junction-to-ambient Zth(t) points, fitted to a Foster network (steadyKPerW default: the stage's thermal path)",
    }),
  ])
  .meta({
    description:
      "transient thermal model for start-up profiles: a Foster or Cauer network (junction-ambient, or junction-case cascaded with the board), one pole from RthJA and a heat capacity, or Zth(t) points fitted to a Foster network (absent: quasi-static steady state, an upper bound)",
  });
