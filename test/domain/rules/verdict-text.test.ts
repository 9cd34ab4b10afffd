import { describe, expect, it } from "vitest";
import { formatQuantity } from "../../../domain/rules/quantity-text.js";
import { comparisonReason } from "../../../domain/rules/verdict-text.js";

// Text for reviewers: engineering prefixes (SI prefixes, powers of 1000) and 4 significant digits;
// each expected string is worked by hand.
describe("quantities in words", () => {
  it.each([
    [8e-5, "A", "80 µA"],
    [13.8e-6, "s", "13.8 µs"],
    [0.002, "s", "2 ms"],
    [157.80342, "°C", "157.8 °C"],
    [-7.80342, "K", "-7.803 K"],
    [0.0719859, "V", "71.99 mV"],
    [47.75, "A", "47.75 A"],
    [51234, "J", "51.23 kJ"],
    [0.9999999, "A", "1 A"],
    [999.99, "V", "1 kV"],
    [0, "V", "0 V"],
    [0.25, "1", "0.25"],
  ])("%s %s is %s", (x, unit, want) => {
    expect(formatQuantity(x, unit)).toBe(want);
  });
});

describe("reasons of failed comparisons", () => {
  it("give the left side, both sides with the vocabulary's unit and the margin (K for °C)", () => {
    expect(
      comparisonReason("tjWorstC <= part.tjMaxC", ["tjWorstC", "part.tjMaxC"], "<=", 157.80342, 150, -7.80342),
    ).toBe("tjWorstC = 157.8 °C <= 150 °C does not hold (margin -7.803 K)");
    expect(
      comparisonReason(
        "holdUpS >= holdUpRequiredS",
        ["holdUpS", "holdUpRequiredS"],
        ">=",
        13.8e-6,
        0.002,
        13.8e-6 - 0.002,
      ),
    ).toBe("holdUpS = 13.8 µs >= 2 ms does not hold (margin -1.986 ms)");
  });
  it("read a difference of two temperatures in K", () => {
    expect(comparisonReason("part.tjMaxC - reverseTjC >= 25", ["part.tjMaxC", "reverseTjC"], ">=", 20, 25, -5)).toBe(
      "part.tjMaxC - reverseTjC = 20 K >= 25 K does not hold (margin -5 K)",
    );
  });
  it("write numbers bare where the left side mixes units", () => {
    expect(comparisonReason("lossWorstW + dropWorstV <= 2", ["lossWorstW", "dropWorstV"], "<=", 3, 2, -1)).toBe(
      "lossWorstW + dropWorstV = 3 <= 2 does not hold (margin -1)",
    );
  });
});
