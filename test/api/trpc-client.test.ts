import { createTRPCClient, httpLink } from "@trpc/client";
import { describe, expect, it } from "vitest";
import type { AppRouter } from "../../api/router.js";
import { testApp } from "../helpers/app.js";

describe("the typed tRPC client (as in README)", () => {
  it("calls operatingPoint through the HTTP app", async () => {
    const { app } = testApp();
    const client = createTRPCClient<AppRouter>({
      links: [httpLink({ url: "http://backstop.test/trpc", methodOverride: "POST", fetch: async (url, init) => app.request(String(url), init as RequestInit) })],
    });
    const r = await client.operatingPoint.query({
      stage: { kind: "catalog-part", partId: "demo-schottky-10a-60v" },
      supplyV: 24,
      load: { kind: "resistive", resistanceOhm: "4.8 ohm" },
      ambientC: 40,
    });
    expect(r.outcome).toBe("solved");
    if (r.outcome === "solved") expect(r.point.currentA).toBeGreaterThan(4.8);
  });
});
