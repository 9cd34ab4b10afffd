import { renameSync, rmSync, writeFileSync } from "node:fs";

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
