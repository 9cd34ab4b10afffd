import { existsSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "../../../adapters/batch/cli.js";
import { projectRoot } from "../../../adapters/project-root.js";
import { type FileOps, writeFileAtomic } from "../../../adapters/atomic-file.js";
import { reportNamer, writeReviewReport } from "../../../adapters/report/write-report.js";
import { procedureInvoker } from "../../../api/procedure-registry.js";
import { reviewOutput } from "../../../contracts/review.js";
import { demoContext, testApp } from "../../helpers/app.js";

const example = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
  id: string;
  procedure: string;
  input: Record<string, unknown>;
};
// One candidate keeps these adapter checks quick; the renderer's own tests use the whole example.
const input: Record<string, unknown> = {
  ...example.input,
  candidates: (example.input["candidates"] as unknown[]).slice(0, 1),
};
delete input["monteCarlo"];
const bridge = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "bridgeAc.json"), "utf8")) as {
  id: string;
  input: Record<string, unknown>;
};

describe("review report over HTTP", () => {
  const { app } = testApp();
  const post = (body: unknown, path = "/v1/review/report", headers: Record<string, string> = {}) =>
    app.request(path, {
      method: "POST",
      headers: { "content-type": "application/json", ...headers },
      body: JSON.stringify(body),
    });

  it("answers HTML by default and for Accept: text/html, Markdown for text/markdown or format, JSON for format=json", async () => {
    const html = await post(input, "/v1/review/report?id=van", { accept: "text/html" });
    expect(html.status).toBe(200);
    expect(html.headers.get("content-type")).toMatch(/^text\/html/);
    const page = await html.text();
    expect(page).toMatch(/^<!DOCTYPE html>/);
    expect(page).toContain("<h1>Design review van</h1>");
    expect(page.match(/<svg /g)).toHaveLength(7); // six curves and start-up charts, the turn-off current
    const md = await post({ ...input, format: "markdown" });
    expect(md.headers.get("content-type")).toMatch(/^text\/markdown/);
    const text = await md.text();
    expect(text).toMatch(/^# Design review/);
    expect(text).toContain("in the HTML report");
    expect(text).not.toContain("](");
    const viaAccept = await post(input, undefined, { accept: "text/markdown" });
    expect(await viaAccept.text()).toBe(text);
    const json = await post(input, "/v1/review/report?format=json");
    expect(reviewOutput.safeParse(await json.json()).success).toBe(true);
  });

  it("POST /v1/bridgeAc/report: the bridge page with its period charts; Markdown; 400 naming the field", async () => {
    const html = await post(bridge.input, "/v1/bridgeAc/report?id=irrigation");
    expect(html.status).toBe(200);
    const page = await html.text();
    expect(page).toContain("<h1>AC bridge irrigation</h1>");
    expect(page.match(/<svg /g)).toHaveLength(4);
    const md = await post({ ...bridge.input, format: "markdown" }, "/v1/bridgeAc/report");
    expect(await md.text()).toMatch(/^# AC bridge\n/);
    const bad = await post({ ...bridge.input, capacitanceF: -1 }, "/v1/bridgeAc/report");
    expect(bad.status).toBe(400);
    expect(
      ((await bad.json()) as { issues: { path: (string | number)[] }[] }).issues.map((i) => i.path.join(".")),
    ).toContain("capacitanceF");
  });

  it("rejects bad input with 400 naming the field, and an unknown format", async () => {
    const bad = await post({
      ...input,
      requirement: { ...(input["requirement"] as object), ambient: { minC: 90, maxC: 20 } },
    });
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { code: string; issues: { path: (string | number)[] }[] };
    expect(body.code).toBe("invalid-input");
    expect(body.issues.map((i) => i.path.join("."))).toContain("requirement.ambient.minC");
    const fmt = await post(input, "/v1/review/report?format=pdf");
    expect(fmt.status).toBe(400);
    expect(((await fmt.json()) as { issues: { path: string[] }[] }).issues[0]?.path).toEqual(["format"]);
    const notJson = await app.request("/v1/review/report", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{ nope",
    });
    expect(notJson.status).toBe(400);
  });
});

describe("review reports in batch (--report-dir)", () => {
  it("writes <id>.html, <id>.md and the charts for each answered review line, nothing for other lines", async () => {
    const dir = mkdtempSync(join(tmpdir(), "backstop-batch-report-"));
    const inFile = join(dir, "in.jsonl");
    const op = {
      stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
      supplyV: 12,
      load: { kind: "constant-current", currentA: 2 },
      ambientC: 25,
    };
    writeFileSync(
      inFile,
      [
        JSON.stringify({ id: "van/12v", procedure: "review", input }),
        JSON.stringify({ id: "op", procedure: "operatingPoint", input: op }),
        JSON.stringify({ id: "bad", procedure: "review", input: { ...input, candidates: [] } }),
        JSON.stringify({ procedure: "review", input }),
        JSON.stringify({ id: "bridge", procedure: "bridgeAc", input: bridge.input }),
      ].join("\n"),
    );
    const reports = join(dir, "reports");
    const code = await main(["batch", "--in", inFile, "--out", join(dir, "out.jsonl"), "--report-dir", reports]);
    expect(code).toBe(1); // the bad line is rejected; the others are answered
    expect(readdirSync(reports).sort()).toEqual([
      "bridge-charts",
      "bridge.html",
      "bridge.md",
      "line-4-charts",
      "line-4.html",
      "line-4.md",
      "van-12v-charts",
      "van-12v.html",
      "van-12v.md",
    ]);
    expect(readdirSync(join(reports, "van-12v-charts"))).toHaveLength(7);
    // The bridgeAc line: its own page with the four period charts (bridge and compareTo).
    expect(readdirSync(join(reports, "bridge-charts"))).toHaveLength(4);
    expect(readFileSync(join(reports, "bridge.html"), "utf8")).toContain("<h1>AC bridge bridge</h1>");
    const md = readFileSync(join(reports, "van-12v.md"), "utf8");
    for (const link of md.matchAll(/\]\(([^)]+\.svg)\)/g)) expect(existsSync(join(reports, link[1] ?? ""))).toBe(true);
    expect(readFileSync(join(reports, "van-12v.html"), "utf8")).toContain("Design review van/12v");
  });

  it("writes each file whole under its name: the data goes to a temp file, renamed over the name", async () => {
    // A batch killed mid-report must leave no torn file under a final name (the batch output's rule,
    // test/reliability/faults.test.ts): watch the order of the file operations.
    const dir = mkdtempSync(join(tmpdir(), "backstop-atomic-report-"));
    const calls: string[] = [];
    const ops: FileOps = {
      writeFileSync: (p, d) => {
        calls.push(`write ${p}`);
        writeFileSync(p, d);
      },
      renameSync: (a, b) => {
        calls.push(`rename ${a} -> ${b}`);
        renameSync(a, b);
      },
      rmSync: (p, o) => {
        calls.push(`rm ${p}`);
        rmSync(p, o);
      },
    };
    const w = writeReviewReport(dir, "atomic", await procedureInvoker(demoContext())("review")?.(input), "atomic", ops);
    const finals = [w.html, w.markdown, ...readdirSync(w.svgDir).map((f) => join(w.svgDir, f))];
    expect(finals).toHaveLength(2 + w.svgCount);
    for (const f of finals) {
      expect(calls).not.toContain(`write ${f}`);
      expect(calls).toContain(`write ${f}.partial-${process.pid}`);
      expect(calls).toContain(`rename ${f}.partial-${process.pid} -> ${f}`);
    }
    expect(readdirSync(dir).filter((f) => f.includes(".partial-"))).toEqual([]);
    expect(readFileSync(w.html, "utf8")).toMatch(/<\/html>\s*$/);
  });

  it("a write that fails removes its temp file and throws", () => {
    const dir = mkdtempSync(join(tmpdir(), "backstop-atomic-fail-"));
    const target = join(dir, "x.md");
    const failing: FileOps = {
      writeFileSync,
      rmSync,
      renameSync: () => {
        throw new Error("disk gone");
      },
    };
    expect(() => writeFileAtomic(target, "text", failing)).toThrow("disk gone");
    expect(readdirSync(dir)).toEqual([]);
  });

  it("names reports by id, by line without one, and never overwrites a repeated id", () => {
    const name = reportNamer();
    expect([name("a", 1), name(null, 2), name("a", 3), name("../x y", 4)]).toEqual(["a", "line-2", "a-line3", "x-y"]);
  });
});
