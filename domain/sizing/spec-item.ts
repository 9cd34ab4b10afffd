import type { RuleSetStamp, Severity } from "../rules/rule-model.js";

/** Which side of the limit a part must be on: its value at most, or at least, the limit. */
export type Bound = "at-most" | "at-least";

/** Where a limit came from: a rule of the set (with its threshold), or the requirement itself. */
export type SpecSource =
  | {
      readonly kind: "rule";
      readonly ruleId: string;
      readonly expression: string;
      readonly severity: Severity;
      /** The rule's right-hand side at the limit (the threshold the limiting metric meets). */
      readonly threshold: number | null;
      readonly ruleSet: RuleSetStamp;
    }
  | { readonly kind: "requirement"; readonly field: string; readonly severity: Severity };

/**
 * One line of a part specification. `outcome`:
 * - "limit": the part's value must be at most/at least `value`;
 * - "unbounded": no limit within the searched range (the requirement does not constrain it);
 * - "impossible": no value of this parameter meets the requirement (the reason says why);
 * - "not-required": no rule or requirement input is in scope for it (a budget not set);
 * - "not-determined": it could not be derived (e.g. a rule that is not a comparison), with why.
 * `templateValue` is the value of the part the specification was derived from (its laws and
 * thermal path are held), so margin = limit − value (at-most) or value − limit (at-least).
 */
export interface SpecItem {
  readonly id: string;
  readonly title: string;
  readonly unit: string;
  readonly bound: Bound;
  readonly outcome: "limit" | "unbounded" | "impossible" | "not-required" | "not-determined";
  readonly value?: number;
  readonly templateValue?: number;
  readonly margin?: number;
  /** margin / |value|; absent when the limit is 0. */
  readonly relativeMargin?: number;
  /** Whether the template part meets this line; absent when the line sets no limit it can fail. */
  readonly meets?: boolean;
  /** The corner (or event) at which the limit is set, in words, with its conditions where there are any. */
  readonly corner?: string;
  readonly conditions?: Readonly<Record<string, number | string>>;
  readonly source?: SpecSource;
  readonly reason: string;
}

/** A limit line, with its margin against the template's own value. */
export function limitItem(
  base: Pick<SpecItem, "id" | "title" | "unit" | "bound">,
  value: number,
  templateValue: number | undefined,
  rest: Pick<SpecItem, "reason"> & Partial<Pick<SpecItem, "corner" | "conditions" | "source">>,
): SpecItem {
  if (templateValue === undefined) return { ...base, outcome: "limit", value, ...rest };
  const margin = base.bound === "at-most" ? value - templateValue : templateValue - value;
  // A limit equal to the part's value within rounding counts as met (the boundary is inclusive).
  const meets = margin >= -1e-9 * Math.max(Math.abs(value), 1e-300);
  return {
    ...base,
    outcome: "limit",
    value,
    templateValue,
    margin,
    ...(value === 0 ? {} : { relativeMargin: margin / Math.abs(value) }),
    meets,
    ...rest,
  };
}

export function fmt(x: number): string {
  return String(Number(x.toPrecision(4)));
}
