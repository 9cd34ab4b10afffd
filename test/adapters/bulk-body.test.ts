import { describe, expect, it } from "vitest";
import type { ItemJson } from "../../adapters/compute/call.js";
import { problemOf } from "../../adapters/http/problem.js";
import { bulkBody, bulkBodyUtf8 } from "../../adapters/http/v1.js";

// The bulk answer is joined from results already written out; it must be the bytes of
// JSON.stringify({ results, ok, failed }) of the same results (the form it had before).
describe("bulkBody", () => {
  it("is JSON.stringify of the results, byte for byte", () => {
    const results: unknown[] = [
      { outcome: "solved", x: 1.5e-300, s: 'quote " and \u2028 and é' },
      { a: [1, null, { b: -0 }] },
      "text",
      0,
    ];
    const error = {
      code: "invalid-input" as const,
      message: "invalid input at load.currentA: bad",
      issues: [{ path: ["load", "currentA"], message: "bad" }],
    };
    const items: ItemJson[] = [
      ...results.map((r): ItemJson => ({ ok: true, json: JSON.stringify(r), outcome: "ok", seconds: 0 })),
      { ok: false, status: 400, error, outcome: "invalid-input", seconds: 0 },
    ];
    const expected = JSON.stringify({
      results: [...results.map((result) => ({ ok: true, result })), { ok: false, problem: problemOf(400, error) }],
      ok: 4,
      failed: 1,
    });
    expect(bulkBody(items)).toBe(expected);
    expect(bulkBody([])).toBe(JSON.stringify({ results: [], ok: 0, failed: 0 }));
    // the bytes sent: the UTF-8 of the same text (oracle: Buffer.from)
    expect(Buffer.compare(bulkBodyUtf8(items), Buffer.from(expected, "utf8"))).toBe(0);
    expect(bulkBodyUtf8([]).toString("utf8")).toBe(JSON.stringify({ results: [], ok: 0, failed: 0 }));
  });
});
