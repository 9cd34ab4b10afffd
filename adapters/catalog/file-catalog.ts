import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { dirname } from "node:path";
import type { CatalogPart, PartsCatalog } from "../../api/context.js";
import { catalogFile } from "../../contracts/catalog.js";
import { issuesOf, pathText } from "../../contracts/zod-messages.js";
import { canonicalJson } from "../../domain/rules/rule-set-hash.js";
import { resolveCurveFiles } from "../curves/curve-files.js";

export class CatalogLoadError extends Error {
  override name = "CatalogLoadError";
}

/**
 * Load and validate a parts catalog file (JSON); a bad entry stops the load, naming it. A curve
 * given as a CSV file (`{ "csv": "curves/vf.csv" }`) is read from the catalog's folder first.
 */
export function loadCatalogFile(path: string): PartsCatalog {
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, "utf8"));
  } catch (e) {
    throw new CatalogLoadError(`cannot read the parts catalog ${path}: ${(e as Error).message}`);
  }
  const curves = resolveCurveFiles(raw, { baseDir: dirname(path), root: dirname(path) });
  if (!curves.ok) {
    const first = curves.problems[0];
    throw new CatalogLoadError(
      `parts catalog ${path} is invalid at ${first ? pathText(first.path) : "?"}: ${first?.message ?? ""}`,
    );
  }
  const parsed = catalogFile.safeParse(curves.value);
  if (!parsed.success) {
    const first = issuesOf(parsed.error.issues)[0];
    throw new CatalogLoadError(
      `parts catalog ${path} is invalid at ${first ? pathText(first.path) : "?"}: ${first?.message ?? ""}`,
    );
  }
  return catalogOf(parsed.data.catalog, parsed.data.parts);
}

/** A catalog of these parts, stamped with its name, the hash of its parts (sorted by id) and their count. */
export function catalogOf(name: string, parts: readonly CatalogPart[]): PartsCatalog {
  const byId = new Map<string, CatalogPart>();
  for (const p of parts) {
    if (byId.has(p.id)) throw new CatalogLoadError(`parts catalog: duplicate id "${p.id}"`);
    byId.set(p.id, p);
  }
  const sorted = [...byId.values()].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  const hash = `sha256:${createHash("sha256").update(canonicalJson(sorted)).digest("hex")}`;
  const stamp = { id: name, hash, partCount: sorted.length };
  return { find: (id) => byId.get(id), list: () => [...byId.values()], stamp };
}
