import { z } from "zod";
import "./zod-messages.js";
import { stageSpec } from "./stage.js";

export const catalogEntry = z.strictObject({
  id: z.string().regex(/^[a-z0-9][a-z0-9._-]{0,199}$/, "ids are lower-case letters, digits, '.', '_' and '-'"),
  description: z.string().min(1).max(500),
  stage: stageSpec,
});
export const catalogFile = z.strictObject({
  catalog: z.string().min(1).meta({ description: "name of this parts list" }),
  parts: z.array(catalogEntry),
});
export type CatalogFile = z.output<typeof catalogFile>;
