import { pino, type Logger } from "pino";

/** JSON logs (pino) on stdout unless a destination is given; level from LOG_LEVEL; credentials never written. */
export function createLogger(level = process.env.LOG_LEVEL ?? "info", destination?: NodeJS.WritableStream): Logger {
  const opts = {
    level,
    base: { service: "backstop" },
    redact: { paths: ["req.headers.authorization", "req.headers['x-api-key']", "headers.authorization", "headers['x-api-key']"], censor: "[redacted]" },
  };
  if (destination !== undefined) return pino(opts, destination);
  // stdout written asynchronously and in blocks: lines gather until BACKSTOP_LOG_BUFFER_BYTES
  // (4 KiB) or for at most 100 ms, then go out in one write. A synchronous write per request line
  // cost about 5 % of a small request, an asynchronous one (a hand-off to libuv's thread pool) about
  // 8 %. Flushed at exit; 0 writes every line as it comes.
  const minLength = logBufferBytes(process.env.BACKSTOP_LOG_BUFFER_BYTES);
  const stdout = pino.destination({ dest: 1, sync: false, minLength });
  if (minLength > 0) setInterval(() => stdout.flush(), 100).unref();
  return pino(opts, stdout);
}
export type { Logger };

function logBufferBytes(raw: string | undefined): number {
  if (raw === undefined || raw === "") return 4096;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 1_048_576) throw new Error(`BACKSTOP_LOG_BUFFER_BYTES must be a whole number of bytes from 0 to 1048576, got "${raw}"`);
  return n;
}
