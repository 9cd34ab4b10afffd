import { batteryCharge } from "./procedures/battery-charge.js";
import { holdUp } from "./procedures/hold-up.js";
import { bridgeAc } from "./procedures/bridge-ac.js";
import { bridgeDc } from "./procedures/bridge-dc.js";
import { fit } from "./procedures/fit.js";
import { operatingPoint } from "./procedures/operating-point.js";
import { oring } from "./procedures/oring.js";
import { review } from "./procedures/review.js";
import { rules } from "./procedures/rules.js";
import { sizing } from "./procedures/sizing.js";
import { turnOff } from "./procedures/turn-off.js";
import { router } from "./trpc.js";

/** Every analysis of backstop; adapters (HTTP, batch) all enter here. */
export const appRouter = router({
  operatingPoint,
  review,
  rules,
  turnOff,
  holdUp,
  oring,
  batteryCharge,
  bridgeDc,
  bridgeAc,
  sizing,
  fit,
});

/** Clients import only this type (`import type { AppRouter } from "backstop/api/router"`). */
export type AppRouter = typeof appRouter;
