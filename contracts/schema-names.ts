import { z } from "zod";
import * as batteryCharge from "./battery-charge.js";
import * as bridge from "./bridge.js";
import * as catalog from "./catalog.js";
import * as curvePoints from "./curve-points.js";
import * as datasheetMax from "./datasheet-max.js";
import * as diode from "./diode.js";
import * as fit from "./fit.js";
import * as holdUp from "./hold-up.js";
import * as inrush from "./inrush.js";
import * as contracts from "./index.js";
import * as load from "./load.js";
import * as mosfet from "./mosfet.js";
import * as operatingPoint from "./operating-point.js";
import * as oring from "./oring.js";
import * as outcome from "./outcome.js";
import * as problem from "./problem.js";
import * as record from "./record.js";
import * as requirement from "./requirement.js";
import * as reviewOutput from "./review-output.js";
import * as review from "./review.js";
import * as ruleSet from "./rule-set.js";
import * as rules from "./rules.js";
import * as sizing from "./sizing.js";
import * as stage from "./stage.js";
import * as thermal from "./thermal.js";
import * as transientThermal from "./transient-thermal.js";
import * as turnOff from "./turn-off.js";
import * as verify from "./verify.js";

/**
 * The modules whose exported zod schemas are the named, shared components of the OpenAPI document
 * (api/openapi-components.ts). A new contract module gets its line here (or is re-exported from
 * index.ts); a schema it exports is then one component wherever it is used. A schema that is not
 * exported is written out where it is used.
 */
const MODULES: readonly Record<string, unknown>[] = [
  contracts,
  batteryCharge,
  bridge,
  catalog,
  curvePoints,
  datasheetMax,
  diode,
  fit,
  holdUp,
  inrush,
  load,
  mosfet,
  operatingPoint,
  oring,
  outcome,
  problem,
  record,
  requirement,
  review,
  reviewOutput,
  ruleSet,
  rules,
  sizing,
  stage,
  thermal,
  transientThermal,
  turnOff,
  verify,
];

/** `stageSpec` → `StageSpec`, `rules.show` → `RulesShow`: the PascalCase name of an export or a procedure path. */
export const pascalName = (path: string): string =>
  path
    .split(/[.\-_]/)
    .map((p) => p.charAt(0).toUpperCase() + p.slice(1))
    .join("");

/**
 * Parts of exported schemas that several places use but their module does not export, with the
 * name their component gets (reached through the shapes, so the compiler follows a change).
 */
const PARTS = (): readonly (readonly [z.ZodType, string])[] => {
  const blocks = turnOff.turnOffEventOutput.options[0].shape;
  const doesNotBlock = turnOff.turnOffEventOutput.options[1].shape;
  return [
    [blocks.clamp.unwrap(), "TurnOffClampPhase"],
    [doesNotBlock.gateTurnOff.unwrap(), "TurnOffGateTurnOff"],
    [bridge.bridgeDcOutput.shape.bridge, "DcBridge"],
    [bridge.bridgeDcOutput.shape.bridge.shape.positive, "DcBridgePolarity"],
    [bridge.acBridgeOutcome.options[0].shape.steadyState, "AcBridgeSteadyState"],
    [blocks.energies, "TurnOffEnergies"],
    [blocks.end, "TurnOffWindowState"],
    [blocks.loop, "TurnOffLoop"],
    [reviewOutput.monteCarloResult.shape.tjC.unwrap(), "MonteCarloDistribution"],
  ];
};

/**
 * Every exported contract schema with its component name (the export's name in PascalCase, without
 * a trailing "Schema": `ruleSetSchema` → `RuleSet`), in a stable order (module, then export name).
 * A schema exported under two names keeps the first.
 */
export function sharedSchemaNames(): ReadonlyMap<z.ZodType, string> {
  const names = new Map<z.ZodType, string>();
  for (const m of MODULES)
    for (const key of Object.keys(m).sort()) {
      const value = m[key];
      if (value instanceof z.ZodType && !names.has(value))
        names.set(value, pascalName(key).replace(/(.)Schema$/, "$1"));
    }
  for (const [schema, name] of PARTS()) if (!names.has(schema)) names.set(schema, name);
  return names;
}
