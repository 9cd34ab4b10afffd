import { randomUUID } from "node:crypto";
import { fetchRequestHandler } from "@trpc/server/adapters/fetch";
import { Hono } from "hono";
import type { Context } from "../../api/context.js";
import { appRouter } from "../../api/router.js";
import type { Logger } from "../logging/logger.js";

export interface AppDeps {
  readonly ctx: Context;
  readonly logger: Logger;
}

type Env = { Variables: { requestId: string } };

const REQUEST_ID = /^[\w.:-]{1,128}$/;

/** The HTTP face of backstop: tRPC under /trpc, probes, one log line per request. */
export function createApp({ ctx, logger }: AppDeps): Hono<Env> {
  const app = new Hono<Env>();

  app.use("*", async (c, next) => {
    const incoming = c.req.header("x-request-id");
    const requestId = incoming !== undefined && REQUEST_ID.test(incoming) ? incoming : randomUUID();
    c.set("requestId", requestId);
    const started = performance.now();
    await next();
    c.header("x-request-id", requestId);
    logger.info({ requestId, method: c.req.method, path: c.req.path, status: c.res.status, durationMs: Math.round((performance.now() - started) * 1000) / 1000 }, "request");
  });

  app.get("/healthz", (c) => c.json({ status: "ok" }));

  app.all("/trpc/*", (c) =>
    fetchRequestHandler({
      endpoint: "/trpc",
      req: c.req.raw,
      router: appRouter,
      allowMethodOverride: true,
      createContext: () => ctx,
      onError: ({ error, path }) => {
        if (error.code === "INTERNAL_SERVER_ERROR") logger.error({ requestId: c.get("requestId"), path, err: error.cause ?? error }, "procedure failed");
      },
    }),
  );

  app.notFound((c) => c.json({ code: "not-found", message: `no route ${c.req.method} ${c.req.path}` }, 404));
  app.onError((err, c) => {
    logger.error({ requestId: c.get("requestId"), err }, "unhandled error");
    return c.json({ code: "internal", message: "internal error" }, 500);
  });
  return app;
}
