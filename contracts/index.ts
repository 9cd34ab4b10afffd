/** The public contracts: zod schemas and the types inferred from them, for clients to import. */
export * from "./diode.js";
export * from "./load.js";
export * from "./mosfet.js";
export * from "./operating-point.js";
export * from "./outcome.js";
export * from "./quantity.js";
export * from "./stage.js";
export * from "./thermal.js";
export * from "./catalog.js";
export * from "./rule-set.js";
export * from "./rules.js";
export * from "./turn-off.js";
export * from "./hold-up.js";
export * from "./oring.js";
export * from "./battery-charge.js";
export * from "./bridge.js";
export * from "./review.js";
