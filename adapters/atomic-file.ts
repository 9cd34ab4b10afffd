import { createWriteStream, readdirSync, renameSync, rmSync, type WriteStream, writeFileSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { finished } from "node:stream/promises";

/** The file operations `writeFileAtomic` uses (node:fs; a test passes its own to watch the order). */
export interface FileOps {
  writeFileSync(path: string, data: string | Uint8Array): void;
  renameSync(from: string, to: string): void;
  rmSync(path: string, options: { force: boolean }): void;
}

const nodeFs: FileOps = { writeFileSync, renameSync, rmSync };

/**
 * Write a whole file so that its name only ever holds the complete text: the data goes to
 * `<path>.partial-<pid>` and is renamed over `path` (a rename within a directory is atomic on
 * POSIX file systems). A process killed mid-write leaves at most the temp file; a failed write
 * removes it and throws.
 */
export function writeFileAtomic(path: string, data: string | Uint8Array, ops: FileOps = nodeFs): void {
  const temp = `${path}.partial-${process.pid}`;
  try {
    ops.writeFileSync(temp, data);
    ops.renameSync(temp, path);
  } catch (e) {
    ops.rmSync(temp, { force: true });
    throw e;
  }
}

/** Whether a process with this id runs (signal 0 tests without signalling; EPERM: it runs as another user). */
function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as { code?: string }).code === "EPERM";
  }
}

/**
 * Remove the `<path>.partial-<pid>` files that a dead run left (kill -9, a lost node): a run to the
 * same output clears them first. A partial of a live process (another run writing now) is left alone.
 * Returns the files removed.
 */
export function removeStalePartials(path: string): string[] {
  const dir = dirname(path);
  const prefix = `${basename(path)}.partial-`;
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return [];
  }
  const removed: string[] = [];
  for (const name of names) {
    if (!name.startsWith(prefix)) continue;
    const pid = Number(name.slice(prefix.length));
    if (!Number.isInteger(pid) || pid <= 0 || pid === process.pid || alive(pid)) continue;
    rmSync(join(dir, name), { force: true });
    removed.push(name);
  }
  return removed;
}

/**
 * Stream a file so that its name only ever holds the complete output: `body` writes to
 * `<path>.partial-<pid>`, which is renamed to `path` when it is done and removed on any failure or
 * on SIGTERM/SIGINT (then the process exits 2). Partials left by dead runs are removed first.
 * `write` resolves when more may be written (backpressure) and rejects when the file cannot be written.
 */
export async function writeStreamAtomic(
  path: string,
  body: (write: (t: string | Uint8Array) => Promise<void>) => Promise<void>,
  log: (line: string) => void,
): Promise<void> {
  const partial = `${path}.partial-${process.pid}`;
  for (const f of removeStalePartials(path)) log(`backstop: removed ${f}, left by a run that no longer exists`);
  const onSignal = () => {
    rmSync(partial, { force: true });
    log(`backstop: stopped by a signal; no output written to ${path}`);
    process.exit(2);
  };
  process.once("SIGTERM", onSignal);
  process.once("SIGINT", onSignal);
  let out: WriteStream | undefined;
  try {
    // a few MB may wait to be written, so the batch answers or cuts the next chunk meanwhile
    // instead of waiting for a drain after every chunk of output
    out = createWriteStream(partial, { highWaterMark: 4 * 1024 * 1024 });
    const stream = out;
    const failed = new Promise<never>((_, reject) => stream.once("error", reject));
    failed.catch(() => undefined);
    const write = (t: string | Uint8Array) =>
      stream.write(t)
        ? Promise.resolve()
        : Promise.race([new Promise<void>((r) => stream.once("drain", () => r())), failed]);
    await Promise.race([body(write), failed]);
    stream.end();
    await finished(stream);
    renameSync(partial, path);
  } catch (e) {
    out?.destroy();
    rmSync(partial, { force: true });
    throw e;
  } finally {
    process.removeListener("SIGTERM", onSignal);
    process.removeListener("SIGINT", onSignal);
  }
}
