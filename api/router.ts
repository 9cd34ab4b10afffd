import { operatingPoint } from "./procedures/operating-point.js";
import { review } from "./procedures/review.js";
import { rules } from "./procedures/rules.js";
import { router } from "./trpc.js";

/** Every analysis of backstop; adapters (HTTP, batch) all enter here. */
export const appRouter = router({
  operatingPoint,
  review,
  rules,
});

/** Clients import only this type (`import type { AppRouter } from "backstop/api/router"`). */
export type AppRouter = typeof appRouter;
