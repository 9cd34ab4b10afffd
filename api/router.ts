import type { AnyTRPCProcedure } from "@trpc/server";
import { PROCEDURE_TABLE, type TableProcedure } from "./procedure-table.js";
import { router, trpcProcedure } from "./trpc.js";

/** `{ rules: { evaluate: P } }` for the name "rules.evaluate". */
type Nested<Name extends string, P> = Name extends `${infer Head}.${infer Rest}`
  ? { [K in Head]: Nested<Rest, P> }
  : { [K in Name]: P };
type Intersection<U> = (U extends unknown ? (u: U) => void : never) extends (i: infer I) => void ? I : never;
type Merged<T> = { [K in keyof T]: T[K] extends AnyTRPCProcedure ? T[K] : Merged<T[K]> };
/** The router's record: each table entry's tRPC query at its dotted name. */
type RouterRecord = Merged<
  Intersection<
    TableProcedure extends infer D
      ? D extends TableProcedure
        ? Nested<D["name"], ReturnType<typeof trpcProcedure<D>>>
        : never
      : never
  >
>;

function nest(): RouterRecord {
  const root: Record<string, unknown> = {};
  for (const d of PROCEDURE_TABLE) {
    const parts = d.name.split(".");
    let node = root;
    for (const part of parts.slice(0, -1)) {
      node[part] ??= {};
      node = node[part] as Record<string, unknown>;
    }
    node[parts.at(-1) as string] = trpcProcedure(d);
  }
  return root as RouterRecord;
}

/** Every analysis of backstop over tRPC, built from the procedure table (`api/procedure-table.ts`). */
export const appRouter = router(nest());

/** Clients import only this type (`import type { AppRouter } from "backstop/api/router"`). */
export type AppRouter = typeof appRouter;
