import type { MosfetModel, StageModel } from "../stages/stage-model.js";

/**
 * Default temperature coefficient of a MOSFET's drain-source breakdown voltage, per kelvin: +0.1 %/K
 * (memory; datasheets of low-voltage power MOSFETs draw V(BR)DSS rising roughly linearly with Tj, common practice).
 */
export const DEFAULT_VDS_TEMPCO_PER_K = 0.001;

/**
 * Breakdown voltage at a junction temperature, V: the 25 °C rating scaled linearly,
 * V(Tj) = V25 · (1 + α·(Tj − 25 °C)), for Tj below 25 °C; at and above 25 °C the rating itself
 * (no credit for the higher breakdown of a hot die: the rating is the absolute maximum).
 * α is bounded by the contract (≤ 0.003 /K), so V(Tj) stays positive down to −273 °C.
 */
export function breakdownAtTjV(rated25V: number, tempCoPerK: number, tjC: number): number {
  return tjC >= 25 ? rated25V : rated25V * (1 + tempCoPerK * (tjC - 25));
}

/** The stage's discrete MOSFET (the pair's FETs are alike), undefined for a stage without one. */
export function stageMosfet(stage: StageModel): MosfetModel | undefined {
  switch (stage.kind) {
    case "pfet-high-side":
    case "nfet-low-side":
    case "nfet-ideal-diode":
    case "nfet-back-to-back":
      return stage.mosfet;
    default:
      return undefined;
  }
}

/**
 * A MOSFET stage's drain-source breakdown at the coldest ambient (the blocking die carries no
 * current then, so its junction sits at ambient), V; undefined for a stage without a MOSFET.
 */
export function mosfetBreakdownColdV(stage: StageModel, ambientMinC: number): number | undefined {
  const m = stageMosfet(stage);
  return m === undefined
    ? undefined
    : breakdownAtTjV(m.vdsMaxV, m.vdsTempCoPerK ?? DEFAULT_VDS_TEMPCO_PER_K, ambientMinC);
}
