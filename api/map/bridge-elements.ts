import { BRIDGE_ELEMENT_KINDS, BRIDGE_POSITIONS, type BridgeElementsInput } from "../../contracts/bridge.js";
import type { StageInput } from "../../contracts/stage.js";
import type { BridgeElement, BridgeElements } from "../../domain/checks/bridge-element.js";
import type { PartsCatalog } from "../context.js";
import { inputProblem } from "../input-problem.js";
import { resolveStage } from "./resolve-stage.js";

/** Contract bridge elements ({ all } | { high, low } | four positions) → the domain's four elements. */
export function toBridgeElements(
  input: BridgeElementsInput,
  catalog: PartsCatalog,
  path: (string | number)[],
  assumptions: string[],
): BridgeElements {
  const one = (s: StageInput, key: string): BridgeElement => {
    const stage = resolveStage(s, catalog, [...path, key], assumptions).model;
    if ((BRIDGE_ELEMENT_KINDS as readonly string[]).includes(stage.kind)) return stage as BridgeElement;
    throw inputProblem(
      "invalid-input",
      [...path, key, "kind"],
      `a bridge element must be one of ${BRIDGE_ELEMENT_KINDS.join(", ")} (got ${stage.kind})`,
    );
  };
  if ("all" in input) {
    const e = one(input.all, "all");
    return { line1High: e, line2High: e, line1Low: e, line2Low: e };
  }
  if ("high" in input) {
    const h = one(input.high, "high");
    const l = one(input.low, "low");
    return { line1High: h, line2High: h, line1Low: l, line2Low: l };
  }
  const [a, b, c, d] = BRIDGE_POSITIONS.map((p) => one(input[p], p));
  if (a === undefined || b === undefined || c === undefined || d === undefined)
    throw new Error("unreachable: four positions");
  return { line1High: a, line2High: b, line1Low: c, line2Low: d };
}
