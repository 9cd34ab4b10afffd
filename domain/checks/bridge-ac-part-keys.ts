import type { BridgeElements, BridgePosition } from "./bridge-element.js";
import type { BridgeAcModel } from "./bridge-ac-types.js";
/**
 * Whether the bridge is half-wave symmetric: the first element of each pair is the same part at
 * the same temperature, and so is the second (line1High ~ line2High, line2Low ~ line1Low).
 * Structural equality of the element records; anything else takes the whole period.
 */
export function halfWaveSymmetric(parts: Readonly<Record<BridgePosition, string>>): boolean {
  return parts.line1High === parts.line2High && parts.line2Low === parts.line1Low;
}

/** A key per position: equal keys are the same element record (structurally) at the same junction temperature. */
export function partKeys(
  m: BridgeAcModel,
  tjK: Readonly<Record<BridgePosition, number>>,
): Readonly<Record<BridgePosition, string>> {
  const key = (p: BridgePosition) => `${tjK[p]}|${recordKey(m.elements[p])}`;
  return {
    line1High: key("line1High"),
    line2High: key("line2High"),
    line1Low: key("line1Low"),
    line2Low: key("line2Low"),
  };
}

/** The element records are read-only: their serialisation is kept per record (the electrothermal loop asks again and again). */
const RECORD_KEYS = new WeakMap<object, string>();
function recordKey(e: BridgeElements[BridgePosition]): string {
  const hit = RECORD_KEYS.get(e);
  if (hit !== undefined) return hit;
  const k = JSON.stringify(e);
  RECORD_KEYS.set(e, k);
  return k;
}
