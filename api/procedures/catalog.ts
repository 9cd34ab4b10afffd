import type { z } from "zod";
import { catalogListInput, catalogListOutput, catalogShowInput, catalogShowOutput } from "../../contracts/catalog.js";
import { LIMITS } from "../../contracts/limits.js";
import { defineProcedure } from "../define-procedure.js";
import { catalogPart } from "../map/resolve-stage.js";

const byId = (a: { id: string }, b: { id: string }) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);

/**
 * catalog.list, catalog.show: what the parts catalog in use holds (adapters/catalog/), with its
 * stamp, so a caller can see which catalog data its answers were computed from.
 */
export const catalog = [
  defineProcedure({
    name: "catalog.list",
    input: catalogListInput,
    output: catalogListOutput,
    handler: ({ input, ctx }): z.output<typeof catalogListOutput> => {
      const cat = ctx.catalog;
      const offset = input?.offset ?? 0;
      const limit = input?.limit ?? LIMITS.maxCatalogListParts;
      const kind = input?.kind;
      const matching = cat
        .list()
        .filter((p) => kind === undefined || p.stage.kind === kind)
        .sort(byId);
      const page = matching.slice(offset, offset + limit);
      const next = offset + page.length;
      return {
        stamp: cat.stamp,
        total: matching.length,
        offset,
        ...(next < matching.length ? { nextOffset: next } : {}),
        parts: page.map((p) => ({ id: p.id, kind: p.stage.kind, description: p.description })),
      };
    },
  }),
  defineProcedure({
    name: "catalog.show",
    input: catalogShowInput,
    output: catalogShowOutput,
    handler: ({ input, ctx }) => {
      const cat = ctx.catalog;
      return { stamp: cat.stamp, part: catalogPart(cat, input.id, ["id"]) };
    },
  }),
] as const;
