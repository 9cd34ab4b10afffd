import type { MathNode } from "mathjs";
import { mathjs } from "./mathjs-bundle.js";

/**
 * A dedicated mathjs instance, used only to parse. Its parse function is taken first, then the
 * instance is locked: every function that could reach the parser, the evaluator or the unit system
 * is replaced by one that refuses (the lock recommended by mathjs's security notes). Rule
 * expressions are never evaluated by mathjs: the walked, whitelisted tree is compiled to closures
 * over numbers (sandbox.ts), so the lock is a second wall behind the whitelist.
 */
// Built on the first parse, not at import: taking `parse` from an instance builds the parser and
// every node class (about a tenth of a second), which the service's start-up need not wait for.
let parseOnce: ((text: string) => MathNode) | undefined;

function lockedParser(): (text: string) => MathNode {
  // The single-file build's `create` is bound to its full factory set: a fresh, separate instance.
  const instance = mathjs().create();
  const parse: (text: string) => MathNode = instance.parse;
  const refuse = (name: string) => () => {
    throw new Error(`${name} is disabled in the rules sandbox`);
  };
  instance.import(
    Object.fromEntries(
      ["import", "createUnit", "evaluate", "parse", "compile", "simplify", "derivative", "resolve", "reviver"].map(
        (n) => [n, refuse(n)],
      ),
    ),
    { override: true },
  );
  return parse;
}

export function parseExpression(text: string): MathNode {
  parseOnce ??= lockedParser();
  return parseOnce(text);
}
