import { operatingPoint } from "./procedures/operating-point.js";
import { router } from "./trpc.js";

/** Every analysis of backstop; adapters (HTTP, batch) all enter here. */
export const appRouter = router({
  operatingPoint,
});

/** Clients import only this type (`import type { AppRouter } from "backstop/api/router"`). */
export type AppRouter = typeof appRouter;
