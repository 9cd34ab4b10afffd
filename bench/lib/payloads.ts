/** The request bodies the bench sends. */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { root } from "./processes.js";

export const opJson = JSON.stringify(
  JSON.parse(readFileSync(join(root, "examples", "http", "operatingPoint.body.json"), "utf8")),
);
export const reviewInput = (
  JSON.parse(readFileSync(join(root, "examples", "requests", "review.json"), "utf8")) as { input: unknown }
).input;
export const reviewJson = JSON.stringify(reviewInput);
const PARTS = [
  "demo-schottky-10a-60v",
  "demo-pfet-40v-12mohm",
  "demo-ideal-diode-60v-3mohm",
  "demo-integrated-ideal-diode-5a-36v",
  "demo-schottky-5a-45v",
];

/** a deterministic operating-point case k (part, current, ambient vary) */
export function opCase(k: number): Record<string, unknown> {
  return {
    stage: { kind: "catalog-part", partId: PARTS[k % PARTS.length] },
    supplyV: 12 + (k % 7),
    sourceResistanceOhm: 0.02,
    load: { kind: "constant-current", currentA: 0.5 + (k % 11) * 0.25 },
    ambientC: -40 + (k % 13) * 10,
  };
}
