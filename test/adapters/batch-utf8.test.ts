import { describe, expect, it } from "vitest";
import { Utf8Sink } from "../../adapters/batch/answer.js";

describe("batch output chunks are the UTF-8 of the joined lines (oracle: Buffer.from of the joined text)", () => {
  it("ASCII, two- and three-byte characters, astral characters and a lone surrogate, in a sink that has to grow", () => {
    const texts = [
      '{"a":1}\n',
      '{"b":"Rds(on) ∝ (T/298.15 K)^2.3, 85 °C"}\n',
      '{"c":"𝄞 µΩ"}\n',
      '{"d":"\uD800"}\n',
      "",
      "é".repeat(20_000),
    ];
    const sink = new Utf8Sink(1);
    for (const t of texts) sink.write(t);
    expect(Buffer.compare(sink.bytes(), Buffer.from(texts.join(""), "utf8"))).toBe(0);
    expect(sink.length).toBe(Buffer.byteLength(texts.join(""), "utf8"));
  });
  it("an empty chunk is empty", () => {
    expect(new Utf8Sink(0).bytes().length).toBe(0);
  });
});
