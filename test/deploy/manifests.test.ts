import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseAllDocuments } from "yaml";
import { projectRoot } from "../../adapters/project-root.js";
import { testApp } from "../helpers/app.js";

const root = projectRoot();
// biome-ignore lint/suspicious/noExplicitAny: parsed YAML, checked field by field below
type Doc = Record<string, any>;
const docs: Doc[] = readdirSync(join(root, "deploy"))
  .filter((f) => f.endsWith(".yaml"))
  .flatMap((f) => parseAllDocuments(readFileSync(join(root, "deploy", f), "utf8")).map((d) => d.toJS() as Doc));
const byKind = (kind: string) => docs.filter((d) => d.kind === kind);
const dockerfile = readFileSync(join(root, "Dockerfile"), "utf8");
const pkg = JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as { scripts: Record<string, string> };
const dockerCmd = JSON.parse(/^CMD (\[.*\])$/m.exec(dockerfile)?.[1] ?? "[]") as string[];

describe("Kubernetes manifests and Dockerfile match the server", () => {
  const dep = byKind("Deployment")[0] as Doc;
  const c = dep.spec.template.spec.containers[0];
  const port = c.ports.find((p: Doc) => p.name === "http");

  it("the Deployment runs the server's command on its port, with probes on routes that exist", async () => {
    expect(c.command).toEqual(dockerCmd);
    expect(`${dockerCmd.join(" ")}`).toBe(pkg.scripts.start);
    expect(c.env.find((e: Doc) => e.name === "PORT").value).toBe(String(port.containerPort));
    // every variable it sets is documented (README), and none is left from the removed multi-process mode
    const readme = readFileSync(join(root, "README.md"), "utf8");
    for (const e of c.env as Doc[]) expect([e.name, readme.includes(`\`${e.name}\``)]).toEqual([e.name, true]);
    expect(c.env.map((e: Doc) => e.name)).not.toContain("BACKSTOP_HTTP_PROCESSES");
    expect(dockerfile).toMatch(new RegExp(`EXPOSE ${port.containerPort}`));
    const { app } = testApp();
    for (const probe of [c.readinessProbe, c.livenessProbe, c.startupProbe]) {
      expect(probe.httpGet.port).toBe("http");
      expect((await app.request(probe.httpGet.path)).status).toBe(200);
    }
    expect(c.readinessProbe.httpGet.path).toBe("/readyz");
    expect(c.lifecycle.preStop.sleep.seconds).toBeGreaterThan(0);
    expect(dep.spec.template.spec.terminationGracePeriodSeconds).toBeGreaterThan(
      c.lifecycle.preStop.sleep.seconds + 20,
    );
    const metricsPath = dep.spec.template.metadata.annotations["prometheus.io/path"];
    expect((await app.request(metricsPath)).status).toBe(200);
  });

  it("the Service, HPA and PDB point at the Deployment", () => {
    const labels = dep.spec.template.metadata.labels;
    const svc = byKind("Service")[0] as Doc;
    expect(svc.spec.selector).toEqual(labels);
    expect(svc.spec.ports[0].targetPort).toBe("http");
    expect((byKind("HorizontalPodAutoscaler")[0] as Doc).spec.scaleTargetRef).toMatchObject({
      kind: "Deployment",
      name: dep.metadata.name,
    });
    expect((byKind("PodDisruptionBudget")[0] as Doc).spec.selector.matchLabels).toEqual(labels);
  });

  it("the Indexed Job runs the batch CLI with one shard per completion", () => {
    const job = byKind("Job")[0] as Doc;
    expect(job.spec.completionMode).toBe("Indexed");
    const jc = job.spec.template.spec.containers[0];
    expect(jc.command).toEqual(["node", "bin/backstop.mjs"]);
    expect(existsSync(join(root, jc.command[1]))).toBe(true);
    const args: string[] = jc.args;
    expect(args[0]).toBe("batch");
    expect(args[args.indexOf("--shard") + 1]).toBe(String(job.spec.completions));
    expect(args[args.indexOf("--out") + 1]).toContain("{shard}");
  });

  it("the Dockerfile builds and runs with the same commands as README and CI", () => {
    const runs = [...dockerfile.matchAll(/^RUN (.*)$/gm)].map((m) => m[1]);
    expect(runs).toEqual(["npm ci --no-audit --no-fund", "npm run build", "npm ci --omit=dev --no-audit --no-fund"]);
    expect(readFileSync(join(root, ".ci", "run"), "utf8")).toContain("npm ci --no-audit --no-fund");
    expect(pkg.scripts.prestart).toBe("npm run build");
    expect(dockerfile).toMatch(/^USER node$/m);
    expect(dockerfile).toMatch(/NODE_ENV=production/);
    expect(dockerfile).toMatch(/^FROM node:22-slim$/m);
    // CI runs the suite and the soak on the image's Node major too (the npm registry's node package)
    const major = /^FROM node:(\d+)-slim$/m.exec(dockerfile)?.[1];
    expect(readFileSync(join(root, ".ci", "run"), "utf8")).toContain(`node@${major}`);
    // the image's young generation (the soak starts the server with these options)
    expect(dockerfile).toMatch(/^ENV .*\bNODE_OPTIONS="--max-semi-space-size=\d+"/m);
    expect(dockerfile).toMatch(/HEALTHCHECK .*CMD \["node", "-e"/);
  });
});
