import { describe, expect, it } from "vitest";
import { utf8Of } from "../../adapters/batch/stream-batch.js";

describe("batch output chunks are the UTF-8 of the joined lines (oracle: Buffer.from of the joined text)", () => {
  it("ASCII, two- and three-byte characters, astral characters and a lone surrogate", () => {
    const texts = ['{"a":1}\n', '{"b":"Rds(on) ∝ (T/298.15 K)^2.3, 85 °C"}\n', '{"c":"𝄞 µΩ"}\n', '{"d":"\uD800"}\n', ""];
    const outs = texts.map((text) => ({ ok: true, text }));
    expect(Buffer.compare(utf8Of(outs), Buffer.from(texts.join(""), "utf8"))).toBe(0);
  });
  it("an empty chunk is empty", () => {
    expect(utf8Of([]).length).toBe(0);
  });
});
