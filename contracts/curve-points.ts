import { z } from "zod";
import { quantity, temperatureC } from "./quantity.js";

/**
 * The points of every datasheet curve a part or the `fit` procedure takes, one schema each, and
 * the form a list of them takes: inline points, or (in a batch input file or a parts catalog file
 * only) a reference `{ "csv": "curves/vf.csv" }` to a CSV file whose header row names the point's
 * fields, e.g. `currentA,voltageV,tempC`. The batch and catalog adapters replace a reference by the
 * file's points before the contract parses it (adapters/curves/curve-files.ts); anywhere else
 * (HTTP, tRPC) the reference reaches the contract and is refused, saying what to send instead.
 */

export const forwardPoint = z.strictObject({
  currentA: quantity("A", "forward current of the datasheet point", { gt: 0, le: 1e5 }),
  voltageV: quantity("V", "forward voltage of the datasheet point", { gt: 0, le: 100 }),
  tempC: temperatureC("junction temperature of the point (default 25 °C)").optional(),
});

/** A point of a normalised Rds(on)(Tj) curve (the factor Rds(on)(Tj)/Rds(on)(25 °C)). */
export const rdsFactorPoint = z.strictObject({
  tjC: temperatureC("junction temperature"),
  factor: z.number().gt(0).lte(100).meta({ description: "Rds(on)(Tj)/Rds(on)(25 °C)", unit: "1" }),
});

/** A point of an Rds(on)(Tj) curve in ohms (or the normalised factor as a plain number). */
export const rdsOnTjPoint = z.strictObject({
  tjC: temperatureC("junction temperature"),
  rdsOnOhm: quantity(
    "ohm",
    "on-resistance at that Tj (or the normalised factor Rds(on)(Tj)/Rds(on)(25 °C), given as a plain number)",
    { gt: 0, le: 1e3 },
  ),
});

/** A point of the Rds(on)(Vgs) table at 25 °C. */
export const rdsOnVgsPoint = z.strictObject({
  gateSourceV: quantity("V", "gate-source drive (magnitude)", { gt: 0, le: 10_000 }),
  rdsOnOhm: quantity("ohm", "on-resistance at 25 °C", { gt: 0, le: 1e3 }),
});

/** A point of a single-pulse Zth(t) curve. */
export const zthPoint = z.strictObject({
  timeS: quantity("s", "pulse duration", { gt: 0, le: 1e6 }),
  zthKPerW: quantity("K/W", "single-pulse transient thermal impedance", { gt: 0, le: 10_000 }),
});

/** A point of the reverse leakage curves IR(Tj, VR). */
export const leakagePoint = z.strictObject({
  tjC: temperatureC("junction temperature"),
  reverseV: quantity("V", "reverse voltage", { gt: 0, le: 10_000 }),
  currentA: quantity("A", "reverse current", { gt: 0, le: 10 }),
});

type PointSchema = z.ZodObject<z.ZodRawShape, z.core.$strict>;

/** Every curve's point, with what it is: a curve file's header names the fields of one of them. */
export const CURVE_POINT_FORMS: readonly { readonly curve: string; readonly point: PointSchema }[] = [
  { curve: "diode forward Vf(I, T)", point: forwardPoint },
  { curve: "normalised Rds(on)(Tj)", point: rdsFactorPoint },
  { curve: "Rds(on)(Tj)", point: rdsOnTjPoint },
  { curve: "Rds(on)(Vgs)", point: rdsOnVgsPoint },
  { curve: "single-pulse Zth(t)", point: zthPoint },
  { curve: "reverse leakage IR(Tj, VR)", point: leakagePoint },
];

/** The point's fields as a curve file's header: `currentA,voltageV[,tempC]` (optional ones bracketed). */
export function headerOf(point: PointSchema): string {
  return Object.entries(point.shape)
    .map(([k, s]) => ((s as z.ZodType).safeParse(undefined).success ? `[,${k}]` : `,${k}`))
    .join("")
    .slice(1);
}

/**
 * An object where the points were to be: a curve file reference (`{ "csv": ... }`), refused
 * here, naming what to send instead; any other object, refused as not the list. (Any object, so
 * that an object that is no reference is told about the list, not about the reference's fields.)
 */
function fileReferenceRefused(point: PointSchema) {
  const fields = Object.keys(point.shape).join(", ");
  return z
    .looseObject({})
    .superRefine((v, ctx) => {
      const keys = Object.keys(v);
      const reference = keys.length === 1 && keys[0] === "csv" && typeof v.csv === "string";
      ctx.addIssue({
        code: "custom",
        message: reference
          ? `a curve file is read only from a batch input file's or a parts catalog file's folder, never from a request: send the points inline, [{ ${fields} }, ...]`
          : `expected array of points, [{ ${fields} }, ...] (or, in a batch input or catalog file, { "csv": "curves/file.csv" })`,
      });
    })
    .pipe(z.never())
    .meta({
      description: `batch input and catalog files only: { "csv": "curves/file.csv" }, a CSV file (relative to the referencing file) whose header row is ${headerOf(point)}, replaced by its points before the input is read`,
      examples: [{ csv: "curves/file.csv" }],
    });
}

/** A curve's points: inline, or (batch and catalog files only) a CSV file reference. */
export function curvePoints<T extends PointSchema>(
  point: T,
  o: { readonly min: number; readonly max: number; readonly description: string },
) {
  // every list a caller can make long has a bound (DEVELOPERS.md, "Bounds")
  return z.union([
    z.array(point).min(o.min).max(o.max).meta({ description: o.description }),
    fileReferenceRefused(point),
  ]);
}
