/** The load behind the stage. */
export type LoadModel =
  | { readonly kind: "constant-current"; readonly currentA: number }
  | { readonly kind: "resistive"; readonly resistanceOhm: number }
  /** A DC/DC converter input: constant power while its input is at or above minVoltageV. */
  | { readonly kind: "constant-power"; readonly powerW: number; readonly minVoltageV: number };
