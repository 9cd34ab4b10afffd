import { generateKeyPairSync } from "node:crypto";
import type { ChildProcess } from "node:child_process";
import { afterAll, describe, expect, it } from "vitest";
import { recordSignerOf } from "../../adapters/record/signing-key.js";
import { startBuiltServer } from "../helpers/built-server.js";
import example from "../../examples/requests/operatingPoint.json" with { type: "json" };
import review from "../../examples/requests/review.json" with { type: "json" };

const children: ChildProcess[] = [];
afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
});

describe("the built server signs in its main thread and its compute threads with the one key", () => {
  const pem = generateKeyPairSync("ed25519").privateKey.export({ type: "pkcs8", format: "pem" }).toString();
  const signer = recordSignerOf(pem);

  it("an inline /v1 call, a bulk item (compute thread) and /trpc carry the same signed record; verify says valid", async () => {
    const s = await startBuiltServer({ BACKSTOP_RECORD_KEY: pem, BACKSTOP_WORKERS: "1", BACKSTOP_BUILD_ID: "test-1" });
    children.push(s.child);
    const post = async (path: string, body: unknown) => {
      const res = await fetch(`${s.base}${path}`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(body),
      });
      expect(res.status, path).toBe(200);
      return res.text();
    };
    const key = (await (await fetch(`${s.base}/v1/record-key`)).json()) as { keyId: string };
    expect(key.keyId).toBe(signer.keyId);
    const inline = await post("/v1/operatingPoint", example.input); // the main thread (a cheap, small call)
    const bulk = JSON.parse(await post("/v1/operatingPoint/bulk", [example.input])) as {
      results: { result: unknown }[];
    };
    const trpc = JSON.parse(await post("/trpc/operatingPoint", example.input)) as { result: { data: unknown } };
    expect(JSON.stringify(bulk.results[0]?.result)).toBe(inline);
    expect(JSON.stringify(trpc.result.data)).toBe(inline);
    const result = JSON.parse(inline) as { record: { buildVersion: string; signature: { keyId: string } } };
    expect(result.record.signature.keyId).toBe(signer.keyId);
    expect(result.record.buildVersion).toMatch(/\+test-1$/);
    // a review runs in a compute thread; its record is checked by the service's verify (in a thread too)
    const reviewed = JSON.parse(await post("/v1/review", review.input)) as { record: { signature?: unknown } };
    expect(reviewed.record.signature).toBeDefined();
    const report = JSON.parse(
      await post("/v1/verify", {
        records: [
          { procedure: "operatingPoint", input: example.input, result },
          { procedure: "review", input: review.input, result: reviewed },
        ],
      }),
    ) as { reports: { status: string; signature: string }[] };
    expect(report.reports.map((r) => [r.status, r.signature])).toEqual([
      ["unchanged", "valid"],
      ["unchanged", "valid"],
    ]);
    s.child.kill("SIGTERM");
  });
});
