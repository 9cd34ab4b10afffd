import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { RequestExamples } from "../../api/openapi.js";
import { projectRoot } from "../project-root.js";

/**
 * The input of every `examples/requests/<procedure>.json` (`{ "id", "procedure", "input" }`), by
 * procedure: the OpenAPI document's example of each operation. test/examples.test.ts runs them.
 */
export function requestExamples(dir = join(projectRoot(), "examples", "requests")): RequestExamples {
  const out = new Map<string, unknown>();
  for (const file of readdirSync(dir).sort()) {
    if (!file.endsWith(".json")) continue;
    const { procedure, input } = JSON.parse(readFileSync(join(dir, file), "utf8")) as {
      procedure: string;
      input: unknown;
    };
    out.set(procedure, input);
  }
  return out;
}
