import { existsSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

/** The folder holding backstop's package.json, found from this file (works from source and dist/). */
export function projectRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i += 1) {
    if (existsSync(join(dir, "package.json")) && existsSync(join(dir, "examples"))) return dir;
    dir = dirname(dir);
  }
  return process.cwd();
}

export const DEMO_CATALOG = () => join(projectRoot(), "examples", "catalog", "demo-parts.json");
