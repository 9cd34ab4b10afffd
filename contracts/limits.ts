import type { ExpressionErrorCode } from "../domain/rules/sandbox.js";
import type { ExpressionSizeLimits } from "../domain/rules/sandbox-whitelist.js";

/**
 * The bounds on every input dimension that drives memory or time, and on the answers: one table,
 * read once from the environment (README, "Limits"). An input past a limit is refused with HTTP 422
 * and the code `limit-exceeded`, its message naming the limit and the variable that sets it; the
 * request body and the bulk item count are the HTTP server's (413, adapters/http/config.ts).
 */
export interface Limits {
  /** deepest nesting of arrays and objects in one input (checked before anything else reads it) */
  readonly maxInputDepth: number;
  /** most issues an error answer lists; the rest are counted in one closing issue */
  readonly maxErrorIssues: number;
  /** most names in one metrics record (`metrics`, `ruleMetrics`, part parameters) */
  readonly maxMetrics: number;
  /** most candidates in one review */
  readonly maxCandidates: number;
  /** start-up profile points times candidates in one review (each point is stepped 40 times a candidate and ambient, and every step is in the answer) */
  readonly maxProfileWork: number;
  /** most Monte Carlo samples in one review */
  readonly maxMonteCarloSamples: number;
  /** largest answer of one request (a bulk answer as a whole), bytes of JSON */
  readonly maxAnswerBytes: number;
  /** longest rule expression (`expression` or `when`) of a company or inline rule set, characters */
  readonly maxExpressionChars: number;
  /** most syntax nodes in one such rule expression (evaluation time is bounded by it) */
  readonly maxExpressionNodes: number;
  /** most parts in one `catalog.list` answer (a page; `offset` reaches the rest) */
  readonly maxCatalogListParts: number;
  /** largest curve CSV file a batch input or catalog file may reference, bytes */
  readonly maxCurveFileBytes: number;
  /** most filed records in one verify call (each is recomputed) */
  readonly maxVerifyRecords: number;
}

/** The environment variable of each limit. */
export const LIMIT_VARIABLES: { readonly [K in keyof Limits]: string } = {
  maxInputDepth: "BACKSTOP_MAX_INPUT_DEPTH",
  maxErrorIssues: "BACKSTOP_MAX_ERROR_ISSUES",
  maxMetrics: "BACKSTOP_MAX_METRICS",
  maxCandidates: "BACKSTOP_MAX_CANDIDATES",
  maxProfileWork: "BACKSTOP_MAX_PROFILE_WORK",
  maxMonteCarloSamples: "BACKSTOP_MAX_MONTE_CARLO_SAMPLES",
  maxAnswerBytes: "BACKSTOP_MAX_ANSWER_BYTES",
  maxExpressionChars: "BACKSTOP_MAX_EXPRESSION_CHARS",
  maxExpressionNodes: "BACKSTOP_MAX_EXPRESSION_NODES",
  maxCatalogListParts: "BACKSTOP_MAX_CATALOG_LIST_PARTS",
  maxCurveFileBytes: "BACKSTOP_MAX_CURVE_FILE_BYTES",
  maxVerifyRecords: "BACKSTOP_MAX_VERIFY_RECORDS",
};

export const DEFAULT_LIMITS: Limits = {
  maxInputDepth: 64,
  maxErrorIssues: 20,
  maxMetrics: 256,
  maxCandidates: 64,
  // one candidate with a 1,000-point profile answers about 11.5 MB (two ambients, 40 steps a point)
  maxProfileWork: 1000,
  maxMonteCarloSamples: 100_000,
  maxAnswerBytes: 16 * 1024 * 1024,
  maxExpressionChars: 2000,
  maxExpressionNodes: 256,
  // an entry is about 100 bytes of JSON: a page of 1,000 is about 100 kB
  maxCatalogListParts: 1000,
  // a curve holds at most 64 points (the contracts' bound), about 40 bytes a row: ample room
  maxCurveFileBytes: 64 * 1024,
  maxVerifyRecords: 1000,
};

/** A limit variable set to something other than a whole number of at least 1. */
export class LimitSettingError extends Error {}

/**
 * The limits from `env` (unset or empty: the default); a value that is not a positive integer is a
 * {@link LimitSettingError} naming the variable, what it got and what to type.
 */
export function limitsFromEnv(env: Readonly<Record<string, string | undefined>>): Limits {
  const out: Record<string, number> = {};
  for (const key of Object.keys(DEFAULT_LIMITS) as (keyof Limits)[]) {
    const name = LIMIT_VARIABLES[key];
    const raw = env[name];
    if (raw === undefined || raw === "") out[key] = DEFAULT_LIMITS[key];
    else {
      const n = Number(raw);
      if (!Number.isInteger(n) || n < 1)
        throw new LimitSettingError(
          `${name} must be a positive integer, got "${raw}": set it to a whole number such as ${name}=${DEFAULT_LIMITS[key]} (the default), or unset it`,
        );
      out[key] = n;
    }
  }
  return out as unknown as Limits;
}

/**
 * The limits of this process (its environment at start; worker threads inherit it). They are read
 * when this module loads, before an entry point's own code runs, so a bad setting cannot reach the
 * server's or the batch's error handling: it is reported here as they report theirs, one line on
 * stderr and exit 2 (could not run), not as an uncaught error with a stack trace.
 */
function limitsOfThisProcess(): Limits {
  if (typeof process === "undefined") return DEFAULT_LIMITS;
  try {
    return limitsFromEnv(process.env);
  } catch (e) {
    if (!(e instanceof LimitSettingError)) throw e;
    process.stderr.write(`backstop: ${e.message}\n`);
    process.exit(2);
  }
}

export const LIMITS: Limits = limitsOfThisProcess();

const MARK = /\(limit [A-Z_]+\)$/;

/** The message of an input past a limit: what, the limit, and its variable (the mark {@link isLimitMessage} reads). */
export function limitMessage(key: keyof Limits, what: string): string {
  return `${what}: at most ${LIMITS[key]} (limit ${LIMIT_VARIABLES[key]})`;
}

/** The size limits of a rule expression of a company or inline rule set (the built-in sets keep the domain's defaults). */
export function expressionSizeLimits(): ExpressionSizeLimits {
  return { maxLength: LIMITS.maxExpressionChars, maxNodes: LIMITS.maxExpressionNodes };
}

const EXPRESSION_LIMIT_KEYS: Partial<Record<ExpressionErrorCode, keyof Limits>> = {
  "too-long": "maxExpressionChars",
  "too-many-nodes": "maxExpressionNodes",
};

/**
 * A rule-set load error's message with the limit it hit named (marked as {@link limitMessage}'s
 * are); another error's message as it is.
 */
export function expressionErrorMessage(code: string, message: string): string {
  const key = (EXPRESSION_LIMIT_KEYS as Readonly<Record<string, keyof Limits | undefined>>)[code];
  return key === undefined ? message : `${message} (limit ${LIMIT_VARIABLES[key]})`;
}

/** Whether an issue's message is a limit's (see {@link limitMessage}). */
export function isLimitMessage(message: string): boolean {
  return MARK.test(message);
}
