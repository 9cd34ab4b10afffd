import { type MetricDef, metricDef, partParameterDef } from "./metric-vocabulary.js";
import { locate, type ExpressionError, type Loose } from "./sandbox-build.js";
import {
  BOOL,
  type Dim,
  type Exps,
  EITHER,
  FREE,
  isDiff,
  KELVIN,
  POINT,
  same,
  show,
  symbolDim,
  temperatureLike,
  unitDimension,
} from "./unit-dimensions.js";

/**
 * Dimension check of a rule expression, run when the set is loaded (after the sandbox has accepted
 * and typed it). Every vocabulary name has a unit (MetricDef.unit); a unit symbol in the
 * expression (`25 K`, `500 mV`, `150 degC`) has its own. Quantities are exponents over volt, ampere,
 * second and kelvin (W = V·A, J = V·A·s, ohm = V/A; SI coherent units, so values stay plain SI
 * numbers and the evaluation is unchanged).
 *
 * Temperatures in °C are points on an offset scale (affine), not quantities: a point minus a point
 * is a difference in K, a point plus or minus a difference in K is a point, `150 degC` is the point
 * 150 °C; adding two points, scaling a point, or comparing a point with kelvin (`423.15 K`: K is
 * read as a difference) is refused. A bare number takes the dimension its neighbour needs (the
 * rules of the built-in sets compare with plain SI numbers: `tjWorstC <= 150`), so in
 * `part.tjMaxC - 25` the 25 may be 25 °C or a 25 K margin, and the result is a temperature of
 * either kind until something fixes it.
 */

class DimensionRefusal {
  constructor(
    readonly message: string,
    readonly node: Loose,
  ) {}
}

const refuse = (message: string, node: Loose): never => {
  throw new DimensionRefusal(message, node);
};

/** The first vocabulary name or unit symbol in a node (where the column points). */
function firstName(n: Loose): string | undefined {
  if (n.type === "SymbolNode") return n.name;
  if (n.type === "AccessorNode") {
    const key = n.index?.dimensions[0];
    return key?.type === "ConstantNode" ? `part.${String(key.value)}` : undefined;
  }
  for (const c of [n.content, ...(n.args ?? []), n.condition, n.trueExpr, n.falseExpr]) {
    const f = c === undefined ? undefined : firstName(c);
    if (f !== undefined) return f;
  }
  return undefined;
}

/** The node that carries the unit at fault: of two operands, the one that is not a bare number or the vocabulary's. */
function culprit(a: Loose, b: Loose): Loose {
  return firstName(b) !== undefined ? b : a;
}

function defDim(def: MetricDef | undefined, name: string, n: Loose): Dim {
  if (def === undefined) return refuse(`'${name}' is not in the vocabulary`, n);
  const d = unitDimension(def.unit);
  return d ?? refuse(`'${name}' has unit '${def.unit}', which the dimension check does not know`, n);
}

function sumOf(op: string, a: Dim, b: Dim, an: Loose, bn: Loose): Dim {
  const subtract = op === "-";
  if (a.kind === "free") return b.kind === "point" && subtract ? EITHER : b.kind === "point" ? EITHER : b;
  if (b.kind === "free") return temperatureLike(a) ? EITHER : a;
  if (a.kind === "point" && b.kind === "point")
    return subtract
      ? KELVIN
      : refuse("cannot add two temperatures in °C; add a difference in K (part.tjMaxC + 10 K)", bn);
  if (temperatureLike(a) && (isDiff(b) || b.kind === "temp?")) return a.kind === "point" && isDiff(b) ? POINT : EITHER;
  if (temperatureLike(a) && temperatureLike(b)) return EITHER;
  if (isDiff(a) && b.kind === "point")
    return subtract ? refuse("cannot subtract a temperature in °C from a difference in K", bn) : POINT;
  if (isDiff(a) && b.kind === "temp?") return EITHER;
  if (a.kind === "q" && b.kind === "q" && same(a, b)) return a;
  const hint =
    temperatureLike(a) || temperatureLike(b) ? "; a temperature margin is written in K (part.tjMaxC - 25 K)" : "";
  return refuse(
    `cannot ${subtract ? "subtract" : "add"} ${show(b)} ${subtract ? "from" : "to"} ${show(a)}${hint}`,
    culprit(an, bn),
  );
}

function productOf(op: "*" | "/", a: Dim, b: Dim, an: Loose, bn: Loose): Dim {
  // a point scaled depends on where the scale's zero is: refused; a point-or-difference is read as a difference
  for (const [d, n] of [
    [a, an],
    [b, bn],
  ] as const) {
    if (d.kind === "point") {
      const isUnitLiteral =
        op === "*" && n.type === "SymbolNode" && n.name === "degC" && (d === b ? a.kind === "free" : b.kind === "free");
      if (!isUnitLiteral)
        refuse(
          `a temperature in °C cannot be ${op === "*" ? "multiplied" : "divided"}: its value depends on the zero of the scale; use a difference (tjWorstC - 25 degC) or a margin in K`,
          n,
        );
    }
  }
  if ((a.kind === "free" && b.kind === "point") || (a.kind === "point" && b.kind === "free")) return POINT; // 150 degC
  const asQ = (d: Dim): Dim => (d.kind === "temp?" ? KELVIN : d);
  const x = asQ(a);
  const y = asQ(b);
  if (x.kind === "free" && y.kind === "free") return FREE;
  if (y.kind === "free") return x;
  if (x.kind === "free")
    return op === "*" ? y : y.kind === "q" ? { kind: "q", e: y.e.map((v) => -v) as unknown as Exps } : y;
  if (x.kind === "q" && y.kind === "q")
    return {
      kind: "q",
      e: x.e.map((v, i) => (op === "*" ? v + (y.e[i] as number) : v - (y.e[i] as number))) as unknown as Exps,
    };
  return FREE;
}

function compared(op: string, a: Dim, b: Dim, an: Loose, bn: Loose): Dim {
  const ok =
    a.kind === "free" ||
    b.kind === "free" ||
    (a.kind === "bool" && b.kind === "bool") ||
    (temperatureLike(a) && temperatureLike(b)) ||
    (a.kind === "temp?" && isDiff(b)) ||
    (isDiff(a) && b.kind === "temp?") ||
    same(a, b);
  if (ok) return BOOL;
  if ((a.kind === "point" && isDiff(b)) || (isDiff(a) && b.kind === "point")) {
    return refuse(
      `'${op}' compares a temperature in °C with kelvin: K is read as a temperature difference; for a temperature write it in degC (150 degC)`,
      culprit(an, bn),
    );
  }
  return refuse(`'${op}' compares ${show(a)} with ${show(b)}`, culprit(an, bn));
}

const OPS: Record<string, string> = {
  add: "+",
  subtract: "-",
  multiply: "*",
  divide: "/",
  pow: "^",
  smaller: "<",
  smallerEq: "<=",
  larger: ">",
  largerEq: ">=",
  equal: "==",
  unequal: "!=",
};

function dim(n: Loose): Dim {
  switch (n.type) {
    case "ParenthesisNode":
      return n.content ? dim(n.content) : FREE;
    case "ConstantNode":
      return typeof n.value === "boolean" ? BOOL : FREE;
    case "SymbolNode": {
      const name = n.name ?? "";
      const m = metricDef(name);
      if (m !== undefined) return defDim(m, name, n);
      return symbolDim(name) ?? refuse(`'${name}' has no unit the dimension check knows`, n);
    }
    case "AccessorNode": {
      const key = n.index?.dimensions[0];
      const name = String(key?.value ?? "");
      return defDim(partParameterDef(name), `part.${name}`, n);
    }
    case "ConditionalNode": {
      const t = dim(n.trueExpr as Loose);
      const e = dim(n.falseExpr as Loose);
      if (n.condition) dim(n.condition);
      compared("?:", t, e, n.trueExpr as Loose, n.falseExpr as Loose);
      return t.kind === "free" ? e : t;
    }
    case "FunctionNode":
      return call(n);
    case "OperatorNode":
      return operator(n);
    default:
      return FREE;
  }
}

function operator(n: Loose): Dim {
  const fn = typeof n.fn === "string" ? n.fn : "";
  const args = n.args ?? [];
  const ds = args.map(dim);
  const [a, b] = ds;
  const [an, bn] = args;
  if (fn === "unaryMinus" || fn === "unaryPlus") return a ?? FREE;
  if (fn === "not") return BOOL;
  if (fn === "and" || fn === "or" || fn === "xor") return BOOL;
  if (a === undefined || b === undefined || an === undefined || bn === undefined) return FREE;
  const op = OPS[fn] ?? fn;
  if (fn === "add" || fn === "subtract") return sumOf(op, a, b, an, bn);
  if (fn === "multiply" || fn === "divide") return productOf(fn === "multiply" ? "*" : "/", a, b, an, bn);
  if (fn === "pow") {
    if (b.kind !== "free" && !(b.kind === "q" && b.e.every((x) => x === 0)))
      refuse("an exponent must be a plain number", bn);
    if (a.kind === "free" || (a.kind === "q" && a.e.every((x) => x === 0))) return a;
    if (a.kind === "point") refuse("a temperature in °C cannot be raised to a power", an);
    const k = bn.type === "ConstantNode" && typeof bn.value === "number" ? bn.value : undefined;
    if (k === undefined || a.kind !== "q") return refuse(`${show(a)} can be raised only to a constant power`, bn);
    return { kind: "q", e: a.e.map((x) => x * k) as unknown as Exps };
  }
  return compared(op, a, b, an, bn);
}

function call(n: Loose): Dim {
  const name = typeof n.fn === "object" ? (n.fn.name ?? "") : "";
  const args = n.args ?? [];
  const ds = args.map(dim);
  if (name === "min" || name === "max") {
    let out: Dim = FREE;
    ds.forEach((d, i) => {
      compared(`${name}(...)`, out, d, args[Math.max(0, i - 1)] as Loose, args[i] as Loose);
      if (out.kind === "free" || (out.kind === "temp?" && d.kind === "point")) out = d;
    });
    return out;
  }
  if (name === "abs") return ds[0] ?? FREE;
  const d = ds[0] ?? FREE;
  const plain = d.kind === "free" || (d.kind === "q" && d.e.every((x) => x === 0));
  if (name === "sqrt") {
    if (plain) return d;
    if (d.kind === "q" && d.e.every((x) => x % 2 === 0))
      return { kind: "q", e: d.e.map((x) => x / 2) as unknown as Exps };
    return refuse(`sqrt of ${show(d)} has no unit`, args[0] as Loose);
  }
  if (!plain) refuse(`${name} needs a plain number or a ratio, got ${show(d)}`, args[0] as Loose);
  return FREE;
}

/** The refusal of an expression whose units do not agree, or undefined. */
export function checkDimensions(root: Loose, text: string): ExpressionError | undefined {
  try {
    dim(root);
    return undefined;
  } catch (e) {
    if (!(e instanceof DimensionRefusal)) throw e;
    const name = firstName(e.node);
    return { code: "dimension", message: e.message, column: name === undefined ? 1 : locate(text, name) };
  }
}
