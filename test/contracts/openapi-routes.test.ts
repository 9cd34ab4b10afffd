import { describe, expect, it } from "vitest";
import { serviceOpenApi } from "../../adapters/openapi/document.js";
import { REPORT_RENDERERS } from "../../adapters/report/report-body.js";
import { procedureEntries } from "../../api/procedure-registry.js";
import { testApp } from "../helpers/app.js";

/**
 * The routes the Hono app registers, as `METHOD /path`, with `:procedure` spelled out for every
 * procedure it answers (a report only for the procedures with a renderer). `ALL` entries are
 * middleware (`app.use`) and tRPC's `/trpc/*`.
 */
function appRoutes(): Set<string> {
  const { app } = testApp();
  const procedures = procedureEntries().map((e) => e.path);
  const out = new Set<string>();
  for (const r of app.routes) {
    if (r.method === "ALL") continue;
    const names = r.path.endsWith("/:procedure/report") ? Object.keys(REPORT_RENDERERS) : procedures;
    for (const p of r.path.includes(":procedure") ? names : [r.path])
      out.add(`${r.method} ${r.path.replace(":procedure", p)}`);
  }
  return out;
}

describe("the OpenAPI document lists every route of the app", () => {
  it("has exactly the app's routes (but the method-not-allowed answers and tRPC)", () => {
    const doc = serviceOpenApi() as { paths: Record<string, Record<string, unknown>> };
    const documented = new Set(
      Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${path}`)),
    );
    // GET/PUT/PATCH/DELETE on /v1/<procedure> and its bulk only answer 405 with the method to use
    // (GET /v1/record-key is a route of its own)
    const routes = [...appRoutes()].filter(
      (r) => r === "GET /v1/record-key" || !/^(GET|PUT|PATCH|DELETE) \/v1\/.+/.test(r),
    );
    expect(routes.length).toBeGreaterThan(2 * procedureEntries().length);
    expect([...documented].sort()).toEqual(routes.sort());
    expect(documented.has("POST /v1/bridgeAc/report")).toBe(true);
    expect(documented.has("POST /v1/review/report")).toBe(true);
  });
});
