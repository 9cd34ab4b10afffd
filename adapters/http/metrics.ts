import { Counter, collectDefaultMetrics, Histogram, Registry } from "prom-client";

export type Adapter = "trpc" | "v1" | "v1-bulk";

/** upper bounds of the procedure-duration buckets, seconds */
export const PROCEDURE_BUCKETS_S: readonly number[] = [
  0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10,
];

/** Prometheus metrics of one server: process metrics, a histogram per procedure and outcome, HTTP counts. */
export function createMetrics() {
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
  // the labels are bounded: procedures, outcomes, adapters, route families (routeLabel) and statuses
  return {
    registry,
    observeProcedure(adapter: Adapter, path: string, outcome: string, seconds: number) {
      procedure.observe({ procedure: path, outcome, adapter }, seconds);
    },
    countRequest(route: string, status: number) {
      requests.inc({ route, status: String(status) });
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
