import type { ChildProcess } from "node:child_process";
import { mkdirSync, mkdtempSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadCatalogFile } from "../../../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG } from "../../../adapters/project-root.js";
import { startBuiltServer } from "../../helpers/built-server.js";

// The built server with its compute threads, its catalog replaced while it answers: on SIGHUP (a
// file) and on a change its poll sees (a folder). Every wait is on an event: a log line, an answer.
type Json = Record<string, unknown>;
type Stamp = { id: string; hash: string; partCount: number };
// the demo parts as loaded (a curve its file references read in), so a copy elsewhere needs no curve files
const loaded = loadCatalogFile(DEMO_CATALOG());
const demo = { catalog: loaded.stamp.id, parts: loaded.list() as unknown as Json[] };
const template = demo.parts.find((p) => p.id === "demo-schottky-5a-45v") as Json;
const newPart: Json = { ...template, id: "reload-demo-schottky-5a-45v", description: "a part added by a reload" };

const dir = mkdtempSync(join(tmpdir(), "backstop-catalog-reload-"));
const children: ChildProcess[] = [];
afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
  rmSync(dir, { recursive: true, force: true });
});

/** Replace a file by rename, as a deploy tool or `backstop catalog import` does. */
function replace(file: string, value: unknown): void {
  writeFileSync(`${file}.tmp`, typeof value === "string" ? value : JSON.stringify(value));
  renameSync(`${file}.tmp`, file);
}

async function start(catalog: string, env: Record<string, string>) {
  const s = await startBuiltServer({ BACKSTOP_CATALOG: catalog, BACKSTOP_WORKERS: "2", ...env });
  children.push(s.child);
  /** Resolves once the server's output holds `text` after `from` characters of it. */
  const logged = (text: string, from = 0) =>
    new Promise<string>((resolve) => {
      const look = () => {
        const all = s.logs.join("");
        const at = all.indexOf(text, from);
        if (at < 0) return false;
        s.child.stdout?.off("data", look);
        const end = all.indexOf("\n", at);
        resolve(all.slice(all.lastIndexOf("\n", at) + 1, end < 0 ? undefined : end)); // the whole line
        return true;
      };
      if (!look()) s.child.stdout?.on("data", look);
    });
  return { ...s, logged, logLength: () => s.logs.join("").length };
}

const post = async (base: string, path: string, body: unknown) => {
  const res = await fetch(`${base}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  return { status: res.status, body: (await res.json()) as Json };
};
const point = (partId: string) => ({
  stage: { kind: "catalog-part", partId },
  supplyV: 12,
  load: { kind: "constant-current", currentA: 2 },
  ambientC: 25,
});
const readyz = async (base: string) =>
  (await (await fetch(`${base}/readyz`)).json()) as { status: string; catalog: Stamp & { lastReload?: Json } };

describe("a live parts catalog", () => {
  it("reloads on SIGHUP under load with no failed request; the new part answers in both threads after", async () => {
    const file = join(dir, "parts.json");
    replace(file, demo);
    const s = await start(file, { BACKSTOP_CATALOG_POLL_MS: "0" });
    const before = (await readyz(s.base)).catalog;
    expect(before.partCount).toBe(demo.parts.length);

    // 8 clients, each in turn: a main-thread call, a bulk (compute threads), tRPC, catalog.show (threads)
    const calls = [
      () => post(s.base, "/v1/operatingPoint", point("demo-schottky-5a-45v")),
      () => post(s.base, "/v1/operatingPoint/bulk", [point("demo-schottky-5a-45v"), point("demo-schottky-10a-60v")]),
      () => post(s.base, "/trpc/operatingPoint", point("demo-schottky-5a-45v")),
      () => post(s.base, "/v1/catalog.show", { id: "demo-schottky-5a-45v" }),
    ];
    const failures: string[] = [];
    const shown: { startedAfterReload: boolean; hash: string }[] = [];
    let done = 0;
    let reloaded = false;
    let stop = false;
    const waiters: { n: number; resolve: () => void }[] = [];
    const reach = (n: number) => new Promise<void>((resolve) => waiters.push({ n, resolve }));
    const client = async (k: number) => {
      for (let i = k; !stop; i += 1) {
        const which = i % calls.length;
        const after = reloaded;
        const r = await (calls[which] as () => Promise<{ status: number; body: Json }>)().catch(
          (e: Error): { status: number; body: Json } => ({ status: 0, body: { error: e.message } }),
        );
        const bulkFailed = which === 1 && r.body.failed !== 0;
        if (r.status !== 200 || bulkFailed) failures.push(`${which}: ${r.status} ${JSON.stringify(r.body)}`);
        if (which === 3 && r.status === 200)
          shown.push({ startedAfterReload: after, hash: (r.body.stamp as Stamp).hash });
        done += 1;
        for (const w of waiters.filter((x) => done >= x.n)) w.resolve();
      }
    };
    const clients = Array.from({ length: 8 }, (_, k) => client(k));
    await reach(40);
    replace(file, { ...demo, parts: [...demo.parts, newPart] });
    const from = s.logLength();
    s.child.kill("SIGHUP");
    const line = await s.logged('"msg":"catalog reloaded"', from);
    reloaded = true;
    await reach(done + 80);
    stop = true;
    await Promise.all(clients);

    expect(failures).toEqual([]);
    const after = (await readyz(s.base)).catalog;
    expect(JSON.parse(line)).toMatchObject({ trigger: "SIGHUP", hash: after.hash, previousHash: before.hash });
    expect(after.partCount).toBe(demo.parts.length + 1);
    expect(after.hash).not.toBe(before.hash);
    expect(after.lastReload).toMatchObject({ outcome: "loaded", trigger: "SIGHUP" });
    // every call made after the reload was logged answered from the new catalog, in the threads too
    const late = shown.filter((x) => x.startedAfterReload);
    expect(late.length).toBeGreaterThan(0);
    for (const x of late) expect(x.hash).toBe(after.hash);
    for (const x of shown) expect([before.hash, after.hash]).toContain(x.hash);

    // the new part, in the main thread (a single operating point) and in the compute threads (bulk)
    const one = await post(s.base, "/v1/operatingPoint", point(newPart.id as string));
    expect(one.status).toBe(200);
    const bulk = await post(s.base, "/v1/operatingPoint/bulk", [point(newPart.id as string)]);
    expect(bulk.body.failed).toBe(0);
    const show = await post(s.base, "/v1/catalog.show", { id: newPart.id });
    expect(show.body.stamp).toEqual({ id: after.id, hash: after.hash, partCount: after.partCount });
  });

  it("a bad file in a catalog folder is refused on change: the old stamp stays, in logs, /readyz and /metrics", async () => {
    const folder = join(dir, "folder");
    mkdirSync(folder);
    const half = Math.ceil(demo.parts.length / 2);
    replace(join(folder, "a.json"), { catalog: "demo a", parts: demo.parts.slice(0, half) });
    replace(join(folder, "b.json"), { catalog: "demo b", parts: demo.parts.slice(half) });
    const s = await start(folder, { BACKSTOP_CATALOG_POLL_MS: "50" });
    const before = (await readyz(s.base)).catalog;
    expect(before.id).toBe("demo a + demo b");
    expect(before.partCount).toBe(demo.parts.length);

    const bad = { ...newPart, stage: { ...(newPart.stage as Json), reverseRatingV: "12 A" } };
    let from = s.logLength();
    replace(join(folder, "b.json"), { catalog: "demo b", parts: [...demo.parts.slice(half), bad] });
    const line = JSON.parse(await s.logged('"msg":"catalog reload refused', from)) as Json;
    expect(line).toMatchObject({ level: 50, trigger: "file change", hash: before.hash });
    expect(String(line.problem)).toContain("b.json");
    expect(String(line.problem)).toContain("reverseRatingV");

    const r = await fetch(`${s.base}/readyz`);
    expect(r.status).toBe(200); // the old catalog answers: still ready
    const detail = ((await r.json()) as { catalog: Stamp & { lastReload: Json } }).catalog;
    expect(detail.hash).toBe(before.hash);
    expect(detail.lastReload).toMatchObject({ outcome: "refused", trigger: "file change" });
    expect(String(detail.lastReload.message)).toContain("reverseRatingV");
    const metrics = await (await fetch(`${s.base}/metrics`)).text();
    expect(metrics).toContain('backstop_catalog_reloads_total{outcome="refused"} 1');
    expect(metrics).toContain('backstop_catalog_reloads_total{outcome="loaded"} 0');
    expect(metrics).toContain("backstop_catalog_reload_refused 1");
    expect(metrics).toContain(`backstop_catalog_info{catalog="demo a + demo b",hash="${before.hash}"} 1`);
    expect(metrics).toContain(`backstop_catalog_parts ${demo.parts.length}`);
    // the old catalog answers in the compute threads
    const show = await post(s.base, "/v1/catalog.show", { id: "demo-schottky-5a-45v" });
    expect((show.body.stamp as Stamp).hash).toBe(before.hash);

    // put right: loaded on the next change
    from = s.logLength();
    replace(join(folder, "b.json"), { catalog: "demo b", parts: [...demo.parts.slice(half), newPart] });
    await s.logged('"msg":"catalog reloaded"', from);
    const fixed = await readyz(s.base);
    expect(fixed.catalog).toMatchObject({ partCount: demo.parts.length + 1, lastReload: { outcome: "loaded" } });
    const m2 = await (await fetch(`${s.base}/metrics`)).text();
    expect(m2).toContain("backstop_catalog_reload_refused 0");
    expect(m2).toContain(`backstop_catalog_info{catalog="demo a + demo b",hash="${fixed.catalog.hash}"} 1`);
    expect(m2).not.toContain(before.hash);
  });
});
