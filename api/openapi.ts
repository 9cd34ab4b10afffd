import { MODEL_VERSION } from "../domain/provenance.js";
import { problem } from "../contracts/problem.js";
import { pascalName } from "../contracts/schema-names.js";
import { contractComponents } from "./openapi-components.js";
import { procedureEntries } from "./procedure-registry.js";

type Json = { [k: string]: unknown };

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const problemResponse = (description: string) => ({
  description,
  content: { "application/problem+json": { schema: ref("Problem") } },
});

/** The error answers every analysis route shares, once under components.responses. */
const ERROR_RESPONSES = {
  BadRequest: ["400", problemResponse("invalid input (with the field paths) or malformed JSON")],
  Unauthorized: ["401", problemResponse("missing or wrong API key (when auth is on)")],
  NotFound: ["404", problemResponse("unknown procedure, part or route")],
  TooLarge: ["413", problemResponse("body or bulk array too large")],
  OverLimit: [
    "422",
    problemResponse("over a limit (limit-exceeded, answer-too-large) or a report that could not be drawn"),
  ],
  Internal: ["500", problemResponse("internal error (logged on the server; never a stack trace)")],
  Unavailable: ["503", problemResponse("compute budget exceeded, or the server is draining")],
} as const;
const ERRORS = Object.fromEntries(
  Object.entries(ERROR_RESPONSES).map(([name, [status]]) => [status, { $ref: `#/components/responses/${name}` }]),
);

/**
 * The example of each procedure, by path: the input of its `examples/requests/<procedure>.json`
 * (read by the adapter that serves or writes the document, adapters/openapi/request-examples.ts).
 */
export type RequestExamples = ReadonlyMap<string, unknown>;

/** The media types of a report (`POST /v1/<procedure>/report`): the drawn page, Markdown, or the result. */
const reportResponses = (procedure: string, output: string) => ({
  "200": {
    description: `the ${procedure} report`,
    content: {
      "text/html": { schema: { type: "string" } },
      "text/markdown": { schema: { type: "string" } },
      "application/json": { schema: ref(output) },
    },
  },
  ...ERRORS,
});

const reportParameters = [
  {
    name: "format",
    in: "query",
    required: false,
    schema: { enum: ["html", "markdown", "json"] },
    description: "also a `format` field of the body, or Accept: text/html / text/markdown / application/json",
  },
  { name: "id", in: "query", required: false, schema: { type: "string" }, description: "names the report (title)" },
];

/**
 * The OpenAPI 3.1 document of /v1, generated from the procedure table and its zod contracts
 * (deterministic): every route the app serves but /trpc (test/contracts/openapi-routes.test.ts),
 * named components (api/openapi-components.ts), one example a procedure.
 */
export function openApiDocument(opts: {
  examples: RequestExamples;
  reports: readonly string[];
  maxBulkItems?: number;
}): Json {
  const entries = procedureEntries();
  const components = contractComponents(entries, [problem]);
  const problemName = components.answerOf(problem);
  if (problemName !== "Problem") throw new Error(`the problem schema is named ${problemName}`);
  const paths: Json = {};
  const exampleComponents: Json = {};
  for (const e of entries) {
    const input = components.inputOf(e.path);
    const output = components.outputOf(e.path);
    const example = opts.examples.get(e.path);
    if (example !== undefined) exampleComponents[`${pascalName(e.path)}Example`] = { value: example };
    const examples =
      example === undefined
        ? {}
        : { examples: { [e.path]: { $ref: `#/components/examples/${pascalName(e.path)}Example` } } };
    const summary = e.description ?? e.path;
    const tags = [e.path.includes(".") ? (e.path.split(".")[0] as string) : "analyses"];
    paths[`/v1/${e.path}`] = {
      post: {
        operationId: e.path.replaceAll(".", "_"),
        summary,
        tags,
        requestBody: { required: true, content: { "application/json": { schema: ref(input), ...examples } } },
        responses: {
          "200": {
            description: "the result (an outcome is data, not an error)",
            content: { "application/json": { schema: ref(output) } },
          },
          ...ERRORS,
        },
      },
    };
    const bulkExamples = example === undefined ? {} : { examples: { [e.path]: { value: [example] } } };
    paths[`/v1/${e.path}/bulk`] = {
      post: {
        operationId: `${e.path.replaceAll(".", "_")}_bulk`,
        summary: `${summary} — many cases in one request, answered in order`,
        tags,
        requestBody: {
          required: true,
          content: {
            "application/json": {
              schema: { type: "array", maxItems: opts.maxBulkItems ?? 10_000, items: ref(input) },
              ...bulkExamples,
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
                            properties: { ok: { const: true }, result: ref(output) },
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
    if (opts.reports.includes(e.path))
      paths[`/v1/${e.path}/report`] = {
        post: {
          operationId: `${e.path.replaceAll(".", "_")}_report`,
          summary: `${summary} — rendered as a report: self-contained HTML with inline SVG charts (default), Markdown, or the result`,
          tags,
          parameters: reportParameters,
          requestBody: { required: true, content: { "application/json": { schema: ref(input), ...examples } } },
          responses: reportResponses(e.path, output),
        },
      };
  }
  const text = (description: string, type = "text/plain") => ({
    description,
    content: { [type]: { schema: { type: "string" } } },
  });
  const probe = (summary: string, extra: Json = {}) => ({
    get: {
      operationId: summary.split(":")[0],
      summary,
      tags: ["operations"],
      security: [],
      responses: { "200": text("ok", "application/json"), ...extra },
    },
  });
  paths["/v1"] = {
    get: {
      operationId: "procedures",
      summary: "procedures: every procedure with its /v1 and bulk URL",
      tags: ["operations"],
      responses: { "200": text("the list", "application/json"), ...ERRORS },
    },
  };
  paths["/livez"] = probe("livez: the process runs");
  paths["/readyz"] = probe("readyz: ready for traffic (503 while draining)", {
    "503": text("draining", "application/json"),
  });
  paths["/healthz"] = probe("healthz: alias of livez");
  paths["/openapi.json"] = probe("openapi: this document");
  paths["/v1/record-key"] = {
    get: {
      operationId: "recordKey",
      summary: "recordKey: the public key (Ed25519, PEM) and key id that check verdict-record signatures",
      tags: ["operations"],
      responses: {
        "200": text("{ alg, keyId, publicKeyPem }", "application/json"),
        "404": problemResponse("this service signs no verdict records (no key configured)"),
      },
    },
  };
  paths["/metrics"] = {
    get: {
      operationId: "metrics",
      summary: "Prometheus metrics",
      tags: ["operations"],
      security: [],
      responses: { "200": text("text exposition format"), "503": problemResponse("the metrics could not be gathered") },
    },
  };
  const schemas = components.schemas;
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
      responses: Object.fromEntries(Object.entries(ERROR_RESPONSES).map(([name, [, response]]) => [name, response])),
      examples: exampleComponents,
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

/** The committed form (contracts/openapi.json): two-space JSON with a final newline, for readable diffs. */
export const committedText = (doc: Json): string => `${JSON.stringify(doc, null, 2)}\n`;
