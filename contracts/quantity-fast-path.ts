/**
 * The common spellings of a quantity read without mathjs: "<number> <unit>" where the unit is the
 * field's own unit or that unit with one of mathjs's short SI prefixes ("20 mOhm" for an ohm field,
 * "3 A", "85 degC"). The value is what mathjs gives for the same text: for these units (SI units of
 * scale 1 and no offset) mathjs stores number × prefix and converts back by dividing by 1, so the
 * product here is the same double (test/contracts/quantity-fast-path.test.ts compares every entry
 * against mathjs). Anything else (other units, compound or affine conversions, expressions mathjs
 * refuses) returns undefined and goes to mathjs, which also writes the error messages.
 *
 * Why: mathjs builds its unit system on first use, at start-up for a catalog with unit strings (the
 * demo catalog's "20 nA", "30 mOhm"). Bench row `ab-node22` "no-quantity-fast-path: process start to
 * /readyz 200" (Node 22, 5 alternating runs): without this path start-up took 1.88 (1.02-2.57) times
 * as long, 839 against 560 ms (target 500 ms, the row `start-up`).
 */

/** mathjs's short prefixes, as mathjs defines their values (memory; checked against mathjs in the test). */
const SHORT_PREFIXES: ReadonlyMap<string, number> = new Map([
  ["p", 1e-12],
  ["n", 1e-9],
  ["u", 1e-6],
  ["m", 1e-3],
  ["k", 1e3],
  ["M", 1e6],
  ["G", 1e9],
]);

/** Field units that take the short prefixes in mathjs and are SI units of scale 1 with no offset. */
const PREFIXABLE: ReadonlySet<string> = new Set(["V", "A", "ohm", "W", "J", "F", "H", "Hz", "s", "C"]);

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/** The value in `fieldUnit`, or undefined when the text is not one of the spellings above. */
export function fastQuantity(normalisedText: string, fieldUnit: string): number | undefined {
  if (normalisedText.endsWith(fieldUnit)) {
    const v = numberPart(normalisedText.slice(0, normalisedText.length - fieldUnit.length));
    if (v !== undefined) return v;
  }
  if (!PREFIXABLE.has(fieldUnit)) return undefined;
  const at = normalisedText.length - fieldUnit.length - 1;
  if (at < 1 || !normalisedText.endsWith(fieldUnit)) return undefined;
  const scale = SHORT_PREFIXES.get(normalisedText.charAt(at));
  const v = scale === undefined ? undefined : numberPart(normalisedText.slice(0, at));
  return v === undefined || scale === undefined ? undefined : v * scale;
}

/** A plain decimal number (optionally followed by spaces), or undefined. */
function numberPart(text: string): number | undefined {
  const t = text.trimEnd();
  if (!NUMBER.test(t)) return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : undefined;
}
