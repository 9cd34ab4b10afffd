import { initTRPC } from "@trpc/server";
import { ZodError, type z } from "zod";
import type { Context } from "./context.js";
import type { ProcedureDefinition } from "./define-procedure.js";
import { edgeBodyOf } from "./edge-refusal.js";
import { errorBodyOf, UNPROCESSABLE_CODES } from "./error-body.js";
import { runProcedure } from "./procedure-registry.js";

const t = initTRPC.context<Context>().create({
  errorFormatter({ shape, error }) {
    // a request the HTTP edge refused (no API key, a body too large) keeps the edge's code
    const edge = edgeBodyOf(error);
    if (edge !== undefined)
      return {
        ...shape,
        data: { code: shape.data.code, httpStatus: shape.data.httpStatus, path: shape.data.path, backstop: edge },
      };
    const backstop = errorBodyOf(error);
    // an internal error's own message may hold internals: the client gets the generic one
    // and a zod error's is all its issues as JSON (unbounded): the client gets the capped body's
    const message = backstop.code === "internal" || error.cause instanceof ZodError ? backstop.message : shape.message;
    const httpStatus = UNPROCESSABLE_CODES.has(backstop.code) ? 422 : shape.data.httpStatus;
    return { ...shape, message, data: { code: shape.data.code, httpStatus, path: shape.data.path, backstop } };
  },
});

export const router = t.router;

/**
 * The tRPC query of a table entry. Its input reaches the resolver as the client sent it (typed by
 * the input contract for clients): the call itself parses it, wherever the context runs it
 * (`runProcedure`: here, or the HTTP server's compute threads through `offload`).
 */
/** A handler's answer with the verdict record the call definition adds, where the output contract has one. */
type Recorded<A, Out> = Out extends { record: infer R } ? (A extends object ? A & { readonly record: R } : A) : A;

export function trpcProcedure<D extends ProcedureDefinition>(definition: D) {
  type Answer = Recorded<Awaited<ReturnType<D["handler"]>>, z.output<D["output"]>>;
  const passThrough = (raw: unknown) => raw as z.input<D["input"]>;
  return t.procedure
    .input(passThrough)
    .query(({ input, ctx }) => runProcedure(definition.name, input, ctx) as Answer | Promise<Answer>);
}
