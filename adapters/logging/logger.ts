import { pino, type Logger } from "pino";

/**
 * JSON logs (pino) on stdout unless a destination is given; level from LOG_LEVEL; credentials never
 * written. stdout is pino's own asynchronous destination (sonic-boom): lines that come while a
 * write is in flight go out together in the next, and what is pending is written at exit; a
 * reader that has gone away (EPIPE) stops the logging, not the server.
 */
export function createLogger(level = process.env.LOG_LEVEL ?? "info", destination?: NodeJS.WritableStream): Logger {
  const opts = {
    level,
    base: { service: "backstop" },
    redact: {
      paths: ["req.headers.authorization", "req.headers['x-api-key']", "headers.authorization", "headers['x-api-key']"],
      censor: "[redacted]",
    },
  };
  return pino(opts, destination ?? pino.destination({ dest: 1, sync: false }));
}
export type { Logger };
