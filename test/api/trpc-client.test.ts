import { createTRPCClient, httpLink } from "@trpc/client";
import type { inferRouterInputs, inferRouterOutputs } from "@trpc/server";
import { describe, expect, expectTypeOf, it } from "vitest";
import type { z } from "zod";
import type { AppRouter } from "../../api/router.js";
import type { OperatingPointOutput, operatingPointInput } from "../../contracts/operating-point.js";
import type { rulesListOutput } from "../../contracts/rules.js";
import { testApp } from "../helpers/app.js";

describe("the typed tRPC client (as in README)", () => {
  it("is typed by the procedure table: inputs by the input contracts, answers by the handlers (checked by tsc)", () => {
    expectTypeOf<inferRouterInputs<AppRouter>["operatingPoint"]>().toEqualTypeOf<z.input<typeof operatingPointInput>>();
    // (answers as tRPC's client types them: its serialised form of the handler's type)
    expectTypeOf<inferRouterOutputs<AppRouter>["operatingPoint"]["outcome"]>().toEqualTypeOf<
      OperatingPointOutput["outcome"]
    >();
    expectTypeOf<inferRouterOutputs<AppRouter>["rules"]["list"]["metrics"][number]["stageKinds"]>().toEqualTypeOf<
      z.output<typeof rulesListOutput>["metrics"][number]["stageKinds"]
    >();
    expectTypeOf<inferRouterInputs<AppRouter>["sizing"]["catalog"]>().not.toBeAny();
    expectTypeOf<inferRouterOutputs<AppRouter>["sizing"]["catalog"]>().not.toBeAny();
  });

  it("calls operatingPoint through the HTTP app", async () => {
    const { app } = testApp();
    const client = createTRPCClient<AppRouter>({
      links: [
        httpLink({
          url: "http://backstop.test/trpc",
          methodOverride: "POST",
          fetch: async (url, init) => app.request(String(url), init as RequestInit),
        }),
      ],
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
