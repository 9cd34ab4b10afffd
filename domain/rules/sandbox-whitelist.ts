/**
 * What a rule expression may contain, beyond the metric vocabulary. Everything not listed here is
 * refused when the rule set is loaded.
 */

/** Limits on an expression's source and syntax tree (the first two are the defaults of ExpressionSizeLimits). */
export const EXPRESSION_LIMITS = { maxLength: 2000, maxNodes: 256, maxDepth: 48, maxBracketDepth: 32 } as const;

/** The bounds on an expression's size that a deployment may set (contracts/limits.ts): characters and syntax nodes. */
export interface ExpressionSizeLimits {
  readonly maxLength: number;
  readonly maxNodes: number;
}

export type BinaryNumeric = (a: number, b: number) => number;

/** Arithmetic operators (mathjs OperatorNode fn names), on numbers only. */
export const ARITHMETIC: ReadonlyMap<string, BinaryNumeric> = new Map<string, BinaryNumeric>([
  ["add", (a, b) => a + b],
  ["subtract", (a, b) => a - b],
  ["multiply", (a, b) => a * b],
  ["divide", (a, b) => a / b],
  ["pow", (a, b) => a ** b],
]);

export type Comparison = "smaller" | "smallerEq" | "larger" | "largerEq";
export const COMPARISONS: ReadonlyMap<
  string,
  { readonly op: string; readonly test: (a: number, b: number) => boolean }
> = new Map([
  ["smaller", { op: "<", test: (a: number, b: number) => a < b }],
  ["smallerEq", { op: "<=", test: (a: number, b: number) => a <= b }],
  ["larger", { op: ">", test: (a: number, b: number) => a > b }],
  ["largerEq", { op: ">=", test: (a: number, b: number) => a >= b }],
]);

/** Functions of numbers: name → [min arity, max arity, implementation]. */
export const FUNCTIONS: ReadonlyMap<
  string,
  { readonly minArgs: number; readonly maxArgs: number; readonly fn: (args: readonly number[]) => number }
> = new Map([
  ["min", { minArgs: 1, maxArgs: 16, fn: (a: readonly number[]) => Math.min(...a) }],
  ["max", { minArgs: 1, maxArgs: 16, fn: (a: readonly number[]) => Math.max(...a) }],
  ["abs", { minArgs: 1, maxArgs: 1, fn: (a: readonly number[]) => Math.abs(a[0] ?? Number.NaN) }],
  ["sqrt", { minArgs: 1, maxArgs: 1, fn: (a: readonly number[]) => Math.sqrt(a[0] ?? Number.NaN) }],
  ["exp", { minArgs: 1, maxArgs: 1, fn: (a: readonly number[]) => Math.exp(a[0] ?? Number.NaN) }],
  [
    "log",
    {
      minArgs: 1,
      maxArgs: 2,
      fn: (a: readonly number[]) =>
        a.length === 2 ? Math.log(a[0] ?? Number.NaN) / Math.log(a[1] ?? Number.NaN) : Math.log(a[0] ?? Number.NaN),
    },
  ],
  ["log10", { minArgs: 1, maxArgs: 1, fn: (a: readonly number[]) => Math.log10(a[0] ?? Number.NaN) }],
]);

/**
 * Unit symbols, read as the SI scale of the unit so that `500 mV` is 0.5 (volts) and compares with
 * metrics held in SI. Temperatures: metrics in °C are plain numbers in °C, so `150 degC` is 150;
 * `K` is a temperature difference (margins below a °C limit: `part.tjMaxC - 25 K`). The dimension
 * check (rule-dimensions.ts) keeps the two apart.
 */
export const UNIT_SCALES: ReadonlyMap<string, number> = new Map([
  ["V", 1],
  ["mV", 1e-3],
  ["kV", 1e3],
  ["uV", 1e-6],
  ["A", 1],
  ["mA", 1e-3],
  ["uA", 1e-6],
  ["nA", 1e-9],
  ["W", 1],
  ["mW", 1e-3],
  ["kW", 1e3],
  ["K", 1],
  ["degC", 1],
  ["s", 1],
  ["ms", 1e-3],
  ["us", 1e-6],
  ["ns", 1e-9],
  ["ohm", 1],
  ["mohm", 1e-3],
  ["kohm", 1e3],
  ["F", 1],
  ["mF", 1e-3],
  ["uF", 1e-6],
  ["nF", 1e-9],
  ["H", 1],
  ["mH", 1e-3],
  ["uH", 1e-6],
  ["nH", 1e-9],
  ["J", 1],
  ["mJ", 1e-3],
  ["uJ", 1e-6],
]);

/**
 * Names refused with a pointed message: the mathjs functions that reach the parser, the unit
 * system or the evaluator, and the prototype-chain names. Any other unlisted name is refused too.
 */
export const FORBIDDEN_NAMES: ReadonlySet<string> = new Set([
  "import",
  "createUnit",
  "evaluate",
  "parse",
  "compile",
  "simplify",
  "derivative",
  "resolve",
  "reviver",
  "unit",
  "to",
  "in",
  "config",
  "typed",
  "chain",
  "help",
  "format",
  "print",
  "constructor",
  "__proto__",
  "prototype",
  "__defineGetter__",
  "__lookupGetter__",
  "valueOf",
  "toString",
]);
