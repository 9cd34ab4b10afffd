// The server's entry point (`npm start`): one HTTP process (a container runs one; scale with
// replicas) and its compute threads (adapters/compute/pool.ts). Every request goes through the
// Hono app (createApp) on @hono/node-server's request listener.
import { createServer } from "node:http";
import { Server as NetServer } from "node:net";
import { getRequestListener } from "@hono/node-server";
import type { Context } from "../../api/context.js";
import { cpuBudget } from "../cpu-budget.js";
import { type LiveCatalog, openLiveCatalog, type ReloadReport } from "../catalog/live-catalog.js";
import { catalogData, deferredComputePool } from "../compute/pool.js";
import { createLogger } from "../logging/logger.js";
import { DEMO_CATALOG } from "../project-root.js";
import { loadRuleSetStore } from "../rulesets/registry.js";
import { recordKeyFromEnv, recordSignerOf } from "../record/signing-key.js";
import { buildVersion } from "../../api/record/build-version.js";
import { createApp } from "./app.js";
import { httpConfigFromEnv } from "./config.js";
import { createMetrics } from "./metrics.js";

const logger = createLogger();
function fail(message: string): never {
  logger.fatal(message);
  process.stderr.write(`backstop: ${message}\n`);
  process.exit(2);
}

let config: ReturnType<typeof httpConfigFromEnv>;
let live: LiveCatalog;
let recordKeyPem: string | undefined;
const catalogPath = process.env.BACKSTOP_CATALOG ?? DEMO_CATALOG();
// the catalog's files are polled for changes every BACKSTOP_CATALOG_POLL_MS (0: only on SIGHUP)
const catalogPollMs = Number(process.env.BACKSTOP_CATALOG_POLL_MS ?? 2000);
const metrics = createMetrics({ catalog: () => live.current().stamp });
/** A catalog reload in the logs and the metrics (and /readyz, from live.lastReload()). */
function reported(r: ReloadReport): void {
  metrics.catalogReloaded(r.outcome);
  const fields = { trigger: r.trigger, catalog: r.stamp.id, hash: r.stamp.hash, parts: r.stamp.partCount };
  if (r.outcome === "refused")
    logger.error({ ...fields, problem: r.message }, "catalog reload refused; the catalog in use stays");
  else if (r.outcome === "loaded") logger.info({ ...fields, previousHash: r.previous.hash }, "catalog reloaded");
  else logger.info(fields, "catalog unchanged");
}
try {
  config = httpConfigFromEnv();
  if (!Number.isInteger(catalogPollMs) || catalogPollMs < 0)
    throw new Error(
      `BACKSTOP_CATALOG_POLL_MS must be a whole number of milliseconds (0: off), got "${process.env.BACKSTOP_CATALOG_POLL_MS}"`,
    );
  // a new catalog goes to the compute threads first (new threads with it), then to this thread
  live = await openLiveCatalog(
    catalogPath,
    (next, commit) => (pool === undefined ? Promise.resolve(commit()) : pool.useCatalog(catalogData(next), commit)),
    reported,
  );
  recordKeyPem = recordKeyFromEnv();
  buildVersion(); // a bad BACKSTOP_BUILD_ID stops the start, not the first analysis
} catch (e) {
  fail((e as Error).message);
}
const port = Number(process.env.PORT ?? 8080);
// Company rule sets: a bad file is refused whole and logged; the others load (README, "Rule sets").
const rulesDir = process.env.BACKSTOP_RULES_DIR;
const ruleSets = loadRuleSetStore(rulesDir);
for (const r of ruleSets.refused())
  logger.error({ file: r.file, setId: r.setId, problems: r.problems.map((p) => p.message) }, "rule set refused");
const drainDelayMs = Number(process.env.BACKSTOP_DRAIN_DELAY_MS ?? 0);
const shutdownTimeoutMs = Number(process.env.BACKSTOP_SHUTDOWN_TIMEOUT_MS ?? 20_000);
// /v1 runs in worker threads (stopped at the compute budget) unless BACKSTOP_WORKERS=0; they start
// once the server listens (see deferredComputePool). By default one per CPU of the budget, at most 4:
// a bulk request is split over the threads.
const threads = Number(process.env.BACKSTOP_WORKERS ?? Math.min(4, cpuBudget()));
const pool = deferredComputePool({ threads, catalog: catalogData(live.current()), rulesDir, recordKeyPem });

// the former multi-process mode's setting: one process a container now
const processesSetting = process.env.BACKSTOP_HTTP_PROCESSES;
if (processesSetting !== undefined && processesSetting !== "" && processesSetting !== "1") {
  logger.warn(
    { BACKSTOP_HTTP_PROCESSES: processesSetting },
    "BACKSTOP_HTTP_PROCESSES is no longer read: the server runs one HTTP process; scale with replicas",
  );
}
if (config.apiKeys === undefined)
  logger.warn("API-key auth is OFF: set BACKSTOP_API_KEYS or BACKSTOP_API_KEYS_FILE to require a key on /v1 and /trpc");

let draining = false;
const recordSigner = recordKeyPem === undefined ? undefined : recordSignerOf(recordKeyPem);
// a call reads the catalog once, when its context is made (tRPC) or its handler runs (/v1, reports,
// in a turn), so a reload never changes the catalog under a call
const ctx: Context = {
  get catalog() {
    return live.current();
  },
  ruleSets,
  recordSigner,
};
const isReady = () => !draining;
const app = createApp({ ctx, logger, config, metrics, pool, isReady, catalogReload: () => live.lastReload() });

// A slow or stalled client cannot hold a connection: headers and the whole request have deadlines
// (node checks them every connectionsCheckingInterval, so that is kept well below the deadlines).
const headersTimeout = Math.min(config.headersTimeoutMs, config.receiveTimeoutMs);
const serverOptions = {
  headersTimeout,
  requestTimeout: config.receiveTimeoutMs,
  connectionsCheckingInterval: Math.max(50, Math.min(1000, Math.floor(headersTimeout / 4))),
};
// the listening socket's own close, without http.Server's cut of idle connections (see shutdown)
const netClose = NetServer.prototype.close;
const QUIET_MS = 100;
let lastConnectionMs = 0;
const server = createServer(serverOptions, getRequestListener(app.fetch));
server.on("connection", () => {
  lastConnectionMs = performance.now();
});
server.listen(port, process.env.HOST ?? "0.0.0.0", () => {
  const info = server.address() as import("node:net").AddressInfo;
  // Work start-up need not wait for, done shortly after the server listens, once the start-up
  // probes have been answered: the compute threads (each loads the router), then the built-in rule
  // sets (and the expression parser they need). A request that needs either earlier starts it
  // itself and waits for it.
  setTimeout(() => pool?.start(), 150).unref();
  setTimeout(() => logger.info({ ruleSets: ruleSets.list().map((s) => s.stamp.id) }, "rule sets ready"), 300).unref();
  if (catalogPollMs > 0) live.watch(catalogPollMs);
  logger.info(
    {
      port: info.port,
      catalog: catalogPath,
      parts: live.current().stamp.partCount,
      rulesRefused: ruleSets.refused().length,
      workers: pool?.threads ?? 0,
      auth: config.apiKeys !== undefined,
      recordKeyId: recordSigner?.keyId ?? null,
    },
    "backstop listening",
  );
  const text =
    `backstop listening on http://localhost:${info.port} with ${live.current().stamp.partCount} parts from ${catalogPath}\n` +
    `  try: curl -s -X POST -H 'content-type: application/json' -d @examples/http/operatingPoint.body.json http://localhost:${info.port}/v1/operatingPoint\n`;
  // the start-up log lines (warnings among them) out before the line that says where to connect
  logger.flush(() => process.stdout.write(text));
});

/**
 * Graceful stop: /readyz flips to 503 at once; from then every answer carries `Connection: close`,
 * so a client's connection ends after its next answer. After BACKSTOP_DRAIN_DELAY_MS the listener
 * stops accepting, with no connection cut: node's `server.close()` would also destroy every
 * connection it counts as idle, and that includes one whose next request is already written but
 * not yet read (the client gets ECONNRESET). So only the listening socket is closed (net.Server's
 * close); a connection ends after its answer (Connection: close) or, idle, at the keep-alive
 * timeout, which the client was told (`Keep-Alive: timeout=`) and closes its side before. Once
 * the last connection has ended: the compute threads stop, exit 0 (1 past the shutdown timeout).
 */
function shutdown(signal: string): void {
  if (draining) return;
  draining = true;
  logger.info({ signal, drainDelayMs }, "draining: readiness is now false");
  setTimeout(() => process.exit(1), drainDelayMs + shutdownTimeoutMs).unref();
  // the listener closes once it has accepted no connection for QUIET_MS of loop time: a connection the
  // kernel holds for it when it closes would be reset, and after a long task (or a burst of clients)
  // the backlog may still hold some when the drain delay ends
  setTimeout(function closeWhenQuiet() {
    if (performance.now() - lastConnectionMs < QUIET_MS) {
      setTimeout(closeWhenQuiet, QUIET_MS / 4);
      return;
    }
    netClose.call(server, (err?: Error) => {
      void (pool?.close() ?? Promise.resolve()).finally(() => {
        if (err) logger.error({ err }, "close failed");
        else logger.info("in-flight requests finished; exiting");
        process.exit(err ? 1 : 0);
      });
    });
  }, drainDelayMs);
}
process.on("SIGTERM", () => shutdown("SIGTERM"));
process.on("SIGINT", () => shutdown("SIGINT"));
// SIGHUP: load the parts catalog again (README, "Parts catalog"); a catalog that does not load is refused, the old one kept
process.on("SIGHUP", () => {
  if (!draining) void live.reload("SIGHUP");
});
