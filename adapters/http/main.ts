import { serve } from "@hono/node-server";
import { loadCatalogFile } from "../catalog/file-catalog.js";
import { createLogger } from "../logging/logger.js";
import { DEMO_CATALOG } from "../project-root.js";
import { loadRuleSetStore } from "../rulesets/registry.js";
import { createApp } from "./app.js";

const logger = createLogger();
const catalogPath = process.env.BACKSTOP_CATALOG ?? DEMO_CATALOG();
const catalog = loadCatalogFile(catalogPath);
const port = Number(process.env.PORT ?? 8080);
// Company rule sets: a bad file is refused whole and logged; the others load (README, "Rule sets").
const rulesDir = process.env.BACKSTOP_RULES_DIR;
const ruleSets = loadRuleSetStore(rulesDir);
for (const r of ruleSets.refused()) logger.error({ file: r.file, setId: r.setId, problems: r.problems.map((p) => p.message) }, "rule set refused");
const app = createApp({ ctx: { catalog, ruleSets }, logger });

const server = serve({ fetch: app.fetch, port, hostname: process.env.HOST ?? "0.0.0.0" }, (info) => {
  logger.info({ port: info.port, catalog: catalogPath, parts: catalog.list().length, ruleSets: ruleSets.list().map((s) => s.stamp.id), rulesRefused: ruleSets.refused().length }, "backstop listening");
  process.stdout.write(
    `backstop listening on http://localhost:${info.port} with ${catalog.list().length} parts from ${catalogPath}\n` +
      `  try: curl -s -X POST -H 'content-type: application/json' -d @examples/http/operatingPoint.body.json http://localhost:${info.port}/trpc/operatingPoint\n`,
  );
});

function shutdown(signal: string): void {
  logger.info({ signal }, "draining");
  server.close((err) => {
    if (err) logger.error({ err }, "close failed");
    process.exit(err ? 1 : 0);
  });
  setTimeout(() => process.exit(1), 10_000).unref();
}
process.on("SIGTERM", () => shutdown("SIGTERM"));
process.on("SIGINT", () => shutdown("SIGINT"));
