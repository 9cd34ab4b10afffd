import { pino, type Logger } from "pino";

/** JSON logs (pino) on stdout unless a destination is given; level from LOG_LEVEL; credentials never written. */
export function createLogger(level = process.env.LOG_LEVEL ?? "info", destination?: NodeJS.WritableStream): Logger {
  const opts = {
    level,
    base: { service: "backstop" },
    redact: { paths: ["req.headers.authorization", "req.headers['x-api-key']", "headers.authorization", "headers['x-api-key']"], censor: "[redacted]" },
  };
  // stdout written asynchronously: lines logged while a write is in flight go out in one write
  // (a synchronous write per request line cost ~5 % of a small request); flushed at exit.
  return pino(opts, destination ?? pino.destination({ dest: 1, sync: false }));
}
export type { Logger };
