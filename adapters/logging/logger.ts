import { pino, type Logger } from "pino";
import { batchedStdout } from "./batched-stdout.js";

/** JSON logs (pino) on stdout unless a destination is given; level from LOG_LEVEL; credentials never written. */
export function createLogger(level = process.env.LOG_LEVEL ?? "info", destination?: NodeJS.WritableStream): Logger {
  const opts = {
    level,
    // one of several HTTP processes (cluster-primary.ts) says which
    base: process.env.BACKSTOP_PROCESS_INDEX === undefined ? { service: "backstop" } : { service: "backstop", process: Number(process.env.BACKSTOP_PROCESS_INDEX) },
    redact: { paths: ["req.headers.authorization", "req.headers['x-api-key']", "headers.authorization", "headers['x-api-key']"], censor: "[redacted]" },
  };
  return pino(opts, destination ?? batchedStdout());
}
export type { Logger };
