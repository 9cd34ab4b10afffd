/** A pino destination: what it is given to write. */
export interface LineSink {
  write(line: string): boolean;
  flush(cb?: (err?: Error) => void): void;
}

/** Longest a line waits, ms. */
export const LOG_FLUSH_MS = 50;
/** Pending characters that write at once. */
const FLUSH_CHARS = 64 * 1024;

/**
 * Log lines gathered and written to stdout together: every LOG_FLUSH_MS, as soon as 64 KiB are
 * waiting, on `flush()`, and at exit. A write to the pipe that carries stdout wakes its reader; one
 * per request line cost a third of a small request's throughput. (pino's asynchronous destination
 * also re-measured the whole pending buffer on every line while a write was in flight.) A reader
 * that has gone away (EPIPE) stops the logging, not the server.
 */
export function batchedStdout(out: NodeJS.WritableStream = process.stdout): LineSink {
  let pending: string[] = [];
  let chars = 0;
  let scheduled = false;
  let broken = false;
  out.on("error", (e: NodeJS.ErrnoException) => {
    if (e.code === "EPIPE") broken = true;
    else process.stderr.write(`backstop: log output failed: ${e.message}\n`);
  });
  let timer: NodeJS.Timeout | undefined;
  const flushNow = () => {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
    scheduled = false;
    if (pending.length === 0) return;
    const text = pending.length === 1 ? (pending[0] as string) : pending.join("");
    pending = [];
    chars = 0;
    if (!broken) out.write(text);
  };
  process.on("exit", flushNow);
  return {
    write(line) {
      pending.push(line);
      chars += line.length;
      if (chars >= FLUSH_CHARS) flushNow();
      else if (!scheduled) {
        scheduled = true;
        timer = setTimeout(flushNow, LOG_FLUSH_MS);
        timer.unref();
      }
      return true;
    },
    flush(cb) {
      flushNow();
      if (cb) process.nextTick(cb);
    },
  };
}
