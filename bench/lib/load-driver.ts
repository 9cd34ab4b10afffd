/**
 * The load generator, run as its own process (so it does not share an event loop with the server
 * or the bench): autocannon, programmatic, against one loopback URL. Reads a JSON spec from the file argv[2],
 * prints one JSON line with the figures.
 */
import { readFileSync } from "node:fs";
import autocannon from "autocannon";

interface Spec {
  readonly url: string;
  readonly connections: number;
  readonly durationS: number;
  readonly warmupS?: number;
  /** one body for every request, or several taken in turn */
  readonly bodies: readonly { readonly path: string; readonly body: string }[];
  readonly timeoutS?: number;
}

// the spec is a file (a bulk body is too large for the command line)
const spec = JSON.parse(readFileSync(process.argv[2] ?? "", "utf8")) as Spec;
const requests = spec.bodies.map((b) => ({
  method: "POST" as const,
  path: b.path,
  body: b.body,
  headers: { "content-type": "application/json" },
}));

function run(durationS: number) {
  return autocannon({
    url: spec.url,
    connections: spec.connections,
    duration: durationS,
    requests,
    timeout: spec.timeoutS ?? 10,
  });
}

if ((spec.warmupS ?? 0) > 0) await run(spec.warmupS as number);
const r = await run(spec.durationS);
process.stdout.write(
  `${JSON.stringify({
    requestsPerSecond: r.requests.average,
    totalRequests: r.requests.total,
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    maxMs: r.latency.max,
    errors: r.errors,
    timeouts: r.timeouts,
    non2xx: r.non2xx,
    durationS: r.duration,
  })}\n`,
);
