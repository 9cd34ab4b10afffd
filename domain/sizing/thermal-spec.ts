import type { ThermalSizing } from "../checks/thermal-sizing.js";
import type { SizingContext } from "./assessment.js";
import { limitItem, type SpecItem } from "./spec-item.js";

/**
 * The thermal path the junction needs (thermal-sizing.ts, from the template's review): the
 * largest junction-to-ambient resistance at the hot, full-load corners, and with a
 * junction-case-sink path the largest sink-to-ambient resistance θSA. The path belongs to the
 * board, not the part: a miss here is a warning that the part needs more copper or a sink.
 */
export function thermalSpec(ctx: SizingContext, s: ThermalSizing): SpecItem[] {
  const req = ctx.requirement;
  const total = {
    id: "thermalPathMaxKPerW",
    title: "largest junction-to-ambient thermal resistance (copper, vias, sink)",
    unit: "K/W",
    bound: "at-most" as const,
  };
  const sink = {
    id: "heatsinkMaxKPerW",
    title: "largest sink-to-ambient thermal resistance θSA",
    unit: "K/W",
    bound: "at-most" as const,
  };
  const source = { kind: "requirement" as const, field: "tjMarginK", severity: "warn" as const };
  const corner = `${req.ambientMaxC} °C ambient, full load, every supply`;
  switch (s.outcome) {
    case "impossible":
      return [{ ...total, outcome: "impossible", corner, source, reason: s.reason }];
    case "no-heatsink-needed":
      return s.maxTotalRthKPerW === "unbounded"
        ? [
            {
              ...total,
              outcome: "unbounded",
              corner,
              source,
              reason: "the junction stays below Tj(max) − margin with any thermal path",
            },
          ]
        : [
            limitItem(total, s.maxTotalRthKPerW, s.presentTotalRthKPerW, {
              corner,
              source,
              reason: "the present path is enough: no heatsink is needed",
            }),
          ];
    case "heatsink-needed":
      return [
        limitItem(total, s.maxTotalRthKPerW, s.presentTotalRthKPerW, {
          corner,
          source,
          reason: `Tj(max) − ${req.tjMarginK} K needs a path of at most this much`,
        }),
        limitItem(sink, s.maxSinkRthKPerW, undefined, { corner, source, reason: "θSA = Rth,max − θJC − θCS" }),
      ];
    case "better-path-needed":
      return [limitItem(total, s.maxTotalRthKPerW, s.presentTotalRthKPerW, { corner, source, reason: s.reason })];
  }
}
