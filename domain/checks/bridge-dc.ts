import { fmt } from "../solve/electrical-point.js";
import { solveOperatingPoint } from "../solve/electrothermal-point.js";
import { bracketedRoot, goldenMax } from "../solve/root-find.js";
import type { ConductionMode } from "../stages/conduction.js";
import { stageQuiescentA } from "../stages/stage-model.js";
import {
  BRIDGE_POSITIONS,
  type BridgeElement,
  type BridgePosition,
  CONDUCTING_PAIR,
  elementReverseRatingV,
  elementRthKPerW,
  elementTjMaxC,
  type Polarity,
  REVERSE_PARTNER,
} from "./bridge-element.js";
import type { BridgeDcModel, BridgeDcResult, DcElementState, DcPolarityOutcome } from "./bridge-dc-types.js";

/**
 * A full bridge fed from DC of either polarity. For each polarity the two elements of the
 * conducting pair carry the load current in series; each sits on its own thermal path. At a trial
 * current each element's junction temperature is its own lowest stable fixed point of
 * Tj = Ta + Rth·P(I, Tj) (solveOperatingPoint with the element as the stage at constant current;
 * a controller runs from the bridge input voltage Vs − I·Rs). The current is then the root of the
 * load line: Vload(I) = Vs − I·Rs − V1(I, Tj1) − V2(I, Tj2) against the resistive, constant-
 * current or constant-power load (stable, high-voltage branch). Thermal stability is judged at
 * constant current, which is conservative for a resistive load. Blocking elements see the load
 * voltage plus the drop of the conducting element on the same line; their leakage is neglected.
 */
export function analyseBridgeDc(m: BridgeDcModel): BridgeDcResult {
  return { positive: analysePolarity(m, "positive"), negative: analysePolarity(m, "negative") };
}

type AtCurrent =
  | {
      readonly ok: true;
      readonly loadV: number;
      readonly inputV: number;
      readonly states: readonly [ElementAt, ElementAt];
    }
  | { readonly ok: false; readonly failure: DcPolarityOutcome };

interface ElementAt {
  readonly dropV: number;
  readonly lossW: number;
  readonly tjC: number;
  readonly mode: ConductionMode;
  readonly gain: number;
}

function analysePolarity(m: BridgeDcModel, polarity: Polarity): DcPolarityOutcome {
  const pair = CONDUCTING_PAIR[polarity];
  const iq = BRIDGE_POSITIONS.reduce((s, p) => s + quiescentA(m.elements[p]), 0);
  const at = (currentA: number): AtCurrent => {
    const inputV = m.supplyV - (currentA + iq) * m.sourceResistanceOhm;
    const states: ElementAt[] = [];
    for (const position of pair) {
      const r = elementAt(m.elements[position], currentA, inputV, m.ambientC, polarity, position);
      if ("failure" in r) return { ok: false, failure: r.failure };
      states.push(r);
    }
    const [a, b] = states;
    if (a === undefined || b === undefined) throw new Error("unreachable: a pair has two elements");
    return { ok: true, inputV, loadV: inputV - a.dropV - b.dropV, states: [a, b] };
  };
  let lastFailure: DcPolarityOutcome | undefined;
  const loadV = (currentA: number): number | undefined => {
    const r = at(currentA);
    if (r.ok) return r.loadV;
    lastFailure = r.failure;
    return undefined;
  };
  const collapse = (reason: string, maxW?: number): DcPolarityOutcome => ({
    outcome: "load-collapse",
    polarity,
    reason,
    ...(maxW === undefined ? {} : { maxDeliverablePowerW: maxW }),
  });

  const idle = loadV(0);
  if (idle === undefined || !(idle > 0))
    return lastFailure ?? collapse("the supply cannot hold the bridge's quiescent current");
  const load = m.load;
  let currentA: number;
  switch (load.kind) {
    case "constant-current":
      currentA = load.currentA;
      break;
    case "resistive": {
      // Infeasible currents (runaway, collapse) lie above the root: score them below the line.
      const f = (i: number): number => {
        const v = loadV(i);
        return v === undefined ? -(m.supplyV + 1) : v - i * load.resistanceOhm;
      };
      const hi = m.supplyV / load.resistanceOhm;
      currentA = bracketedRoot(f, 0, hi, f(0), f(hi), 1e-13 * hi).x;
      break;
    }
    case "constant-power": {
      const g = (i: number): number => {
        const v = loadV(i);
        return v === undefined || v < 0 ? 0 : i * v;
      };
      let zeroA = Math.max(load.powerW / idle, 1e-6);
      for (let k = 0; k < 200 && g(zeroA) > 0; k += 1) zeroA *= 2;
      const peak = goldenMax(g, 0, zeroA, 1e-10 * zeroA);
      if (peak.fx < load.powerW) {
        return collapse(
          `the bridge can deliver at most ${fmt(peak.fx)} W to the load, less than its ${fmt(load.powerW)} W`,
          peak.fx,
        );
      }
      const h = (i: number): number => g(i) - load.powerW;
      currentA = bracketedRoot(h, 0, peak.x, h(0), h(peak.x), 1e-13 * zeroA).x;
      break;
    }
  }
  const sol = at(currentA);
  if (!sol.ok) return sol.failure;
  if (!(sol.loadV > 0)) return lastFailure ?? collapse(`the supply cannot drive ${fmt(currentA)} A through the bridge`);
  if (load.kind === "resistive" && Math.abs(sol.loadV - currentA * load.resistanceOhm) > 1e-6 * m.supplyV) {
    return lastFailure ?? collapse("no operating point on the load line");
  }
  return assemble(m, polarity, currentA, sol);
}

function assemble(
  m: BridgeDcModel,
  polarity: Polarity,
  currentA: number,
  sol: Extract<AtCurrent, { ok: true }>,
): DcPolarityOutcome {
  const pair = CONDUCTING_PAIR[polarity];
  const conducting = new Map<BridgePosition, ElementAt>([
    [pair[0], sol.states[0]],
    [pair[1], sol.states[1]],
  ]);
  const elements: DcElementState[] = BRIDGE_POSITIONS.map((position) => {
    const e = m.elements[position];
    const s = conducting.get(position);
    const base = { position, tjMaxC: elementTjMaxC(e), reverseRatingV: elementReverseRatingV(e) };
    if (s !== undefined) {
      return {
        ...base,
        role: "conducting",
        mode: s.mode,
        currentA,
        dropV: s.dropV,
        lossW: s.lossW,
        tjC: s.tjC,
        reverseV: 0,
        thermalLoopGain: s.gain,
      };
    }
    const partner = conducting.get(REVERSE_PARTNER[position]);
    const reverseV = sol.loadV + (partner?.dropV ?? 0);
    return {
      ...base,
      role: "blocking",
      mode: "blocking",
      currentA: 0,
      dropV: 0,
      lossW: 0,
      tjC: m.ambientC,
      reverseV,
      thermalLoopGain: 0,
    };
  });
  const totalLossW = sol.states[0].lossW + sol.states[1].lossW;
  const totalDropV = sol.states[0].dropV + sol.states[1].dropV;
  const hot = elements.find((e) => e.tjC > e.tjMaxC);
  const common = {
    polarity,
    conducting: pair,
    bridgeInputV: sol.inputV,
    loadV: sol.loadV,
    loadCurrentA: currentA,
    totalDropV,
    totalLossW,
    elements,
  };
  if (hot !== undefined) {
    return {
      outcome: "over-temperature",
      ...common,
      reason: `${hot.position} runs at ${fmt(hot.tjC)} °C, above its ${fmt(hot.tjMaxC)} °C junction limit`,
    };
  }
  if (m.load.kind === "constant-power" && sol.loadV < m.load.minVoltageV) {
    return {
      outcome: "load-undervoltage",
      ...common,
      reason: `the load sees ${fmt(sol.loadV)} V, below its ${fmt(m.load.minVoltageV)} V minimum operating voltage`,
    };
  }
  return { outcome: "solved", ...common };
}

function elementAt(
  e: BridgeElement,
  currentA: number,
  inputV: number,
  ambientC: number,
  polarity: Polarity,
  position: BridgePosition,
): ElementAt | { failure: DcPolarityOutcome } {
  const r = solveOperatingPoint({
    stage: e,
    supplyV: inputV,
    sourceResistanceOhm: 0,
    load: { kind: "constant-current", currentA },
    ambientC,
    rthKPerW: elementRthKPerW(e),
  });
  switch (r.outcome) {
    case "solved":
    case "over-temperature":
    case "load-undervoltage":
      return {
        dropV: r.point.forward.dropV,
        lossW: r.point.dieLossW,
        tjC: r.point.tjC,
        mode: r.point.forward.mode,
        gain: r.point.thermalLoopGain,
      };
    case "thermal-runaway":
      return {
        failure: {
          outcome: "thermal-runaway",
          polarity,
          position,
          reason: `${position}: ${r.reason}`,
          searchedToC: r.evidence.searchedToC,
          lossAtSearchEndW: r.evidence.lossAtSearchEndW,
        },
      };
    case "load-collapse":
    case "stage-off":
      return { failure: { outcome: "load-collapse", polarity, reason: `${position}: ${r.reason}` } };
  }
}

function quiescentA(e: BridgeElement): number {
  return stageQuiescentA(e);
}
