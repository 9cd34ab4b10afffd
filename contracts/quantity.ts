import type { Unit } from "mathjs";
import { mathjs } from "../domain/rules/mathjs-bundle.js";
import { z } from "zod";
import "./zod-messages.js";
import { fastQuantity } from "./quantity-fast-path.js";

/**
 * A physical quantity in a request: a number in the unit its field name states, or a string with
 * a value and a unit ("2.5 mOhm", "2.5 mΩ", "85 degC", "85 °C", "3 A", "10 uA"), parsed by
 * mathjs's unit parser (values and units only, never an expression), dimension-checked against
 * the field's unit and converted to it. This is the only place in backstop where units convert.
 */
export interface Bounds {
  /** exclusive lower bound, in the field's unit */
  readonly gt?: number;
  readonly ge?: number;
  readonly lt?: number;
  readonly le?: number;
}

const MAX_QUANTITY_STRING = 64;

/** Unit spellings of the trade that mathjs does not know, mapped to its names. */
function normaliseUnitText(text: string): string {
  return text
    .replace(/Ω|Ohms?|ohms/g, "ohm")
    .replace(/°\s*C\b/g, "degC")
    .replace(/°\s*F\b/g, "degF")
    .replace(/µ|μ/g, "u")
    .trim();
}

type Converted = { ok: true; value: number } | { ok: false; message: string };

/** "20mR", "4k7R": the trade's R for ohms, which mathjs does not read (nor does backstop: R is ambiguous). */
const R_FOR_OHM = /^\s*([+-]?[\d.]+(?:e[+-]?\d+)?)\s*([pnumkMG]?)R\s*$/i;
/** A temperature written with C (coulomb) or F (farad) where degC or degF was meant. */
const BARE_TEMPERATURE = /^\s*([+-]?[\d.]+(?:e[+-]?\d+)?)\s*([CF])\s*$/;

function convert(raw: string, fieldUnit: string): Converted {
  const text = normaliseUnitText(raw);
  const fast = fastQuantity(text, fieldUnit);
  if (fast !== undefined) return { ok: true, value: fast };
  const example = `"1.5 ${fieldUnit}"`;
  let parsed: Unit;
  try {
    parsed = mathjs().unit(text);
  } catch {
    const r = R_FOR_OHM.exec(text);
    if (r)
      return {
        ok: false,
        message: `cannot read "${raw}": R is not read as ohm; type "${r[1]} ${r[2]}ohm" (or ${r[1]} ${r[2]}Ω)`,
      };
    return {
      ok: false,
      message: `cannot read "${raw}" as a value with a unit: type a number in ${fieldUnit} or a string such as ${example}`,
    };
  }
  if (parsed.units.length === 0) {
    return {
      ok: false,
      message: `"${raw}" has no unit: give a number in ${fieldUnit} or a value with a unit, such as ${example}`,
    };
  }
  if (!parsed.equalBase(mathjs().unit(fieldUnit))) {
    const t = fieldUnit === "degC" ? BARE_TEMPERATURE.exec(text) : null;
    if (t)
      return {
        ok: false,
        message: `"${raw}" reads ${t[2]} as ${t[2] === "C" ? "coulomb (charge)" : "farad (capacitance)"}, not a temperature: type "${t[1]} deg${t[2]}" (or ${t[1]} °${t[2]})`,
      };
    return {
      ok: false,
      message: `"${raw}" is not a quantity of the kind ${fieldUnit} measures (wrong dimension): type a value in ${fieldUnit}, such as ${example}`,
    };
  }
  return { ok: true, value: parsed.toNumber(fieldUnit) };
}

function checkBounds(value: number, unitName: string, b: Bounds): string | undefined {
  if (!Number.isFinite(value)) return "must be a finite number";
  if (b.gt !== undefined && !(value > b.gt)) return `must be greater than ${b.gt} ${unitName}`;
  if (b.ge !== undefined && !(value >= b.ge)) return `must be at least ${b.ge} ${unitName}`;
  if (b.lt !== undefined && !(value < b.lt)) return `must be less than ${b.lt} ${unitName}`;
  if (b.le !== undefined && !(value <= b.le)) return `must be at most ${b.le} ${unitName}`;
  return undefined;
}

/** A quantity field in unit `unitName` (a mathjs unit: "V", "A", "ohm", "degC", "K/W", "s", "F", "H", "W", "J"). */
export function quantity(unitName: string, description: string, bounds: Bounds = {}) {
  return z
    .union([z.number(), z.string().max(MAX_QUANTITY_STRING)], {
      error: (iss) =>
        iss.input === undefined ? "required" : `expected a number in ${unitName} or a string with a unit`,
    })
    .transform((raw, ctx) => {
      let value: number;
      if (typeof raw === "number") value = raw;
      else {
        const r = convert(raw, unitName);
        if (!r.ok) {
          ctx.addIssue({ code: "custom", message: r.message, input: raw });
          return z.NEVER;
        }
        value = r.value;
      }
      const problem = checkBounds(value, unitName, bounds);
      if (problem !== undefined) {
        ctx.addIssue({ code: "custom", message: problem, input: raw });
        return z.NEVER;
      }
      return value;
    })
    .meta({ description, unit: unitName, ...bounds });
}

/** A dimensionless number with bounds. */
export function ratio(description: string, bounds: Bounds = {}) {
  let s = z.number({ error: (iss) => (iss.input === undefined ? "required" : "expected a number") });
  if (bounds.gt !== undefined) s = s.gt(bounds.gt);
  if (bounds.ge !== undefined) s = s.gte(bounds.ge);
  if (bounds.lt !== undefined) s = s.lt(bounds.lt);
  if (bounds.le !== undefined) s = s.lte(bounds.le);
  return s.meta({ description, unit: "1" });
}

/** Absolute zero in °C, the lower bound of every temperature field. */
export const ABSOLUTE_ZERO_C = -273.15;
/**
 * The upper bound of every temperature field, 400 °C: above any junction, ambient or datasheet
 * temperature of the silicon and SiC parts backstop models (common practice: SiC dice are rated to
 * about 200-250 °C, solders melt at about 180-300 °C), so a larger figure is a typo or a unit slip.
 */
export const MAX_TEMPERATURE_C = 400;
export const temperatureC = (description: string) =>
  quantity("degC", description, { gt: ABSOLUTE_ZERO_C, le: MAX_TEMPERATURE_C });

/** A positive voltage of up to 10 kV, in V. */
export const volts = (d: string) => quantity("V", d, { gt: 0, le: 10_000 });
