import { type AcBridgeCircuit, type ForwardLaw, type PairLaws, sourceAndFilterOf } from "../solve/ac-bridge-circuit.js";
import type { BridgeAcModel } from "./bridge-ac.js";
import {
  BRIDGE_POSITIONS,
  type BridgePosition,
  elementLaw,
  gateDriveOf,
  isControlledElement,
} from "./bridge-element.js";

/**
 * The AC bridge's circuit at fixed element temperatures: the source and filter of the model and
 * the forward laws of the conducting pairs as the stage solver asks for them (per step, at the
 * instantaneous supply that sets each controller's gate drive).
 */
export function buildCircuit(
  m: BridgeAcModel,
  tjK: Readonly<Record<BridgePosition, number>>,
  parts: Readonly<Record<BridgePosition, string>>,
): AcBridgeCircuit {
  // Positions holding the same part at the same temperature share one law (the stage solver
  // evaluates a pair's law once when both elements are the same).
  const canonical = new Map<BridgePosition, BridgePosition>();
  for (const p of BRIDGE_POSITIONS) canonical.set(p, BRIDGE_POSITIONS.find((q) => parts[q] === parts[p]) ?? p);
  // Diode laws do not depend on the controller supply: build them once.
  const fixed = new Map<BridgePosition, ForwardLaw>();
  for (const p of BRIDGE_POSITIONS) {
    const e = m.elements[p];
    const q = canonical.get(p) ?? p;
    if (!isControlledElement(e)) fixed.set(p, fixed.get(q) ?? elementLaw(e, tjK[p], 0).law);
  }
  // MOSFET laws depend on the supply only through the gate drive: rebuild when that changes.
  const cache = new Map<BridgePosition, { gateV: number | undefined; law: ForwardLaw }>();
  const gates = new Map<BridgePosition, (supplyV: number) => number | undefined>();
  for (const p of BRIDGE_POSITIONS) {
    const e = m.elements[p];
    if (isControlledElement(e)) gates.set(p, gateDriveOf(e));
  }
  const lawOf = (position: BridgePosition, supplyV: number): ForwardLaw => {
    const p = canonical.get(position) ?? position;
    const f = fixed.get(p);
    if (f !== undefined) return f;
    const e = m.elements[p];
    const gateV = gates.get(p)?.(supplyV);
    const hit = cache.get(p);
    if (hit !== undefined && hit.gateV === gateV) return hit.law;
    const law = elementLaw(e, tjK[p], supplyV).law;
    cache.set(p, { gateV, law });
    return law;
  };
  const allFixed = fixed.size === 4;
  const pairs = (supplyV: number): PairLaws => ({
    positive: [lawOf("line1High", supplyV), lawOf("line2Low", supplyV)],
    negative: [lawOf("line2High", supplyV), lawOf("line1Low", supplyV)],
  });
  const constant = allFixed ? pairs(0) : undefined;
  // The integrator asks once per step; the laws change only when a gate drive does, so the
  // last answer is kept (same supply, or same four laws) instead of a new record per step.
  let lastSupplyV = Number.NaN;
  let lastPairs: PairLaws | undefined;
  // A law is a function of the gate drive alone (elementLaw): equal drives, the same four laws.
  const driven = BRIDGE_POSITIONS.filter((p) => canonical.get(p) === p && !fixed.has(p));
  const lastGates: (number | undefined)[] = driven.map(() => undefined);
  const cachedPairs = (supplyV: number): PairLaws => {
    if (lastPairs !== undefined && supplyV === lastSupplyV) return lastPairs;
    lastSupplyV = supplyV;
    let same = lastPairs !== undefined;
    for (let k = 0; k < driven.length; k += 1) {
      const p = driven[k];
      const g = p === undefined ? undefined : gates.get(p)?.(supplyV);
      if (g !== lastGates[k]) same = false;
      lastGates[k] = g;
    }
    if (same && lastPairs !== undefined) return lastPairs;
    const p = pairs(supplyV);
    if (lastPairs !== undefined && samePairs(p, lastPairs)) return lastPairs;
    lastPairs = p;
    return p;
  };
  return {
    ...sourceAndFilterOf(m),
    pairLaws: constant !== undefined ? () => constant : cachedPairs,
  };
}

function samePairs(a: PairLaws, b: PairLaws): boolean {
  return (
    a.positive[0] === b.positive[0] &&
    a.positive[1] === b.positive[1] &&
    a.negative[0] === b.negative[0] &&
    a.negative[1] === b.negative[1]
  );
}
