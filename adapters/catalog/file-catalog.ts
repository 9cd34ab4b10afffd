import { readFileSync } from "node:fs";
import type { CatalogPart, PartsCatalog } from "../../api/context.js";
import { catalogFile } from "../../contracts/catalog.js";
import { issuesOf, pathText } from "../../contracts/zod-messages.js";

export class CatalogLoadError extends Error {
  override name = "CatalogLoadError";
}

/** Load and validate a parts catalog file (JSON); a bad entry stops the load, naming it. */
export function loadCatalogFile(path: string): PartsCatalog {
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, "utf8"));
  } catch (e) {
    throw new CatalogLoadError(`cannot read the parts catalog ${path}: ${(e as Error).message}`);
  }
  const parsed = catalogFile.safeParse(raw);
  if (!parsed.success) {
    const first = issuesOf(parsed.error.issues)[0];
    throw new CatalogLoadError(
      `parts catalog ${path} is invalid at ${first ? pathText(first.path) : "?"}: ${first?.message ?? ""}`,
    );
  }
  return catalogOf(parsed.data.parts);
}

export function catalogOf(parts: readonly CatalogPart[]): PartsCatalog {
  const byId = new Map<string, CatalogPart>();
  for (const p of parts) {
    if (byId.has(p.id)) throw new CatalogLoadError(`parts catalog: duplicate id "${p.id}"`);
    byId.set(p.id, p);
  }
  return { find: (id) => byId.get(id), list: () => [...byId.values()] };
}
