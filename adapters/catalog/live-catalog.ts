import { readdir, stat } from "node:fs/promises";
import { join } from "node:path";
import type { CatalogStamp, PartsCatalog } from "../../api/context.js";
import { loadCatalog } from "./catalog-source.js";

/** What one reload did: `loaded` (a new catalog in use), `unchanged` (same stamp), `refused` (the old one kept). */
export type ReloadOutcome = "loaded" | "unchanged" | "refused";
export const RELOAD_OUTCOMES: readonly ReloadOutcome[] = ["loaded", "unchanged", "refused"];

export interface ReloadReport {
  readonly outcome: ReloadOutcome;
  /** what asked for it: "SIGHUP" or "file change" */
  readonly trigger: string;
  /** the catalog in use after it */
  readonly stamp: CatalogStamp;
  /** the catalog in use before it */
  readonly previous: CatalogStamp;
  /** why a refused catalog was refused */
  readonly message?: string;
  /** when it finished, ISO 8601 */
  readonly at: string;
}

/**
 * Puts `next` into use. It calls `commit` at the moment calls start going to `next` (after the
 * compute threads that will answer with it are up), or rejects (the threads did not start: the old
 * catalog stays).
 */
export type SwitchCatalog = (next: PartsCatalog, commit: () => void) => Promise<void>;

export interface LiveCatalog {
  /** the catalog in use now (a call reads it once, at its start, and keeps it to its end) */
  current(): PartsCatalog;
  /** the last reload, if any */
  lastReload(): ReloadReport | undefined;
  /** load the catalog again; reloads run one after another */
  reload(trigger: string): Promise<ReloadReport>;
  /** poll the files every `intervalMs` and reload once a change has held for one interval; returns stop */
  watch(intervalMs: number): () => void;
}

/**
 * What the files of the catalog at `path` look like on disk (each file's inode, size and mtime; a
 * folder's every visible file, a curve file beside the catalogs included), so a poll sees a change
 * however it was made: written in place, renamed over, or a symlink swapped (as a Kubernetes
 * ConfigMap volume updates).
 */
export async function catalogSignature(path: string): Promise<string> {
  const one = async (p: string) => {
    try {
      const s = await stat(p);
      return s.isDirectory() ? undefined : `${p}:${s.ino}:${s.size}:${s.mtimeMs}`;
    } catch (e) {
      return `${p}:${(e as { code?: string }).code ?? "unreadable"}`;
    }
  };
  let top: Awaited<ReturnType<typeof stat>>;
  try {
    top = await stat(path);
  } catch (e) {
    return `${path}:${(e as { code?: string }).code ?? "unreadable"}`;
  }
  if (!top.isDirectory()) return (await one(path)) ?? path;
  const names = (await readdir(path)).filter((n) => !n.startsWith(".") && !n.includes(".partial-")).sort();
  const each = await Promise.all(names.map((n) => one(join(path, n))));
  return each.filter((x) => x !== undefined).join("\n");
}

/**
 * The catalog at `path` (a file or a folder, loadCatalog), loaded now (a load error throws: the
 * server does not start without a catalog) and again on `reload` or a change `watch` sees. A
 * catalog that does not load, or whose compute threads do not start, is refused and the one in
 * use stays; every reload is told to `onReport` (logs, metrics, /readyz).
 */
export async function openLiveCatalog(
  path: string,
  switchTo: SwitchCatalog,
  onReport: (r: ReloadReport) => void,
): Promise<LiveCatalog> {
  // taken before the load, so a change while it loads is seen by the next poll
  let loadedSignature = await catalogSignature(path);
  let current = loadCatalog(path);
  let last: ReloadReport | undefined;
  let queue: Promise<unknown> = Promise.resolve();

  async function reloadNow(trigger: string): Promise<ReloadReport> {
    loadedSignature = await catalogSignature(path);
    const previous = current.stamp;
    const report = (outcome: ReloadOutcome, message?: string): ReloadReport => {
      last = {
        outcome,
        trigger,
        stamp: current.stamp,
        previous,
        ...(message === undefined ? {} : { message }),
        at: new Date().toISOString(),
      };
      onReport(last);
      return last;
    };
    let next: PartsCatalog;
    try {
      next = loadCatalog(path);
    } catch (e) {
      return report("refused", (e as Error).message);
    }
    if (next.stamp.id === previous.id && next.stamp.hash === previous.hash) return report("unchanged");
    let committed = false;
    try {
      await switchTo(next, () => {
        current = next;
        committed = true;
      });
    } catch (e) {
      return report("refused", `the compute threads did not start with it: ${(e as Error).message}`);
    }
    if (!committed) current = next;
    return report("loaded");
  }

  const live: LiveCatalog = {
    current: () => current,
    lastReload: () => last,
    reload(trigger) {
      const run = queue.then(() => reloadNow(trigger));
      queue = run.catch(() => undefined);
      return run;
    },
    watch(intervalMs) {
      let seen = loadedSignature;
      let stopped = false;
      let timer: NodeJS.Timeout | undefined;
      const tick = async () => {
        const now = await catalogSignature(path).catch((e: Error) => `unreadable: ${e.message}`);
        // a change is reloaded once it has held for one interval (a file still being written waits)
        if (now === seen && now !== loadedSignature) await live.reload("file change");
        seen = now;
        if (!stopped) timer = setTimeout(tick, intervalMs).unref();
      };
      timer = setTimeout(tick, intervalMs).unref();
      return () => {
        stopped = true;
        clearTimeout(timer);
      };
    },
  };
  return live;
}
