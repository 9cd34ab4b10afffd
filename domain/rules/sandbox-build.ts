import { metricDef, partParameterDef } from "./metric-vocabulary.js";
import {
  ARITHMETIC,
  COMPARISONS,
  EXPRESSION_LIMITS,
  FORBIDDEN_NAMES,
  FUNCTIONS,
  UNIT_SCALES,
} from "./sandbox-whitelist.js";

export type NumFn = (v: ArrayLike<number>) => number;
export type BoolFn = (v: ArrayLike<number>) => boolean;

export type ExpressionErrorCode =
  | "too-long"
  | "too-deep"
  | "too-many-nodes"
  | "syntax"
  | "forbidden"
  | "unknown-name"
  | "type"
  | "dimension";
/** Why an expression was refused; `column` is 1-based in the expression text. */
export interface ExpressionError {
  readonly code: ExpressionErrorCode;
  readonly message: string;
  readonly column: number;
}

/** Thrown inside a closure when an intermediate value is not finite (caught by the evaluator). */
export const NON_FINITE: { readonly marker: "non-finite" } = Object.freeze({ marker: "non-finite" });

/** The fields of the mathjs node types this walker reads. */
export interface Loose {
  readonly type: string;
  readonly fn?: string | Loose;
  readonly op?: string;
  readonly args?: readonly Loose[];
  readonly name?: string;
  readonly value?: unknown;
  readonly content?: Loose;
  readonly object?: Loose;
  readonly index?: { readonly dimensions: readonly Loose[]; readonly dotNotation: boolean };
  readonly condition?: Loose;
  readonly trueExpr?: Loose;
  readonly falseExpr?: Loose;
}

export interface Ctx {
  readonly text: string;
  readonly names: string[];
  readonly index: Map<string, number>;
  nodes: number;
  /** most syntax nodes the expression may have */
  readonly maxNodes: number;
}

type Built = { readonly type: "number"; readonly f: NumFn } | { readonly type: "boolean"; readonly f: BoolFn };

function refuse(code: ExpressionErrorCode, message: string, column: number): never {
  throw { refusal: { code, message, column } satisfies ExpressionError };
}

/** 1-based column of the first occurrence of `needle` as a whole word (1 when not found). */
export function locate(text: string, needle: string): number {
  if (needle === "") return 1;
  const esc = needle.replace(/[.*+?^${}()|[\]\\]/g, "\\$&").replace(/\\\./g, "\\s*\\.\\s*");
  const m = new RegExp(`(?<![A-Za-z0-9_$])${esc}(?![A-Za-z0-9_$])`).exec(text);
  if (m) return m.index + 1;
  const i = text.indexOf(needle);
  return i >= 0 ? i + 1 : 1;
}

const finite = (x: number): number => {
  if (!Number.isFinite(x)) throw NON_FINITE;
  return x;
};

function slot(ctx: Ctx, name: string): number {
  let i = ctx.index.get(name);
  if (i === undefined) {
    i = ctx.names.length;
    ctx.names.push(name);
    ctx.index.set(name, i);
  }
  return i;
}

function variable(ctx: Ctx, name: string, type: "number" | "boolean"): Built {
  const i = slot(ctx, name);
  return type === "number" ? { type, f: (v) => v[i] as number } : { type, f: (v) => v[i] !== 0 };
}

function num(b: Built, ctx: Ctx, what: string): NumFn {
  if (b.type !== "number") refuse("type", `${what} needs a number, got a condition`, locate(ctx.text, what));
  return b.f;
}
function bool(b: Built, ctx: Ctx, what: string): BoolFn {
  if (b.type !== "boolean") refuse("type", `${what} needs a condition, got a number`, locate(ctx.text, what));
  return b.f;
}

/**
 * Walk one mathjs node against the whitelist and build its closure. Refuses (throws a refusal
 * record, caught by compileExpression) every node type, operator, function and name not listed.
 */
export function build(n: Loose, ctx: Ctx, depth: number): Built {
  ctx.nodes += 1;
  if (ctx.nodes > ctx.maxNodes) refuse("too-many-nodes", `expression has more than ${ctx.maxNodes} syntax nodes`, 1);
  if (depth > EXPRESSION_LIMITS.maxDepth)
    refuse("too-deep", `expression nests deeper than ${EXPRESSION_LIMITS.maxDepth} levels`, 1);
  const d = depth + 1;
  switch (n.type) {
    case "ParenthesisNode":
      if (!n.content) return refuse("syntax", "empty parentheses", locate(ctx.text, "("));
      return build(n.content, ctx, d);
    case "ConstantNode": {
      if (typeof n.value === "boolean") {
        const b = n.value;
        return { type: "boolean", f: () => b };
      }
      if (typeof n.value === "number" && Number.isFinite(n.value)) {
        const x = n.value;
        return { type: "number", f: () => x };
      }
      const shown = typeof n.value === "string" ? JSON.stringify(n.value) : String(n.value);
      return refuse(
        "forbidden",
        `only finite numbers and true/false are allowed as constants, got ${shown}`,
        locate(ctx.text, shown),
      );
    }
    case "SymbolNode":
      return symbol(n.name ?? "", ctx);
    case "AccessorNode":
      return accessor(n, ctx);
    case "OperatorNode":
      return operator(n, ctx, d);
    case "FunctionNode":
      return call(n, ctx, d);
    case "ConditionalNode": {
      if (!n.condition || !n.trueExpr || !n.falseExpr)
        return refuse("syntax", "incomplete conditional", locate(ctx.text, "?"));
      const c = bool(build(n.condition, ctx, d), ctx, "?");
      const t = build(n.trueExpr, ctx, d);
      const e = build(n.falseExpr, ctx, d);
      if (t.type === "number" && e.type === "number") return { type: "number", f: (v) => (c(v) ? t.f(v) : e.f(v)) };
      if (t.type === "boolean" && e.type === "boolean") return { type: "boolean", f: (v) => (c(v) ? t.f(v) : e.f(v)) };
      return refuse("type", "both branches of a conditional must be numbers or both conditions", locate(ctx.text, ":"));
    }
    default:
      return refuse("forbidden", refusedNodeMessage(n.type), locate(ctx.text, nodeMarker(n.type)));
  }
}

function refusedNodeMessage(type: string): string {
  switch (type) {
    case "FunctionAssignmentNode":
      return "function definitions are not allowed";
    case "AssignmentNode":
      return "assignment is not allowed";
    case "BlockNode":
      return "only one expression is allowed (no ';' or line breaks between statements)";
    case "RelationalNode":
      return "chained comparisons are not allowed; write a <= b and b <= c";
    default:
      return `${type.replace(/Node$/, "").toLowerCase()} syntax is not allowed`;
  }
}

function nodeMarker(type: string): string {
  const m: Record<string, string> = {
    FunctionAssignmentNode: "=",
    AssignmentNode: "=",
    BlockNode: ";",
    ArrayNode: "[",
    ObjectNode: "{",
    RangeNode: ":",
    IndexNode: "[",
    RelationalNode: "<",
  };
  return m[type] ?? "";
}

function symbol(name: string, ctx: Ctx): Built {
  if (FORBIDDEN_NAMES.has(name))
    refuse("forbidden", `'${name}' is not allowed in a rule expression`, locate(ctx.text, name));
  const m = metricDef(name);
  if (m !== undefined) return variable(ctx, name, m.type);
  const scale = UNIT_SCALES.get(name);
  if (scale !== undefined) return { type: "number", f: () => scale };
  if (name === "part")
    return refuse(
      "forbidden",
      "'part' must be followed by a parameter name, as in part.tjMaxC",
      locate(ctx.text, name),
    );
  return refuse(
    "unknown-name",
    `unknown name '${name}': not in the metric vocabulary (see docs/metrics.md)`,
    locate(ctx.text, name),
  );
}

function accessor(n: Loose, ctx: Ctx): Built {
  const dims = n.index?.dimensions ?? [];
  const key = dims[0];
  const ok =
    n.object?.type === "SymbolNode" &&
    n.object.name === "part" &&
    n.index?.dotNotation === true &&
    dims.length === 1 &&
    key?.type === "ConstantNode" &&
    typeof key.value === "string";
  if (!ok) {
    const at = n.object?.type === "SymbolNode" ? locate(ctx.text, n.object.name ?? "") : 1;
    return refuse("forbidden", "property access is allowed only as part.<parameter>", at);
  }
  const prop = String(key?.value);
  if (FORBIDDEN_NAMES.has(prop))
    refuse("forbidden", `'part.${prop}' is not allowed in a rule expression`, locate(ctx.text, prop));
  const p = partParameterDef(prop);
  if (p === undefined)
    return refuse(
      "unknown-name",
      `unknown part parameter 'part.${prop}' (see docs/metrics.md)`,
      locate(ctx.text, `part.${prop}`),
    );
  return variable(ctx, `part.${prop}`, p.type);
}

function operator(n: Loose, ctx: Ctx, d: number): Built {
  const fn = typeof n.fn === "string" ? n.fn : "";
  const op = n.op ?? fn;
  const args = (n.args ?? []).map((a) => build(a, ctx, d));
  const [a, b] = args;
  const ar = ARITHMETIC.get(fn);
  if (ar !== undefined && a !== undefined && b !== undefined && args.length === 2) {
    const x = num(a, ctx, op);
    const y = num(b, ctx, op);
    return { type: "number", f: (v) => finite(ar(x(v), y(v))) };
  }
  if ((fn === "unaryMinus" || fn === "unaryPlus") && a !== undefined && args.length === 1) {
    const x = num(a, ctx, op);
    return { type: "number", f: fn === "unaryMinus" ? (v) => -x(v) : x };
  }
  const cmp = COMPARISONS.get(fn);
  if (cmp !== undefined && a !== undefined && b !== undefined) {
    const x = num(a, ctx, op);
    const y = num(b, ctx, op);
    return { type: "boolean", f: (v) => cmp.test(x(v), y(v)) };
  }
  if ((fn === "equal" || fn === "unequal") && a !== undefined && b !== undefined) {
    if (a.type !== b.type) refuse("type", `'${op}' compares a number with a condition`, locate(ctx.text, op));
    const x = a.f as (v: ArrayLike<number>) => number | boolean;
    const y = b.f as (v: ArrayLike<number>) => number | boolean;
    return { type: "boolean", f: fn === "equal" ? (v) => x(v) === y(v) : (v) => x(v) !== y(v) };
  }
  if (fn === "not" && a !== undefined && args.length === 1) {
    const x = bool(a, ctx, "not");
    return { type: "boolean", f: (v) => !x(v) };
  }
  if ((fn === "and" || fn === "or" || fn === "xor") && a !== undefined && b !== undefined) {
    const x = bool(a, ctx, fn);
    const y = bool(b, ctx, fn);
    const f: BoolFn = fn === "and" ? (v) => x(v) && y(v) : fn === "or" ? (v) => x(v) || y(v) : (v) => x(v) !== y(v);
    return { type: "boolean", f };
  }
  return refuse("forbidden", `operator '${op}' (${fn}) is not allowed`, locate(ctx.text, op));
}

function call(n: Loose, ctx: Ctx, d: number): Built {
  const callee = typeof n.fn === "object" ? n.fn : undefined;
  if (callee?.type !== "SymbolNode")
    return refuse("forbidden", "only calls of the whitelisted functions by name are allowed", locate(ctx.text, "("));
  const name = callee.name ?? "";
  const def = FUNCTIONS.get(name);
  if (def === undefined) {
    const why = FORBIDDEN_NAMES.has(name)
      ? "is refused in the rules sandbox"
      : "is not in the whitelist (min, max, abs, sqrt, exp, log, log10)";
    return refuse("forbidden", `function '${name}' ${why}`, locate(ctx.text, name));
  }
  const args = n.args ?? [];
  if (args.length < def.minArgs || args.length > def.maxArgs) {
    refuse(
      "syntax",
      `${name} takes ${def.minArgs === def.maxArgs ? def.minArgs : `${def.minArgs} to ${def.maxArgs}`} argument(s), got ${args.length}`,
      locate(ctx.text, name),
    );
  }
  const fs = args.map((a) => num(build(a, ctx, d), ctx, name));
  const impl = def.fn;
  return { type: "number", f: (v) => finite(impl(fs.map((f) => f(v)))) };
}
