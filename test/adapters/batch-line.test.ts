import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { batchLine, isBatchLine } from "../../adapters/batch/run-batch.js";

// The hand check of a batch line (the fast path) must accept exactly what the zod schema accepts.
// Oracle: batchLine.safeParse, on edge cases and on random lines.
const edge: unknown[] = [
  { procedure: "operatingPoint", input: {} },
  { id: 1, procedure: "x" },
  { id: 1, procedure: "x", input: null },
  { id: "a".repeat(200), procedure: "x" },
  { id: "a".repeat(201), procedure: "x" },
  { id: JSON.parse("1e400") as number, procedure: "x" },
  { id: -0, procedure: "x" },
  { id: null, procedure: "x" },
  { id: true, procedure: "x" },
  { id: [], procedure: "x" },
  { procedure: "" },
  { procedure: "p".repeat(200) },
  { procedure: "p".repeat(201) },
  { procedure: 3 },
  {},
  [],
  [{ procedure: "x" }],
  null,
  "operatingPoint",
  7,
  JSON.parse('{"__proto__": {"procedure": "x"}, "procedure": "y"}'),
  JSON.parse('{"__proto__": {"procedure": "x"}}'),
];

describe("isBatchLine", () => {
  it("agrees with batchLine on edge cases", () => {
    const withInput = edge
      .filter((v) => typeof v === "object" && v !== null && !Array.isArray(v))
      .map((v) => ({ ...(v as object), input: {} }));
    expect(withInput.filter((v) => batchLine.safeParse(v).success).length).toBeGreaterThanOrEqual(5);
    for (const v of [...edge, ...withInput])
      expect(isBatchLine(v), JSON.stringify(v)).toBe(batchLine.safeParse(v).success);
  });
  it("agrees with batchLine on random lines", () => {
    const id = fc.oneof(
      fc.constant(undefined),
      fc.string({ maxLength: 260 }),
      fc.double(),
      fc.integer(),
      fc.boolean(),
      fc.constant(null),
    );
    const procedure = fc.oneof(fc.string({ maxLength: 260 }), fc.integer(), fc.constant(undefined));
    const line = fc.oneof(fc.record({ id, procedure, input: fc.jsonValue() }, { requiredKeys: [] }), fc.jsonValue());
    fc.assert(
      fc.property(line, (v) => {
        // through JSON, as a batch line arrives (drops undefined, turns non-finite doubles to null)
        const text = JSON.stringify(v);
        if (text === undefined) return;
        const parsed = JSON.parse(text) as unknown;
        expect(isBatchLine(parsed)).toBe(batchLine.safeParse(parsed).success);
      }),
      { numRuns: 3000, seed: 9 },
    );
  });
});
