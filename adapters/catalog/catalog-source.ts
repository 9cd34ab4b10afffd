import { readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import type { CatalogPart, PartsCatalog } from "../../api/context.js";
import { CatalogLoadError, catalogOf, loadCatalogFile } from "./file-catalog.js";

/** The files of a catalog folder: its `*.json` files (not hidden ones), in name order. */
export function catalogFolderFiles(folder: string): string[] {
  return readdirSync(folder)
    .filter((n) => n.endsWith(".json") && !n.startsWith("."))
    .sort()
    .map((n) => join(folder, n));
}

/**
 * The parts catalog `BACKSTOP_CATALOG` (or `--catalog`) names: one catalog file, or a folder of
 * them (catalogFolderFiles, each read by loadCatalogFile). A folder's parts are one catalog: ids
 * unique across its files (a repeated id names both files), named by its files' catalog names
 * joined by " + " in file-name order, its stamp's hash over every part (sorted by id, as a
 * file's). Any file that does not load refuses the whole folder (CatalogLoadError).
 */
export function loadCatalog(path: string): PartsCatalog {
  let folder: boolean;
  try {
    folder = statSync(path).isDirectory();
  } catch (e) {
    throw new CatalogLoadError(`cannot read the parts catalog ${path}: ${(e as Error).message}`);
  }
  if (!folder) return loadCatalogFile(path);
  const files = catalogFolderFiles(path);
  if (files.length === 0) throw new CatalogLoadError(`the parts catalog folder ${path} holds no .json catalog file`);
  const fileOf = new Map<string, string>();
  const names: string[] = [];
  const parts: CatalogPart[] = [];
  for (const file of files) {
    const catalog = loadCatalogFile(file);
    names.push(catalog.stamp.id);
    for (const p of catalog.list()) {
      const other = fileOf.get(p.id);
      if (other !== undefined)
        throw new CatalogLoadError(`parts catalog folder ${path}: part id "${p.id}" is in both ${other} and ${file}`);
      fileOf.set(p.id, file);
      parts.push(p);
    }
  }
  return catalogOf(names.join(" + "), parts);
}
