import { Counter, collectDefaultMetrics, Gauge, Histogram, Registry } from "prom-client";
import type { CatalogStamp } from "../../api/context.js";
import { RELOAD_OUTCOMES, type ReloadOutcome } from "../catalog/live-catalog.js";

export type Adapter = "trpc" | "v1" | "v1-bulk";

/** upper bounds of the procedure-duration buckets, seconds */
export const PROCEDURE_BUCKETS_S: readonly number[] = [
  0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10,
];

/**
 * Prometheus metrics of one server: process metrics, a histogram per procedure and outcome, HTTP
 * counts, and the parts catalog in use (`catalog`: read at each scrape) with its reloads.
 */
export function createMetrics(o: { catalog?: () => CatalogStamp } = {}) {
  const registry = new Registry();
  collectDefaultMetrics({ register: registry, prefix: "backstop_" });
  const procedure = new Histogram({
    name: "backstop_procedure_duration_seconds",
    help: "time to answer one analysis call, by procedure, outcome (result outcome or error code) and adapter",
    labelNames: ["procedure", "outcome", "adapter"] as const,
    buckets: [...PROCEDURE_BUCKETS_S],
    registers: [registry],
  });
  const requests = new Counter({
    name: "backstop_http_requests_total",
    help: "HTTP requests by route family and status",
    labelNames: ["route", "status"] as const,
    registers: [registry],
  });
  const reloads = new Counter({
    name: "backstop_catalog_reloads_total",
    help: "parts catalog reloads (SIGHUP or a file change) by outcome: loaded, unchanged, refused (the catalog in use kept)",
    labelNames: ["outcome"] as const,
    registers: [registry],
  });
  for (const outcome of RELOAD_OUTCOMES) reloads.inc({ outcome }, 0);
  const refused = new Gauge({
    name: "backstop_catalog_reload_refused",
    help: "1 while the last catalog reload was refused (the files on disk do not load; the previous catalog answers), else 0",
    registers: [registry],
  });
  refused.set(0);
  const stampOf = o.catalog;
  if (stampOf !== undefined) {
    new Gauge({
      name: "backstop_catalog_parts",
      help: "parts in the parts catalog in use",
      registers: [registry],
      collect() {
        this.set(stampOf().partCount);
      },
    });
    new Gauge({
      name: "backstop_catalog_info",
      help: "the parts catalog in use (value 1): its name and the sha256 of its parts",
      labelNames: ["catalog", "hash"] as const,
      registers: [registry],
      collect() {
        const s = stampOf();
        this.reset();
        this.set({ catalog: s.id, hash: s.hash }, 1);
      },
    });
  }
  // the labels are bounded: procedures, outcomes, adapters, route families (routeLabel) and statuses;
  // the catalog's name and hash are those of the one catalog in use
  return {
    registry,
    observeProcedure(adapter: Adapter, path: string, outcome: string, seconds: number) {
      procedure.observe({ procedure: path, outcome, adapter }, seconds);
    },
    countRequest(route: string, status: number) {
      requests.inc({ route, status: String(status) });
    },
    catalogReloaded(outcome: ReloadOutcome) {
      reloads.inc({ outcome });
      refused.set(outcome === "refused" ? 1 : 0);
    },
  };
}
export type Metrics = ReturnType<typeof createMetrics>;

/** Bounded route label: the first path segment of a known route family, else "other". */
export function routeLabel(path: string): string {
  const end = path.indexOf("/", 1);
  const first = end < 0 ? path.slice(1) : path.slice(1, end);
  return ROUTES.has(first) ? first : "other";
}
const ROUTES: ReadonlySet<string> = new Set(["trpc", "v1", "livez", "readyz", "healthz", "metrics", "openapi.json"]);
