import type { ChildProcess } from "node:child_process";
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startBuiltServer } from "../helpers/built-server.js";
import { consumerDir, runTs, typecheck } from "../helpers/consumer.js";

/**
 * `backstop/client` as a consumer imports it: by the package's name, through package.json
 * `exports` (self-reference from a folder inside the package), type-checked and run against the
 * built server with API keys on.
 */
const KEY = "client-test-key-0123456789";
let server: { child: ChildProcess; base: string };
const project = consumerDir("trpc-client");

beforeAll(async () => {
  server = await startBuiltServer({ BACKSTOP_API_KEYS: KEY });
}, 120_000);
afterAll(() => {
  server?.child.kill();
  project.remove();
});

const CALL = `import { createBackstopClient } from "backstop/client";
import type { AppRouter } from "backstop/api/router";
import type { inferRouterInputs } from "@trpc/server";

const [base, key] = process.argv.slice(2);
const backstop = createBackstopClient({ url: base ?? "", apiKey: key });
const input: inferRouterInputs<AppRouter>["operatingPoint"] = {
  stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
  supplyV: "12 V",
  load: { kind: "constant-current", currentA: 3 },
  ambientC: "85 degC",
};
const r = await backstop.operatingPoint.query(input);
if (r.outcome !== "solved") throw new Error(r.outcome);
const shown = await backstop.rules.show.query({ id: "default" });
let refused = "";
try {
  await createBackstopClient({ url: base ?? "" }).rules.list.query({});
} catch (e) {
  // the key check's refusal is a tRPC error under /trpc: the client reads its code and status
  const data = (e as { data?: { code?: string; httpStatus?: number } }).data;
  refused = \`\${data?.code} \${data?.httpStatus}\`;
}
console.log(JSON.stringify({ tjC: r.point.tjC, set: shown.ruleSet.id, refused }));
`;

describe("backstop/client", () => {
  it("type-checks a consumer importing it by package name and calls the running server with an API key", async () => {
    writeFileSync(join(project.dir, "call.ts"), CALL);
    const checked = await typecheck(project.dir);
    expect(checked.output).toBe("");
    const out = JSON.parse(await runTs(join(project.dir, "call.ts"), [server.base, KEY])) as {
      tjC: number;
      set: string;
      refused: string;
    };
    expect(out.tjC).toBeGreaterThan(85);
    expect(out.set).toBe("default");
    expect(out.refused).toBe("UNAUTHORIZED 401"); // the same call without the key
  }, 120_000);

  it("the compiler refuses a call the router refuses", async () => {
    writeFileSync(
      join(project.dir, "call.ts"),
      CALL.replace("await backstop.rules.show", "await backstop.rules.shows"),
    );
    const checked = await typecheck(project.dir);
    expect(checked.ok).toBe(false);
    expect(checked.output).toMatch(/shows/);
  }, 120_000);
});
