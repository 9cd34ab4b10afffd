import type { Assessment, SizingContext } from "./assessment.js";
import { ruleLimitItem } from "./rule-limit.js";
import { fmt, type SpecItem } from "./spec-item.js";

/** The figures of the requirement's turn-off event (and a P-FET's negative pulses) that rules read. */
const EVENT_LINES = [
  {
    name: "peakReverseCurrentA",
    id: "eventPeakReverseCurrentMaxA",
    title: "largest reverse-current peak of the turn-off event and the negative pulses",
    unit: "A",
  },
  {
    name: "absorbedEnergyJ",
    id: "eventAbsorbedEnergyMaxJ",
    title: "largest energy the blocking element absorbs at the turn-off event",
    unit: "J",
  },
  {
    name: "loadReverseVMaxV",
    id: "loadReverseVoltageMaxV",
    title: "largest reverse voltage at the load in the turn-off event and the negative pulses",
    unit: "V",
  },
  {
    name: "eventTrainTjC",
    id: "eventTrainTjMaxC",
    title: "highest junction temperature of the blocking element over the turn-off event's train",
    unit: "°C",
  },
] as const;

/**
 * The requirement's turn-off event as the review runs it on the part (review-turn-off.ts, and the
 * P-FET's negative pulses through review-pulse-back-conduction.ts): each figure a rule reads
 * becomes a line at its rule's limit (ruleLimitItem: the rule engine's own boundary, every other
 * value of the part's review held), with the part's figure and margin, so a part the review fails
 * on the event is failed here on the same rule. A figure the review leaves unavailable (a pulse
 * without a response, a reverse peak that is only a lower bound) is "not-determined" with its
 * reason; one it does not require (no repetition given) is "not-required". No lines without the
 * requirement's turn-off event; one "not-determined" line where the event cannot be run on the part.
 */
export function turnOffEventItems(ctx: SizingContext, template: Assessment): SpecItem[] {
  const t = ctx.requirement.turnOff;
  if (t !== undefined && ctx.eventUnavailable !== undefined)
    return [
      {
        id: "turnOffEvent",
        title: "the requirement's turn-off event",
        unit: "",
        bound: "at-most",
        outcome: "not-determined",
        reason: ctx.eventUnavailable,
      },
    ];
  const event = template.review.turnOff;
  if (t === undefined || event === undefined) return [];
  const input = template.input;
  const fall =
    t.inputDecay === undefined
      ? `to ${fmt(t.inputAfterV)} V`
      : `to ${fmt(t.inputDecay.startV)} V, decaying to ${fmt(t.inputAfterV)} V (τ ${fmt(t.inputDecay.tauS)} s)`;
  const pulses = template.review.pulseBackConduction?.length ?? 0;
  const corner = `the requirement's turn-off event: input from ${fmt(t.outputV)} V ${fall}, Tj ${fmt(event.tjC)} °C${pulses > 0 ? `; and ${pulses} negative pulse${pulses === 1 ? "" : "s"} through the P-FET` : ""}`;
  return EVENT_LINES.map((l) => {
    const base = { id: l.id, title: l.title, unit: l.unit, bound: "at-most" as const };
    const skipped = input.notRequired?.[l.name];
    if (skipped !== undefined) return { ...base, outcome: "not-required" as const, reason: skipped };
    const v = input.metrics[l.name];
    const item = ruleLimitItem(ctx.ruleSet, input, l.name, base, typeof v === "number" ? v : undefined, corner);
    const gap = input.unavailable?.[l.name];
    if (gap === undefined || item.outcome !== "limit") return item;
    const { meets: _m, margin: _g, relativeMargin: _r, templateValue: _v, ...rest } = item;
    return { ...rest, outcome: "not-determined" as const, reason: `${gap} (${item.reason})` };
  });
}
