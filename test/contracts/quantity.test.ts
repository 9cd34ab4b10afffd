import { describe, expect, it } from "vitest";
import { quantity, temperatureC } from "../../contracts/quantity.js";

describe("quantities: numbers in the field's unit or unit strings, dimension-checked", () => {
  const ohm = quantity("ohm", "r", { ge: 0 });
  it.each([
    ["2.5 mOhm", 0.0025],
    ["2.5 mΩ", 0.0025],
    ["2.5mohm", 0.0025],
    ["1 kOhm", 1000],
    [0.1, 0.1],
  ])("reads %s as %f ohm", (raw, expected) => {
    expect(ohm.parse(raw)).toBeCloseTo(expected, 12);
  });
  it("converts temperatures with their offset", () => {
    expect(temperatureC("t").parse("85 degC")).toBeCloseTo(85, 12);
    expect(temperatureC("t").parse("85 °C")).toBeCloseTo(85, 12);
    expect(temperatureC("t").parse("358.15 K")).toBeCloseTo(85, 9);
  });
  it("refuses a wrong dimension, a missing unit, junk, NaN text and out-of-range values with a message", () => {
    const amps = quantity("A", "i", { ge: 0 });
    const bad: [unknown, RegExp][] = [
      ["5 V", /wrong dimension/],
      ["5", /no unit/],
      ["five amps", /cannot read/],
      ["NaN", /cannot read|no unit|finite/],
      [-1, /at least 0/],
      ["x".repeat(100), /expected/],
      [null, /expected a number/],
    ];
    for (const [raw, msg] of bad) {
      const r = amps.safeParse(raw);
      expect(r.success).toBe(false);
      if (!r.success) expect(r.error.issues[0]?.message ?? "").toMatch(msg);
    }
    expect(temperatureC("t").safeParse(-300).success).toBe(false);
  });
});
