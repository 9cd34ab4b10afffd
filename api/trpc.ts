import { initTRPC } from "@trpc/server";
import type { Context } from "./context.js";
import { errorBodyOf } from "./error-body.js";

const t = initTRPC.context<Context>().create({
  errorFormatter({ shape, error }) {
    return { ...shape, data: { code: shape.data.code, httpStatus: shape.data.httpStatus, path: shape.data.path, backstop: errorBodyOf(error) } };
  },
});

export const router = t.router;
export const publicProcedure = t.procedure;
export const createCallerFactory = t.createCallerFactory;
