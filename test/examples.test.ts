import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker, processLine } from "../adapters/batch/run-batch.js";
import { projectRoot } from "../adapters/project-root.js";
import { procedureEntries } from "../api/procedure-registry.js";
import { demoContext } from "./helpers/app.js";

const dir = join(projectRoot(), "examples", "requests");
const files = readdirSync(dir).filter((f) => f.endsWith(".json"));

describe("examples/requests: one runnable example per procedure", () => {
  it("every procedure of the table has an example named for it", () => {
    const procedures = procedureEntries().map((e) => e.path);
    expect(files.map((f) => f.replace(/\.json$/, "")).sort()).toEqual(procedures);
  });
  const invoker = procedureInvoker(demoContext());
  it.each(files)("%s runs and succeeds", async (file) => {
    const text = readFileSync(join(dir, file), "utf8");
    const line = JSON.parse(text) as { id: string; procedure: string };
    expect(file).toBe(`${line.procedure}.json`);
    const out = await processLine(JSON.stringify(line), 1, invoker);
    expect(out.ok ? "ok" : JSON.stringify(out.error)).toBe("ok");
    expect(out.id).toBe(line.id);
  });
});
