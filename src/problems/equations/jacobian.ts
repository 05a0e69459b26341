// Symbolic Jacobian of equations whose definitions have been inlined, by mathjs `derivative`.
// Returns the JavaScript of every nonzero entry, or why it could not be formed (then the caller
// leaves the Jacobian to finite differences). Only entries whose equation mentions the state are
// differentiated: the others are structurally zero.
//
// Derivatives are taken without mathjs's `simplify`: its rule search grows exponentially with the
// size of an expression (a 20-term polynomial takes seconds, a product of 10 sines minutes), so
// loading a modest user file could hang. The unsimplified derivative has the same value. A
// derivative larger than MAX_DERIVATIVE_NODES (the product rule squares the size of a long
// product) is left to finite differences rather than compiled into megabytes of code.
import { derivative, ParenthesisNode, type MathNode } from 'mathjs';
import { emitExpression, symbolsOf, type AstNode, type EmitScope } from '../expression/emit.js';

export interface JacobianEntry {
  readonly row: number;
  readonly col: number;
  readonly js: string;
}

/** Largest derivative (in mathjs nodes) compiled into the symbolic Jacobian. */
export const MAX_DERIVATIVE_NODES = 20_000;

function nodeCount(node: AstNode): number {
  let count = 0;
  (node as unknown as MathNode).traverse(() => {
    count++;
  });
  return count;
}

export type JacobianResult = { readonly entries: JacobianEntry[] } | { readonly reason: string };

/** Replaces every definition symbol by its (already inlined) expression in parentheses. */
export function inlineDefinitions(node: AstNode, inlined: ReadonlyMap<string, AstNode>): AstNode {
  const math = node as unknown as MathNode;
  return math.transform((n: MathNode) => {
    if (n.type === 'SymbolNode') {
      const def = inlined.get((n as unknown as { name: string }).name);
      if (def) return new ParenthesisNode(def as unknown as MathNode);
    }
    return n;
  }) as unknown as AstNode;
}

export function symbolicJacobian(equations: readonly AstNode[], states: readonly string[], scope: EmitScope): JacobianResult {
  const entries: JacobianEntry[] = [];
  for (let row = 0; row < equations.length; row++) {
    const used = symbolsOf(equations[row]!);
    for (let col = 0; col < states.length; col++) {
      if (!used.has(states[col]!)) continue;
      let d: AstNode;
      try {
        d = derivative(equations[row] as unknown as MathNode, states[col]!, { simplify: false }) as unknown as AstNode;
      } catch (e) {
        return { reason: `mathjs could not differentiate the equation of ${states[row]} by ${states[col]}: ${e instanceof Error ? e.message.split(':')[0] : String(e)}` };
      }
      if (d.type === 'ConstantNode' && d['value'] === 0) continue;
      const size = nodeCount(d);
      if (size > MAX_DERIVATIVE_NODES) {
        return { reason: `the derivative of ${states[row]}'s equation by ${states[col]} has ${size} terms and operations (more than ${MAX_DERIVATIVE_NODES}); finite differences are cheaper` };
      }
      try {
        entries.push({ row, col, js: emitExpression(d, scope) });
      } catch (e) {
        return { reason: `the derivative of ${states[row]}'s equation by ${states[col]} uses a construct outside the whitelist (${e instanceof Error ? e.message : String(e)})` };
      }
    }
  }
  return { entries };
}
