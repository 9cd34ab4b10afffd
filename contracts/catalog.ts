import { z } from "zod";
import "./zod-messages.js";
import { datasheetMax } from "./datasheet-max.js";
import { LIMITS, limitMessage } from "./limits.js";
import { STAGE_KINDS, stageSpec } from "./stage.js";

export const catalogEntry = z.strictObject({
  id: z.string().regex(/^[a-z0-9][a-z0-9._-]{0,199}$/, "ids are lower-case letters, digits, '.', '_' and '-'"),
  description: z.string().min(1).max(500),
  stage: stageSpec,
  datasheetMax: datasheetMax.optional().meta({
    description:
      "this part's datasheet-maximum tolerance corner (sizing.catalog judges the part at it; absent: typical values, unless the request gives a default)",
  }),
});
export const catalogFile = z.strictObject({
  catalog: z.string().min(1).meta({ description: "name of this parts list" }),
  parts: z.array(catalogEntry),
});
export type CatalogFile = z.output<typeof catalogFile>;

/** What identifies the catalog data an answer used (api/context.ts, `CatalogStamp`). */
export const catalogStamp = z
  .object({
    id: z.string().meta({ description: "the catalog's name (a folder's: its files' names joined by ' + ')" }),
    hash: z.string().meta({ description: "sha256 of the parts' canonical JSON, sorted by id" }),
    partCount: z.number().int(),
  })
  .meta({ description: "the parts catalog in use: name, content hash and part count" });

export const catalogListInput = z
  .strictObject({
    kind: z.enum(STAGE_KINDS).optional().meta({ description: "only parts of this stage kind" }),
    offset: z.number().int().min(0).default(0).meta({ description: "parts to skip (in id order)" }),
    limit: z
      .number()
      .int()
      .min(1)
      .max(LIMITS.maxCatalogListParts, { error: limitMessage("maxCatalogListParts", "limit") })
      .optional()
      .meta({ description: "most parts in the answer (default and most: BACKSTOP_MAX_CATALOG_LIST_PARTS)" }),
  })
  .optional()
  .meta({ description: "the parts catalog in use: its stamp and its parts (id, kind, description), a page at a time" });

export const catalogListOutput = z.object({
  stamp: catalogStamp,
  total: z.number().int().meta({ description: "parts that match (every part without `kind`)" }),
  offset: z.number().int(),
  nextOffset: z.number().int().optional().meta({ description: "the offset of the next page, if there is one" }),
  parts: z.array(z.object({ id: z.string(), kind: z.enum(STAGE_KINDS), description: z.string() })),
});

export const catalogShowInput = z
  .strictObject({ id: z.string().min(1).max(200).meta({ description: "a part id (catalog.list gives them)" }) })
  .meta({ description: "one part of the parts catalog in full, as the analyses read it, with the catalog's stamp" });

export const catalogShowOutput = z.object({ stamp: catalogStamp, part: catalogEntry });
