import { initTRPC } from "@trpc/server";
import { middlewareMarker } from "@trpc/server/unstable-core-do-not-import";
import { ZodError } from "zod";
import type { Context } from "./context.js";
import { errorBodyOf, UNPROCESSABLE_CODES } from "./error-body.js";

const t = initTRPC.context<Context>().create({
  errorFormatter({ shape, error }) {
    const backstop = errorBodyOf(error);
    // an internal error's own message may hold internals: the client gets the generic one
    // and a zod error's is all its issues as JSON (unbounded): the client gets the capped body's
    const message = backstop.code === "internal" || error.cause instanceof ZodError ? backstop.message : shape.message;
    const httpStatus = UNPROCESSABLE_CODES.has(backstop.code) ? 422 : shape.data.httpStatus;
    return { ...shape, message, data: { code: shape.data.code, httpStatus, path: shape.data.path, backstop } };
  },
});

export const router = t.router;

/** Tell the context's observer of one call that began at `started` (performance.now()). */
export function observeCall(ctx: Context, path: string, started: number, r: { ok: true; data: unknown } | { ok: false; error: unknown }): void {
  if (ctx.observe === undefined) return;
  const seconds = (performance.now() - started) / 1000;
  ctx.observe(r.ok ? { path, ok: true, data: r.data, seconds } : { path, ok: false, error: r.error, seconds });
}

/**
 * Times every call (input parsing included) and tells the context's observer, if any; where the
 * context offloads the call, its answer comes from there and the rest of the chain does not run.
 */
const observed = t.middleware(async ({ path, ctx, next, getRawInput }) => {
  const away = ctx.offload === undefined ? undefined : ctx.offload(path, await getRawInput());
  if (away !== undefined) {
    const started = performance.now();
    try {
      const data = await away;
      observeCall(ctx, path, started, { ok: true, data });
      // the result a resolver's middleware gives (tRPC's shape): the chain ends here
      return { marker: middlewareMarker, ok: true as const, data, ctx } as unknown as Awaited<ReturnType<typeof next>>;
    } catch (error) {
      observeCall(ctx, path, started, { ok: false, error });
      throw error;
    }
  }
  if (ctx.observe === undefined) return next();
  const started = performance.now();
  const r = await next();
  observeCall(ctx, path, started, r.ok ? { ok: true, data: r.data } : { ok: false, error: r.error });
  return r;
});

export const publicProcedure = t.procedure.use(observed);
export const createCallerFactory = t.createCallerFactory;
