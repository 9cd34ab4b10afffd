import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadCatalog } from "../../../adapters/catalog/catalog-source.js";
import { catalogOf, loadCatalogFile } from "../../../adapters/catalog/file-catalog.js";
import { openLiveCatalog, type ReloadReport } from "../../../adapters/catalog/live-catalog.js";
import { DEMO_CATALOG } from "../../../adapters/project-root.js";

type Json = Record<string, unknown>;
// the demo parts as loaded (a curve its file references read in), so a copy elsewhere needs no curve files
const loaded = loadCatalogFile(DEMO_CATALOG());
const demo = { catalog: loaded.stamp.id, parts: loaded.list() as unknown as Json[] };
const half = Math.ceil(demo.parts.length / 2);
const root = mkdtempSync(join(tmpdir(), "backstop-catalog-source-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function folderOf(name: string, files: Record<string, unknown>): string {
  const dir = join(root, name);
  mkdirSync(dir);
  for (const [f, v] of Object.entries(files))
    writeFileSync(join(dir, f), typeof v === "string" ? v : JSON.stringify(v));
  return dir;
}

describe("a catalog folder", () => {
  it("is one catalog: every file's parts, named by the files' catalogs joined in file-name order, one stamp", () => {
    const dir = folderOf("two", {
      "b.json": { catalog: "second", parts: demo.parts.slice(half) },
      "a.json": { catalog: "first", parts: demo.parts.slice(0, half) },
      "notes.txt": "not a catalog",
      ".hidden.json": "{",
    });
    const c = loadCatalog(dir);
    const whole = loadCatalogFile(DEMO_CATALOG());
    expect(c.stamp).toEqual({ id: "first + second", hash: whole.stamp.hash, partCount: demo.parts.length });
    expect(c.stamp).toEqual(catalogOf("first + second", whole.list()).stamp);
    expect(c.find("demo-schottky-5a-45v")).toEqual(whole.find("demo-schottky-5a-45v"));
  });

  it("refuses an id in two files naming both, a bad file naming it, and an empty folder", () => {
    const dup = folderOf("dup", {
      "a.json": { catalog: "a", parts: demo.parts.slice(0, 2) },
      "b.json": { catalog: "b", parts: demo.parts.slice(1, 3) },
    });
    expect(() => loadCatalog(dup)).toThrow(/part id "[^"]+" is in both .*a\.json and .*b\.json/);
    const bad = folderOf("bad", { "a.json": { catalog: "a", parts: demo.parts }, "b.json": "{ not json" });
    expect(() => loadCatalog(bad)).toThrow(/b\.json/);
    expect(() => loadCatalog(folderOf("empty", {}))).toThrow(/holds no \.json catalog file/);
    expect(() => loadCatalog(join(root, "absent"))).toThrow(/cannot read the parts catalog/);
  });
});

describe("openLiveCatalog", () => {
  it("reports an unchanged reload, keeps the old catalog when the new one is refused or its threads fail", async () => {
    const dir = folderOf("live", { "a.json": { catalog: "a", parts: demo.parts.slice(0, half) } });
    const reports: ReloadReport[] = [];
    let threadsFail = false;
    const live = await openLiveCatalog(
      dir,
      async (_next, commit) => {
        if (threadsFail) throw new Error("no thread started");
        commit();
      },
      (r) => reports.push(r),
    );
    const first = live.current().stamp;
    expect((await live.reload("SIGHUP")).outcome).toBe("unchanged");

    writeFileSync(join(dir, "b.json"), "{");
    const refused = await live.reload("SIGHUP");
    expect(refused).toMatchObject({ outcome: "refused", stamp: first, previous: first });
    expect(refused.message).toMatch(/b\.json/);
    expect(live.current().stamp).toEqual(first);

    writeFileSync(join(dir, "b.json"), JSON.stringify({ catalog: "b", parts: demo.parts.slice(half) }));
    threadsFail = true;
    const failed = await live.reload("SIGHUP");
    expect(failed.outcome).toBe("refused");
    expect(failed.message).toMatch(/compute threads did not start with it: no thread started/);
    expect(live.current().stamp).toEqual(first);

    threadsFail = false;
    const [x, y] = await Promise.all([live.reload("SIGHUP"), live.reload("SIGHUP")]); // one after the other
    expect(x.outcome).toBe("loaded");
    expect(y.outcome).toBe("unchanged");
    expect(live.current().stamp.id).toBe("a + b");
    expect(live.lastReload()).toBe(y);
    expect(reports.map((r) => r.outcome)).toEqual(["unchanged", "refused", "refused", "loaded", "unchanged"]);
  });
});
