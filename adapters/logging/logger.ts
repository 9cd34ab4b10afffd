import { pino, type Logger } from "pino";

/** JSON logs (pino); level from LOG_LEVEL; credentials never written. */
export function createLogger(level = process.env.LOG_LEVEL ?? "info", destination?: NodeJS.WritableStream): Logger {
  const opts = {
    level,
    base: { service: "backstop" },
    redact: { paths: ["req.headers.authorization", "req.headers['x-api-key']", "headers.authorization", "headers['x-api-key']"], censor: "[redacted]" },
  };
  return destination ? pino(opts, destination) : pino(opts);
}
export type { Logger };
