// Symbolic Jacobian of an equation file, derived through its definitions as a graph. Each
// definition and equation is differentiated on its own (mathjs `derivative`) by the states and
// the definitions it names directly; the chain rule then joins these local partials through
// temporaries, once per definition:
//   g_k_j = d(def k)/d(state j) = direct partial + sum over used definitions u of p_k_u * g_u_j
// so the code and the work grow linearly with the model. (Inlining definitions first, as this
// module once did, doubles the expression with every link of a chain that uses the previous
// definition twice.) Returns the temporaries and the nonzero entries, or why no symbolic Jacobian
// is formed (the caller then leaves it to finite differences).
//
// Derivatives are taken without mathjs's `simplify`: its rule search grows exponentially with the
// size of an expression. The limits below are checked before any derivative is taken (the work
// bound) and on each local derivative (its size), so loading stays bounded whatever the file.
import { derivative, type MathNode } from 'mathjs';
import { emitExpression, type AstNode, type EmitScope } from '../expression/emit.js';
import { treeSize, type Walkable } from '../expression/parse.js';
import type { DependencyGraph, Reach } from './dependency-graph.js';
import type { FunctionRule } from '../expression/functions.js';

export interface JacobianEntry {
  readonly row: number;
  readonly col: number;
  readonly js: string;
}

/** Largest local derivative (in mathjs nodes) compiled into the symbolic Jacobian. */
export const MAX_DERIVATIVE_NODES = 20_000;
/**
 * Bound on the differentiation work, checked before it starts: the sum, over every local partial
 * to take, of derivativeCost (an upper estimate of the derivative's size). 4e6 is about a second
 * of mathjs on one core; real models use a tiny fraction.
 */
export const MAX_DERIVATIVE_WORK = 4_000_000;
/** Bound on the chain-rule products (one per definition, used definition and state reached). */
export const MAX_CHAIN_TERMS = 200_000;

export type JacobianResult =
  | {
      /** Lines of `const name = js;` to run after the state and definition values, in order. */
      readonly temporaries: readonly string[];
      readonly entries: readonly JacobianEntry[];
    }
  | { readonly reason: string };

/** Expressions to differentiate: the equations, one per state, in state order. */
export function symbolicJacobian(
  graph: DependencyGraph,
  equations: readonly AstNode[],
  scope: EmitScope,
  tableSlopes?: ReadonlyMap<string, FunctionRule>,
): JacobianResult {
  const { states, definitions, definitionReach } = graph;
  const equationReach = equations.map((e) => graph.reachOf(e));
  const needed = neededWithReach(equationReach, definitionReach);

  // Bounds first: nothing is differentiated if the whole would be too large.
  let work = 0;
  let chainTerms = 0;
  const plan = (node: AstNode, reach: Reach): void => {
    const vars = reach.directStates.length + reach.directDefinitions.filter((u) => definitionReach[u]!.stateCount > 0).length;
    if (vars > 0) work += derivativeCost(node) * vars;
    for (const u of reach.directDefinitions) chainTerms += definitionReach[u]!.stateCount;
  };
  for (const k of needed) plan(definitions[k]!.node, definitionReach[k]!);
  equations.forEach((e, row) => plan(e, equationReach[row]!));
  if (work > MAX_DERIVATIVE_WORK) {
    return { reason: `differentiating the model would take about ${work} node operations (more than ${MAX_DERIVATIVE_WORK}); finite differences are cheaper` };
  }
  if (chainTerms > MAX_CHAIN_TERMS) {
    return { reason: `the chain rule through the definitions needs ${chainTerms} products (more than ${MAX_CHAIN_TERMS}); finite differences are cheaper` };
  }

  const temporaries: string[] = [];
  /** gradient[k].get(j): name of the temporary holding d(def k)/d(state j), when not zero. */
  const gradient: Map<number, string>[] = definitions.map(() => new Map());
  try {
    for (const k of needed) {
      const what = `the definition ${definitions[k]!.name}`;
      const terms = chainRule(definitions[k]!.node, definitionReach[k]!, `p${k}_`, what);
      for (const [j, js] of terms) {
        const name = `g${k}_${j}`;
        temporaries.push(`const ${name} = ${js};`);
        gradient[k]!.set(j, name);
      }
    }
    const entries: JacobianEntry[] = [];
    equations.forEach((e, row) => {
      const terms = chainRule(e, equationReach[row]!, `q${row}_`, `the equation of ${states[row]}`);
      for (const [col, js] of terms) entries.push({ row, col, js });
    });
    return { temporaries, entries };
  } catch (e) {
    if (e instanceof NoJacobian) return { reason: e.message };
    throw e;
  }

  /**
   * Total partials of one expression by each state it reaches: its direct partial plus, for each
   * definition u it names, (partial by u) * g_u_j. Partials by definitions become temporaries
   * named prefix + u, built once and used for every state u reaches.
   */
  function chainRule(node: AstNode, reach: Reach, prefix: string, what: string): Map<number, string> {
    const terms = new Map<number, string[]>();
    const add = (j: number, js: string): void => {
      const list = terms.get(j);
      if (list) list.push(js);
      else terms.set(j, [js]);
    };
    for (const j of reach.directStates) {
      const js = localPartial(node, states[j]!, what);
      if (js !== undefined) add(j, js);
    }
    for (const u of reach.directDefinitions) {
      if (gradient[u]!.size === 0) continue;
      const js = localPartial(node, definitions[u]!.name, what);
      if (js === undefined) continue;
      const name = `${prefix}${u}`;
      temporaries.push(`const ${name} = ${js};`);
      for (const [j, g] of gradient[u]!) add(j, `${name} * ${g}`);
    }
    const out = new Map<number, string>();
    for (const j of [...terms.keys()].sort((a, b) => a - b)) {
      const list = terms.get(j)!;
      out.set(j, list.length === 1 ? list[0]! : `(${list.join(' + ')})`);
    }
    return out;
  }

  /** JavaScript of d(node)/d(symbol) with other symbols held fixed; undefined when it is 0. */
  function localPartial(node: AstNode, symbol: string, what: string): string | undefined {
    const table = tableCall(node);
    if (table) {
      // A table call (its own definition, file-tables.ts): the interpolant's exact slope at the
      // argument times the argument's partial.
      const inner = localPartial(table.arg, symbol, what);
      if (inner === undefined) return undefined;
      return `(${table.slope.emit([emitExpression(table.arg, scope)])} * ${inner})`;
    }
    let d: AstNode;
    try {
      d = derivative(node as unknown as MathNode, symbol, { simplify: false }) as unknown as AstNode;
    } catch (e) {
      throw new NoJacobian(`mathjs could not differentiate ${what} by ${symbol}: ${e instanceof Error ? e.message.split(':')[0] : String(e)}`);
    }
    if (d.type === 'ConstantNode' && d['value'] === 0) return undefined;
    const { nodes } = treeSize(d as unknown as Walkable);
    if (nodes > MAX_DERIVATIVE_NODES) {
      throw new NoJacobian(`the derivative of ${what.replace(/^the equation of (\S+)$/, "$1's equation")} by ${symbol} has ${nodes} terms and operations (more than ${MAX_DERIVATIVE_NODES}); finite differences are cheaper`);
    }
    try {
      return emitExpression(d, scope);
    } catch (e) {
      throw new NoJacobian(`the derivative of ${what} by ${symbol} uses a construct outside the whitelist (${e instanceof Error ? e.message : String(e)})`);
    }
  }

  function tableCall(node: AstNode): { arg: AstNode; slope: FunctionRule } | undefined {
    if (!tableSlopes || node.type !== 'FunctionNode') return undefined;
    const fn = node['fn'] as AstNode;
    const slope = fn.type === 'SymbolNode' ? tableSlopes.get(fn['name'] as string) : undefined;
    const args = node['args'] as AstNode[];
    return slope && args.length === 1 ? { arg: args[0]!, slope } : undefined;
  }
}

class NoJacobian extends Error {}

const LINEAR_OPERATORS = new Set(['add', 'subtract', 'unaryMinus', 'unaryPlus']);
/** Copies of an argument the widest rule makes (d(a^b) = a^b (b' log a + b a' / a) holds a three times; one more for margin). */
const COPIES_PER_RULE = 4;

/**
 * Upper estimate of the size of a derivative of `node`, in linear time and without recursion.
 * Sums and signs pass derivatives through; every other operation (product, quotient, power,
 * function) copies its arguments into the result, so a node is counted once more for each such
 * operation above it.
 */
export function derivativeCost(node: AstNode): number {
  let cost = 0;
  const stack: [Walkable, number][] = [[node as unknown as Walkable, 0]];
  while (stack.length > 0) {
    const [n, copies] = stack.pop()!;
    cost += 1 + COPIES_PER_RULE * copies;
    const a = n as unknown as AstNode;
    const linear = a.type === 'ParenthesisNode' || (a.type === 'OperatorNode' && LINEAR_OPERATORS.has(a['fn'] as string));
    n.forEach((child) => stack.push([child, linear ? copies : copies + 1]));
  }
  return cost;
}

/**
 * Definitions the equations use, directly or through others, that depend on some state; file
 * order. Each definition uses only earlier ones, so one backward pass marks them all (no recursion:
 * a chain of thousands of definitions must not exhaust the stack).
 */
function neededWithReach(equationReach: readonly Reach[], definitionReach: readonly Reach[]): number[] {
  const needed = new Array<boolean>(definitionReach.length).fill(false);
  for (const r of equationReach) for (const u of r.directDefinitions) needed[u] = true;
  for (let u = definitionReach.length - 1; u >= 0; u--) {
    if (!needed[u]) continue;
    if (definitionReach[u]!.stateCount === 0) needed[u] = false;
    else for (const v of definitionReach[u]!.directDefinitions) needed[v] = true;
  }
  return needed.flatMap((yes, u) => (yes ? [u] : []));
}
