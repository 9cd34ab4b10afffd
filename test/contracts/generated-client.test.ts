import type { ChildProcess } from "node:child_process";
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { openApiTypes } from "backstop-openapi-types";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { startBuiltServer } from "../helpers/built-server.js";
import { consumerDir, runTs, typecheck } from "../helpers/consumer.js";

/**
 * What an integrator does with contracts/openapi.json: generate TypeScript types with
 * openapi-typescript, call the service with openapi-fetch, and let the compiler check the call.
 * The types are generated here, into a throwaway folder, from the committed document (which
 * openapi.test.ts keeps equal to the code), so they cannot drift and are not committed twice.
 */
let server: { child: ChildProcess; base: string };
const project = consumerDir("openapi-client");

beforeAll(async () => {
  server = await startBuiltServer({});
  const types = await openApiTypes(pathToFileURL(join(projectRoot(), "contracts", "openapi.json")));
  writeFileSync(join(project.dir, "backstop-api.ts"), types);
}, 120_000);
afterAll(() => {
  server?.child.kill();
  project.remove();
});

const CALL = `import createClient from "openapi-fetch";
import type { components, paths } from "./backstop-api.js";

type Answer = components["schemas"]["OperatingPointOutput"];
const client = createClient<paths>({ baseUrl: process.argv[2] });
const { data, error, response } = await client.POST("/v1/operatingPoint", {
  body: {
    stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
    supplyV: "12 V",
    load: { kind: "constant-current", currentA: 3 },
    ambientC: 85,
  },
});
if (error !== undefined) throw new Error(\`\${response.status} \${error.code}: \${error.detail}\`);
const answer: Answer = data;
if (answer.outcome !== "solved") throw new Error(answer.outcome);
const tjC: number = answer.point.tjC;
const { data: rules } = await client.POST("/v1/rules.list", { body: {} });
console.log(JSON.stringify({ outcome: answer.outcome, tjC, sets: rules?.ruleSets.map((s) => s.id) }));
`;

describe("a client generated from the OpenAPI document (openapi-typescript, openapi-fetch)", () => {
  it("type-checks a typed call and gets the service's answer from the built server", async () => {
    writeFileSync(join(project.dir, "call.ts"), CALL);
    const checked = await typecheck(project.dir);
    expect(checked.output).toBe("");
    expect(checked.ok).toBe(true);
    const out = JSON.parse(await runTs(join(project.dir, "call.ts"), [server.base])) as {
      outcome: string;
      tjC: number;
      sets: string[];
    };
    expect(out.outcome).toBe("solved");
    expect(out.tjC).toBeGreaterThan(85); // above the ambient: the stage dissipates
    expect(out.tjC).toBeLessThan(100);
    expect(out.sets).toContain("default");
  }, 120_000);

  it("refuses, at compile time, a body the contract refuses (the types can fail)", async () => {
    writeFileSync(
      join(project.dir, "call.ts"),
      CALL.replace('supplyV: "12 V",', 'supplyV: "12 V",\n    supplyVolts: 12,').replace(
        "currentA: 3",
        'currentA: "3"',
      ),
    );
    const checked = await typecheck(project.dir);
    expect(checked.ok).toBe(false);
    expect(checked.output).toMatch(/supplyVolts/);
  }, 120_000);
});
