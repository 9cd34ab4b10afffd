import { batteryCharge } from "./procedures/battery-charge.js";
import { bridgeAc } from "./procedures/bridge-ac.js";
import { bridgeDc } from "./procedures/bridge-dc.js";
import { catalog } from "./procedures/catalog.js";
import { fit } from "./procedures/fit.js";
import { holdUp } from "./procedures/hold-up.js";
import { operatingPoint } from "./procedures/operating-point.js";
import { oring } from "./procedures/oring.js";
import { review } from "./procedures/review.js";
import { rules } from "./procedures/rules.js";
import { sizing } from "./procedures/sizing.js";
import { turnOff } from "./procedures/turn-off.js";
import { verify } from "./procedures/verify.js";

/**
 * Every procedure of backstop, each declared once (`defineProcedure` in `api/procedures/`). The
 * tRPC router (`api/router.ts`), `/v1` and bulk, the batch, the compute threads, the OpenAPI
 * document and the metrics are all built from this list (`api/procedure-registry.ts`).
 */
export const PROCEDURE_TABLE = [
  operatingPoint,
  review,
  ...rules,
  turnOff,
  holdUp,
  oring,
  batteryCharge,
  bridgeDc,
  bridgeAc,
  ...sizing,
  fit,
  ...catalog,
  verify,
] as const;

/** A procedure of the table. */
export type TableProcedure = (typeof PROCEDURE_TABLE)[number];
