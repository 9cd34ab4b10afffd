import type { MathNode } from "mathjs";
import { parseExpression } from "./locked-mathjs.js";
import {
  type BoolFn,
  build,
  type Ctx,
  type ExpressionError,
  type ExpressionErrorCode,
  type Loose,
  type NumFn,
} from "./sandbox-build.js";
import { COMPARISONS, EXPRESSION_LIMITS, type ExpressionSizeLimits } from "./sandbox-whitelist.js";
import { checkDimensions } from "./rule-dimensions.js";

export { NON_FINITE } from "./sandbox-build.js";
export type { BoolFn, ExpressionError, ExpressionErrorCode, NumFn } from "./sandbox-build.js";

/** A top-level comparison `lhs op rhs`, kept apart to report threshold and margin. */
export interface TopComparison {
  readonly op: string;
  /** "upper": lhs must stay below rhs (<, <=); "lower": lhs must stay above rhs (>, >=). */
  readonly bound: "upper" | "lower";
  readonly lhs: NumFn;
  readonly rhs: NumFn;
}

/**
 * A checked, compiled condition. `names` lists the vocabulary names it reads in order of first
 * use (part parameters as `part.<name>`); evaluation takes their values in that order, booleans
 * as 0/1. Evaluation runs a fixed closure tree of at most maxNodes nodes with no loops, calls or
 * allocation of user data, so its time is bounded by the node limit.
 */
export interface CompiledExpression {
  readonly text: string;
  readonly names: readonly string[];
  readonly test: BoolFn;
  readonly comparison: TopComparison | null;
}

export type CompileOutcome =
  | { readonly ok: true; readonly compiled: CompiledExpression }
  | { readonly ok: false; readonly error: ExpressionError };

/**
 * Compiled expressions by text. Only accepted ones are kept (a refused text is answered again from
 * scratch: refusals must not let a caller fill memory with texts of its choosing), and the cache is
 * bounded in entries and in bytes: each entry counts its text (two bytes a character) and its
 * closure tree (COMPILED_NODE_BYTES for each of its syntax nodes, an upper estimate); past either bound it is emptied.
 */
const cache = new Map<string, { readonly out: CompileOutcome; readonly nodes: number }>();
export const COMPILE_CACHE_LIMITS = { maxEntries: 4096, maxBytes: 32 * 1024 * 1024 } as const;
const COMPILED_NODE_BYTES = 256;
let cachedBytes = 0;

/** Entries and estimated bytes the compile cache holds now (for tests and metrics). */
export function compileCacheSize(): { readonly entries: number; readonly bytes: number } {
  return { entries: cache.size, bytes: cachedBytes };
}

/**
 * Check an expression against the size limits, the whitelist and the vocabulary, type it (numbers
 * vs booleans; a rule must be a condition), and compile it. Accepted expressions are cached by
 * their text (with their node count, so a hit is held to the limits of the call).
 */
export function compileExpression(text: string, size: ExpressionSizeLimits = EXPRESSION_LIMITS): CompileOutcome {
  if (text.length > size.maxLength)
    return fail(
      "too-long",
      `expression is ${text.length} characters; the limit is ${size.maxLength}`,
      size.maxLength + 1,
    );
  const hit = cache.get(text);
  if (hit !== undefined) return hit.nodes > size.maxNodes ? tooManyNodes(size.maxNodes) : hit.out;
  const { out, nodes } = compileUncached(text, size.maxNodes);
  if (!out.ok) return out;
  const bytes = 2 * text.length + COMPILED_NODE_BYTES * Math.min(text.length, nodes);
  if (cache.size >= COMPILE_CACHE_LIMITS.maxEntries || cachedBytes + bytes > COMPILE_CACHE_LIMITS.maxBytes) {
    cache.clear();
    cachedBytes = 0;
  }
  cache.set(text, { out, nodes });
  cachedBytes += bytes;
  return out;
}

function tooManyNodes(maxNodes: number): CompileOutcome {
  return fail("too-many-nodes", `expression has more than ${maxNodes} syntax nodes`, 1);
}

/** The outcome and the syntax nodes of the accepted tree (0 when refused). */
function compileUncached(text: string, maxNodes: number): { readonly out: CompileOutcome; readonly nodes: number } {
  const refused = (out: CompileOutcome) => ({ out, nodes: 0 });
  const deep = bracketOverflow(text);
  if (deep > 0)
    return refused(fail("too-deep", `brackets nest deeper than ${EXPRESSION_LIMITS.maxBracketDepth}`, deep));
  if (text.trim() === "") return refused(fail("syntax", "expression is empty", 1));
  let root: MathNode;
  try {
    root = parseExpression(text);
  } catch (e) {
    const col = typeof (e as { char?: unknown }).char === "number" ? (e as { char: number }).char : 1;
    return refused(fail("syntax", e instanceof Error ? e.message : "syntax error", col));
  }
  const ctx: Ctx = { text, names: [], index: new Map(), nodes: 0, maxNodes };
  try {
    const top = build(root as unknown as Loose, ctx, 0);
    if (top.type !== "boolean")
      return refused(
        fail("type", "a rule expression must be a condition (a comparison or a logical combination), not a number", 1),
      );
    const units = checkDimensions(root as unknown as Loose, text);
    if (units !== undefined) return refused({ ok: false, error: units });
    return {
      out: {
        ok: true,
        compiled: { text, names: ctx.names, test: top.f, comparison: topComparison(root as unknown as Loose, ctx) },
      },
      nodes: ctx.nodes,
    };
  } catch (e) {
    if (typeof e === "object" && e !== null && "refusal" in e)
      return refused({ ok: false, error: (e as { refusal: ExpressionError }).refusal });
    throw e;
  }
}

function fail(code: ExpressionErrorCode, message: string, column: number): CompileOutcome {
  return { ok: false, error: { code, message, column } };
}

function bracketOverflow(text: string): number {
  let depth = 0;
  for (let i = 0; i < text.length; i += 1) {
    const c = text[i];
    if (c === "(" || c === "[" || c === "{") depth += 1;
    else if (c === ")" || c === "]" || c === "}") depth -= 1;
    if (depth > EXPRESSION_LIMITS.maxBracketDepth) return i + 1;
  }
  return 0;
}

function topComparison(root: Loose, ctx: Ctx): TopComparison | null {
  let n = root;
  while (n.type === "ParenthesisNode" && n.content) n = n.content;
  const cmp = n.type === "OperatorNode" && typeof n.fn === "string" ? COMPARISONS.get(n.fn) : undefined;
  const [a, b] = n.args ?? [];
  if (cmp === undefined || a === undefined || b === undefined) return null;
  const sub: Ctx = { ...ctx, nodes: 0 };
  const lhs = build(a, sub, 1);
  const rhs = build(b, sub, 1);
  if (lhs.type !== "number" || rhs.type !== "number") return null;
  return { op: cmp.op, bound: cmp.op.startsWith("<") ? "upper" : "lower", lhs: lhs.f, rhs: rhs.f };
}
