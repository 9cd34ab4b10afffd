import { z } from "zod";
import { MODEL_VERSION } from "../domain/provenance.js";
import { problem } from "../contracts/problem.js";
import { procedureEntries } from "./procedure-registry.js";

type Json = { [k: string]: unknown };

const SCHEMA_MAPS = new Set(["properties", "patternProperties", "$defs", "definitions", "dependentSchemas"]);
const SCHEMA_ONE = new Set([
  "items",
  "additionalProperties",
  "not",
  "if",
  "then",
  "else",
  "contains",
  "propertyNames",
  "unevaluatedItems",
  "unevaluatedProperties",
]);
const SCHEMA_LIST = new Set(["anyOf", "oneOf", "allOf", "prefixItems"]);
const BOUND_KEYWORD = { gt: "exclusiveMinimum", ge: "minimum", lt: "exclusiveMaximum", le: "maximum" } as const;

/**
 * Make zod's JSON Schema a clean OpenAPI 3.1 schema: the `unit` of a quantity becomes the extension
 * `x-unit`, and its bounds (gt/ge/lt/le in the field's unit) become the standard keywords on the
 * number branch. Works on a fresh copy; the zod schemas are never touched.
 */
function tidy(node: unknown, defs: Json = {}): unknown {
  if (Array.isArray(node)) return node.map((n) => tidy(n, defs));
  if (typeof node !== "object" || node === null) return node;
  let src = node as Json;
  // a quantity whose number|string union was shared by reference: inline it, so its bounds land on the number branch
  const target = typeof src.$ref === "string" ? defs[src.$ref.replace("#/$defs/", "")] : undefined;
  if (typeof src.unit === "string" && target !== undefined) {
    const { $ref: _drop, ...rest } = src;
    src = { ...(target as Json), ...rest };
  }
  const out: Json = {};
  for (const [k, v] of Object.entries(src)) {
    if (k === "$schema") continue;
    if (SCHEMA_MAPS.has(k) && typeof v === "object" && v !== null)
      out[k] = Object.fromEntries(Object.entries(v as Json).map(([name, s]) => [name, tidy(s, defs)]));
    else if (SCHEMA_ONE.has(k) || SCHEMA_LIST.has(k)) out[k] = tidy(v, defs);
    else if (k === "unit" && typeof v === "string") out["x-unit"] = v;
    else if (k in BOUND_KEYWORD && typeof v === "number") continue;
    else out[k] = v;
  }
  const bounds = Object.entries(BOUND_KEYWORD).filter(([k]) => typeof src[k] === "number");
  if (bounds.length > 0) {
    const numberBranch = Array.isArray(out.anyOf)
      ? (out.anyOf as Json[]).find((b) => b.type === "number")
      : out.type === "number"
        ? out
        : undefined;
    if (numberBranch) for (const [k, keyword] of bounds) numberBranch[keyword] = src[k];
    else out["x-bounds"] = Object.fromEntries(bounds.map(([k]) => [k, src[k]]));
  }
  return out;
}

/** JSON Schema of one contract side; any `$defs` are hoisted into components under `prefix`. */
function schemaOf(schema: z.ZodType, io: "input" | "output", prefix: string, components: Json): Json {
  const raw = z.toJSONSchema(schema, { io, target: "draft-2020-12", unrepresentable: "any", reused: "ref" }) as Json;
  let text = JSON.stringify(tidy(raw, (raw.$defs as Json | undefined) ?? {}));
  const defs = (JSON.parse(text) as Json).$defs as Json | undefined;
  if (defs) {
    for (const name of Object.keys(defs))
      text = text.replaceAll(`"#/$defs/${name}"`, `"#/components/schemas/${prefix}_${name}"`);
    const fixed = JSON.parse(text) as Json;
    for (const [name, s] of Object.entries(fixed.$defs as Json)) components[`${prefix}_${name}`] = s;
    delete fixed.$defs;
    return fixed;
  }
  return JSON.parse(text) as Json;
}

const pascal = (path: string) =>
  path
    .split(/[.\-_]/)
    .map((p) => p.charAt(0).toUpperCase() + p.slice(1))
    .join("");
const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const problemResponse = (description: string) => ({
  description,
  content: { "application/problem+json": { schema: ref("Problem") } },
});

const ERRORS = {
  "400": problemResponse("invalid input (with the field paths) or malformed JSON"),
  "401": problemResponse("missing or wrong API key (when auth is on)"),
  "404": problemResponse("unknown procedure, part or route"),
  "413": problemResponse("body or bulk array too large"),
  "500": problemResponse("internal error (logged on the server; never a stack trace)"),
  "503": problemResponse("compute budget exceeded, or the server is draining"),
};

/** The OpenAPI 3.1 document of /v1, generated from the router and its zod contracts (deterministic). */
export function openApiDocument(opts: { maxBulkItems?: number } = {}): Json {
  const schemas: Json = {};
  const paths: Json = {};
  for (const e of procedureEntries()) {
    const name = pascal(e.path);
    schemas[`${name}Input`] = e.input ? schemaOf(e.input, "input", `${name}Input`, schemas) : {};
    schemas[`${name}Output`] = e.output
      ? schemaOf(e.output, "output", `${name}Output`, schemas)
      : { description: "not declared in the contracts" };
    const summary = e.description ?? e.path;
    const tags = [e.path.includes(".") ? (e.path.split(".")[0] as string) : "analyses"];
    paths[`/v1/${e.path}`] = {
      post: {
        operationId: e.path.replaceAll(".", "_"),
        summary,
        tags,
        requestBody: { required: true, content: { "application/json": { schema: ref(`${name}Input`) } } },
        responses: {
          "200": {
            description: "the result (an outcome is data, not an error)",
            content: { "application/json": { schema: ref(`${name}Output`) } },
          },
          ...ERRORS,
        },
      },
    };
    paths[`/v1/${e.path}/bulk`] = {
      post: {
        operationId: `${e.path.replaceAll(".", "_")}_bulk`,
        summary: `${summary} — many cases in one request, answered in order`,
        tags,
        requestBody: {
          required: true,
          content: {
            "application/json": {
              schema: { type: "array", maxItems: opts.maxBulkItems ?? 10_000, items: ref(`${name}Input`) },
            },
          },
        },
        responses: {
          "200": {
            description: "one item per input, in order: a result or a problem",
            content: {
              "application/json": {
                schema: {
                  type: "object",
                  required: ["results", "ok", "failed"],
                  properties: {
                    results: {
                      type: "array",
                      items: {
                        oneOf: [
                          {
                            type: "object",
                            required: ["ok", "result"],
                            properties: { ok: { const: true }, result: ref(`${name}Output`) },
                          },
                          {
                            type: "object",
                            required: ["ok", "problem"],
                            properties: { ok: { const: false }, problem: ref("Problem") },
                          },
                        ],
                      },
                    },
                    ok: { type: "integer", minimum: 0 },
                    failed: { type: "integer", minimum: 0 },
                  },
                },
              },
            },
          },
          ...ERRORS,
        },
      },
    };
  }
  schemas.Problem = schemaOf(problem, "output", "Problem", schemas);
  const text = (description: string, type = "text/plain") => ({
    description,
    content: { [type]: { schema: { type: "string" } } },
  });
  const probe = (summary: string, extra: Json = {}) => ({
    get: {
      operationId: summary.split(" ")[0],
      summary,
      tags: ["operations"],
      security: [],
      responses: { "200": text("ok", "application/json"), ...extra },
    },
  });
  paths["/v1/review/report"] = {
    post: {
      operationId: "review_report",
      summary:
        "the design review rendered as a report: self-contained HTML with inline SVG charts (default), Markdown, or the review result",
      tags: ["analyses"],
      parameters: [
        {
          name: "format",
          in: "query",
          required: false,
          schema: { enum: ["html", "markdown", "json"] },
          description: "also a `format` field of the body, or Accept: text/html / text/markdown",
        },
        {
          name: "id",
          in: "query",
          required: false,
          schema: { type: "string" },
          description: "names the report (title)",
        },
      ],
      requestBody: { required: true, content: { "application/json": { schema: ref("ReviewInput") } } },
      responses: {
        "200": {
          description: "the report",
          content: {
            "text/html": { schema: { type: "string" } },
            "text/markdown": { schema: { type: "string" } },
            "application/json": { schema: ref("ReviewOutput") },
          },
        },
        ...ERRORS,
      },
    },
  };
  paths["/livez"] = probe("livez: the process runs");
  paths["/readyz"] = probe("readyz: ready for traffic (503 while draining)", {
    "503": text("draining", "application/json"),
  });
  paths["/healthz"] = probe("healthz: alias of livez");
  paths["/metrics"] = {
    get: {
      operationId: "metrics",
      summary: "Prometheus metrics",
      tags: ["operations"],
      security: [],
      responses: { "200": text("text exposition format") },
    },
  };
  return {
    openapi: "3.1.0",
    info: {
      title: "backstop",
      version: MODEL_VERSION,
      description:
        "Rules and calculations for reverse-polarity and reverse-current protection stages. Every analysis is POST /v1/<procedure> " +
        "(and /v1/<procedure>/bulk for many cases); the same procedures are served over tRPC at /trpc/<procedure>. " +
        'Quantities are numbers in the unit their name states (x-unit) or strings with a unit ("2.5 mOhm"). ' +
        "Results are engineering estimates: verify on hardware and against the applicable standards.",
    },
    servers: [{ url: "/" }],
    security: [{}, { bearerAuth: [] }, { apiKeyHeader: [] }],
    tags: [
      { name: "analyses", description: "analysis procedures" },
      { name: "operations", description: "probes and metrics (never behind auth)" },
    ],
    paths,
    components: {
      schemas,
      securitySchemes: {
        bearerAuth: {
          type: "http",
          scheme: "bearer",
          description: "an API key from BACKSTOP_API_KEYS (only when auth is on)",
        },
        apiKeyHeader: { type: "apiKey", in: "header", name: "X-API-Key" },
      },
    },
  };
}

/** The committed form: two-space JSON with a final newline. */
export const openApiText = () => `${JSON.stringify(openApiDocument(), null, 2)}\n`;
