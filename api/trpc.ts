import { initTRPC } from "@trpc/server";
import type { Context } from "./context.js";
import { errorBodyOf } from "./error-body.js";

const t = initTRPC.context<Context>().create({
  errorFormatter({ shape, error }) {
    const backstop = errorBodyOf(error);
    // an internal error's own message may hold internals: the client gets the generic one
    const message = backstop.code === "internal" ? backstop.message : shape.message;
    return { ...shape, message, data: { code: shape.data.code, httpStatus: shape.data.httpStatus, path: shape.data.path, backstop } };
  },
});

export const router = t.router;

/** Tell the context's observer of one call that began at `started` (performance.now()). */
export function observeCall(ctx: Context, path: string, started: number, r: { ok: true; data: unknown } | { ok: false; error: unknown }): void {
  if (ctx.observe === undefined) return;
  const seconds = (performance.now() - started) / 1000;
  ctx.observe(r.ok ? { path, ok: true, data: r.data, seconds } : { path, ok: false, error: r.error, seconds });
}

/** Times every call (input parsing included) and tells the context's observer, if any. */
const observed = t.middleware(async ({ path, ctx, next }) => {
  if (ctx.observe === undefined) return next();
  const started = performance.now();
  const r = await next();
  observeCall(ctx, path, started, r.ok ? { ok: true, data: r.data } : { ok: false, error: r.error });
  return r;
});

export const publicProcedure = t.procedure.use(observed);
export const createCallerFactory = t.createCallerFactory;
