import type { LoadModel } from "./load-model.js";

/** Forward law of one bridge element at a fixed temperature: drop V and dV/dI ohm at I ≥ 0. */
export interface ForwardLaw {
  readonly dropV: (currentA: number) => number;
  readonly slopeOhm: (currentA: number) => number;
}

/** The two laws of the pair that conducts when the source current is positive / negative. */
export interface PairLaws {
  readonly positive: readonly [ForwardLaw, ForwardLaw];
  readonly negative: readonly [ForwardLaw, ForwardLaw];
}

/**
 * Sine source e(t) = √2·Vrms·sin(2πft) in series with R and L, a full bridge, and a reservoir
 * capacitor C with series ESR across which the load sits. pairLaws gives the element laws for the
 * voltage the controllers run from (the reservoir voltage).
 */
export interface AcBridgeCircuit extends AcSourceAndFilter {
  readonly pairLaws: (controllerSupplyV: number) => PairLaws;
}

/** The AC source, its leakage, the reservoir capacitor and the load: shared by every AC bridge model. */
export interface AcSourceAndFilter {
  readonly sourceRmsV: number;
  readonly frequencyHz: number;
  readonly sourceResistanceOhm: number;
  /** Leakage inductance of the source (transformer), H; 0 for none. */
  readonly leakageInductanceH: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  readonly load: LoadModel;
}

/** Just the source-and-filter fields of a larger model (the circuit carries nothing else of it). */
export function sourceAndFilterOf(m: AcSourceAndFilter): AcSourceAndFilter {
  return {
    sourceRmsV: m.sourceRmsV,
    frequencyHz: m.frequencyHz,
    sourceResistanceOhm: m.sourceResistanceOhm,
    leakageInductanceH: m.leakageInductanceH,
    capacitanceF: m.capacitanceF,
    esrOhm: m.esrOhm,
    load: m.load,
  };
}

/** Everything at one instant: the state, the algebraic variables and the state derivatives. */
export interface Snapshot {
  readonly t: number;
  readonly sourceV: number;
  readonly capV: number;
  /** Source (line 1) current, A; positive flows through the positive pair. */
  readonly lineA: number;
  readonly outV: number;
  readonly loadA: number;
  readonly capA: number;
  /** Which pair conducts: 1 positive, −1 negative, 0 none. */
  readonly pair: 1 | -1 | 0;
  /** Drops of the conducting pair's two elements, V. */
  readonly dropAV: number;
  readonly dropBV: number;
  /** Voltage across the leakage inductance, V. */
  readonly inductorV: number;
  /**
   * Sensitivity of the stage solution to its right-hand side b (solveStage): ∂capA/∂b₀, ∂capA/∂b₁,
   * ∂vL/∂b₀, ∂vL/∂b₁ (the b₁ terms only with inductance). The integrator chains these into the
   * derivative of the period map (its shooting Jacobian). The state derivatives are
   * d(capV)/dt = capA/C and d(lineA)/dt = inductorV/L.
   */
  readonly dCapAdB0: number;
  readonly dCapAdB1: number;
  readonly dVLdB0: number;
  readonly dVLdB1: number;
}

export function loadCurrentA(load: LoadModel, v: number): number {
  switch (load.kind) {
    case "resistive":
      return v / load.resistanceOhm;
    case "constant-current":
      return load.currentA;
    case "constant-power":
      return load.powerW / v;
  }
}

export function loadSlopeS(load: LoadModel, v: number): number {
  switch (load.kind) {
    case "resistive":
      return 1 / load.resistanceOhm;
    case "constant-current":
      return 0;
    case "constant-power":
      return -load.powerW / (v * v);
  }
}

/** v + k·ℓ(v) = b for the output voltage v > 0 (high-voltage root for constant power). */
export function solveOutputV(load: LoadModel, b: number, k: number): number | undefined {
  let v: number;
  switch (load.kind) {
    case "resistive":
      v = b / (1 + k / load.resistanceOhm);
      break;
    case "constant-current":
      v = b - k * load.currentA;
      break;
    case "constant-power": {
      const disc = b * b - 4 * k * load.powerW;
      if (!(disc >= 0)) return undefined;
      v = 0.5 * (b + Math.sqrt(disc));
      break;
    }
  }
  return v > 0 ? v : undefined;
}
