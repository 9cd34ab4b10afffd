import { readFileSync } from "node:fs";

/** Limits and switches of the HTTP server, from the environment (defaults in brackets in README). */
export interface HttpConfig {
  /** largest request body, bytes (413 above) */
  readonly maxBodyBytes: number;
  /** most cases in one bulk request (413 above) */
  readonly maxBulkItems: number;
  /** most calls in one tRPC batch request (400 above) */
  readonly maxTrpcBatch: number;
  /** compute budget of one /v1 request, ms (503 compute-timeout past it) */
  readonly requestTimeoutMs: number;
  /** a client must send the request headers within this, ms (408 and the connection closed) */
  readonly headersTimeoutMs: number;
  /** a client must send the whole request (headers and body) within this, ms (408 and closed) */
  readonly receiveTimeoutMs: number;
  /** accepted API keys; undefined: auth off */
  readonly apiKeys: readonly string[] | undefined;
}

function positiveInt(env: NodeJS.ProcessEnv, name: string, fallback: number): number {
  const raw = env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1)
    throw new Error(
      `${name} must be a positive integer, got "${raw}": set it to a whole number such as ${name}=${fallback} (the default), or unset it`,
    );
  return n;
}

/** Keys from BACKSTOP_API_KEYS (comma or space separated) and BACKSTOP_API_KEYS_FILE (one a line, # comments). */
export function apiKeysFromEnv(env: NodeJS.ProcessEnv): string[] | undefined {
  const keys: string[] = [];
  if (env.BACKSTOP_API_KEYS) keys.push(...env.BACKSTOP_API_KEYS.split(/[\s,]+/));
  if (env.BACKSTOP_API_KEYS_FILE) {
    for (const line of readFileSync(env.BACKSTOP_API_KEYS_FILE, "utf8").split("\n"))
      keys.push(line.replace(/#.*$/, ""));
  }
  const clean = keys.map((k) => k.trim()).filter((k) => k.length > 0);
  for (const k of clean) if (k.length < 16) throw new Error("every API key must be at least 16 characters long");
  return clean.length > 0 ? clean : undefined;
}

export function httpConfigFromEnv(env: NodeJS.ProcessEnv = process.env): HttpConfig {
  return {
    maxBodyBytes: positiveInt(env, "BACKSTOP_MAX_BODY_BYTES", 8 * 1024 * 1024),
    maxBulkItems: positiveInt(env, "BACKSTOP_MAX_BULK_ITEMS", 10_000),
    maxTrpcBatch: positiveInt(env, "BACKSTOP_MAX_TRPC_BATCH", 100),
    requestTimeoutMs: positiveInt(env, "BACKSTOP_REQUEST_TIMEOUT_MS", 30_000),
    headersTimeoutMs: positiveInt(env, "BACKSTOP_HEADERS_TIMEOUT_MS", 10_000),
    receiveTimeoutMs: positiveInt(env, "BACKSTOP_RECEIVE_TIMEOUT_MS", 30_000),
    apiKeys: apiKeysFromEnv(env),
  };
}

export const DEFAULT_HTTP_CONFIG: HttpConfig = httpConfigFromEnv({});
