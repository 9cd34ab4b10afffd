import { describe, expect, it } from "vitest";
import { fastQuantity } from "../../contracts/quantity-fast-path.js";
import { mathjs } from "../../domain/rules/mathjs-bundle.js";

/** What mathjs gives for the text in the field's unit (the path the fast one stands in for). */
function viaMathjs(text: string, fieldUnit: string): number {
  const u = mathjs().unit(text);
  if (!u.equalBase(mathjs().unit(fieldUnit))) throw new Error(`${text} is not ${fieldUnit}`);
  return u.toNumber(fieldUnit);
}

const FIELD_UNITS = ["V", "A", "ohm", "W", "J", "F", "H", "Hz", "s", "C", "K", "degC", "h", "K/W", "J/K", "V/K", "A*h"];
const PREFIXES = ["p", "n", "u", "m", "k", "M", "G"];
const NUMBERS = ["0", "1", "2.5", "20", "0.047", ".5", "1e-3", "4.7E3", "-12", "+3", "123456.789", "3."];

describe("unit strings read without mathjs give mathjs's value, bit for bit (oracle: mathjs's unit parser)", () => {
  it("the field's own unit, with and without a space", () => {
    for (const f of FIELD_UNITS) {
      for (const n of NUMBERS) {
        for (const text of [`${n} ${f}`, `${n}${f}`]) {
          const fast = fastQuantity(text, f);
          expect(fast, text).toBeDefined();
          // mathjs's affine °C round trip may differ in the last bit; the plain number is the exact value
          if (f === "degC") expect(fast).toBeCloseTo(viaMathjs(text, f), 10);
          else expect(fast, text).toBe(viaMathjs(text, f));
        }
      }
    }
  });
  it("every short prefix on every prefixable unit", () => {
    for (const f of ["V", "A", "ohm", "W", "J", "F", "H", "Hz", "s", "C"]) {
      for (const p of PREFIXES) {
        for (const n of NUMBERS) {
          const text = `${n} ${p}${f}`;
          expect(fastQuantity(text, f), text).toBe(viaMathjs(text, f));
        }
      }
    }
  });
  it("leaves everything else to mathjs (other units, other dimensions, junk, no unit)", () => {
    const others: [string, string][] = [
      ["85 degC", "K"],
      ["358.15 K", "degC"],
      ["2 h", "s"],
      ["5 mK", "K"],
      ["5 V", "A"],
      ["5 kV", "A"],
      ["5", "V"],
      ["five V", "V"],
      ["1 + 2 V", "V"],
      ["5 mm", "V"],
      ["5 xV", "V"],
      ["5 mdegC", "degC"],
      ["1e400 V", "V"],
      ["5 mK/W", "K/W"],
      ["5 Ah", "A*h"],
      ["0x10 V", "V"],
    ];
    for (const [text, f] of others) expect(fastQuantity(text, f), `${text} as ${f}`).toBeUndefined();
  });
});
