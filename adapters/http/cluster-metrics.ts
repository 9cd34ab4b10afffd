import type { Worker } from "node:cluster";
import { AggregatorRegistry, type Registry } from "prom-client";

// Metrics across the HTTP processes of one server: /metrics, answered by whichever process takes
// the request, asks the primary, which gathers every process's registry (prom-client's
// AggregatorRegistry: counters and histograms summed, process gauges per its aggregators).

const ASK = "backstop:metrics-request";
const ANSWER = "backstop:metrics";
const TIMEOUT_MS = 5000;

interface Answer {
  readonly type: typeof ANSWER;
  readonly id: number;
  readonly text?: string;
  readonly error?: string;
}

/** In an HTTP process of a cluster: let the primary read this process's registry. */
export function shareRegistryWithPrimary(registry: Registry): void {
  AggregatorRegistry.setRegistries([registry]);
  new AggregatorRegistry(); // installs prom-client's answer to the primary's requests
}

/** In an HTTP process of a cluster: the metrics of all the processes, as Prometheus text. */
export function clusterMetricsText(): () => Promise<string> {
  let next = 0;
  const waiting = new Map<number, { resolve: (t: string) => void; reject: (e: Error) => void; timer: NodeJS.Timeout }>();
  process.on("message", (m: unknown) => {
    const a = m as Partial<Answer>;
    if (a === null || typeof a !== "object" || a.type !== ANSWER || typeof a.id !== "number") return;
    const w = waiting.get(a.id);
    if (w === undefined) return;
    waiting.delete(a.id);
    clearTimeout(w.timer);
    if (typeof a.text === "string") w.resolve(a.text);
    else w.reject(new Error(a.error ?? "no metrics from the primary"));
  });
  return () =>
    new Promise((resolve, reject) => {
      const id = next++;
      const timer = setTimeout(() => {
        waiting.delete(id);
        reject(new Error(`the primary did not answer a metrics request within ${TIMEOUT_MS} ms`));
      }, TIMEOUT_MS);
      waiting.set(id, { resolve, reject, timer });
      process.send?.({ type: ASK, id });
    });
}

/** In the primary: answer each process's metrics request with the gathered text. */
export function answerMetricsRequests(): (worker: Worker, message: unknown) => void {
  let aggregator: InstanceType<typeof AggregatorRegistry> | undefined;
  return (worker, message) => {
    const m = message as { type?: unknown; id?: unknown };
    if (m === null || typeof m !== "object" || m.type !== ASK || typeof m.id !== "number") return;
    aggregator ??= new AggregatorRegistry();
    const id = m.id;
    aggregator.clusterMetrics().then(
      (text: string) => worker.isConnected() && worker.send({ type: ANSWER, id, text }),
      (e: Error) => worker.isConnected() && worker.send({ type: ANSWER, id, error: e.message }),
    );
  };
}
