import { describe, expect, it } from "vitest";
import { issuesOf } from "../../contracts/zod-messages.js";
import { metricRecord, ruleSetSchema } from "../../contracts/rule-set.js";
import { builtInRuleSetFiles } from "../../domain/rules/built-in-sets.js";

describe("rule-set contract", () => {
  it.each(builtInRuleSetFiles().map(([name, data]) => [name, data] as const))(
    "%s has the contract's shape (strict: no stray keys)",
    (_name, data) => {
      const r = ruleSetSchema.safeParse(data);
      expect(r.success ? "ok" : JSON.stringify(r.error.issues)).toBe("ok");
    },
  );
  it("refuses a metric name outside the vocabulary, naming it", () => {
    const r = metricRecord.safeParse({ tjWorstC: 100, tjWorstc: 101 });
    expect(r.success).toBe(false);
    if (!r.success)
      expect(issuesOf(r.error.issues)[0]).toEqual({
        path: ["tjWorstc"],
        message: "unknown field `tjWorstc`; did you mean `tjWorstC`?",
      });
  });
});
