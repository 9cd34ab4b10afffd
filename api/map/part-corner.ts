import type { DatasheetMax } from "../../contracts/datasheet-max.js";
import type { ResolvedStage } from "./resolve-stage.js";

/**
 * A catalog part is judged at its own datasheet-maximum corner (its catalog entry's datasheetMax)
 * unless the candidate or template gives one, as sizing.catalog judges it; the assumptions say
 * which corner was used.
 */
export function withPartCorner<C extends { readonly datasheetMax?: DatasheetMax | undefined }>(
  c: C,
  stage: ResolvedStage,
  path: readonly (string | number)[],
  assumptions: string[],
): C {
  if (stage.datasheetMax === undefined) return c;
  if (c.datasheetMax !== undefined) {
    assumptions.push(
      `${path.join(".")}: its own datasheetMax is used, not the catalog part's (catalog ${stage.partId})`,
    );
    return c;
  }
  assumptions.push(
    `${path.join(".")}: judged at the catalog part's own datasheet-maximum corner (catalog ${stage.partId} datasheetMax)`,
  );
  return { ...c, datasheetMax: stage.datasheetMax };
}
