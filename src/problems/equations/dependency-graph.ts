// Which states (and whether t) each definition and equation depends on, through the definitions
// it uses, computed once per definition in file order. Walking the graph instead of inlining
// definitions keeps this linear in the model: a chain where each definition uses the previous one
// twice would double in size with every link if inlined.
import { symbolsOf, type AstNode } from '../expression/emit.js';

export interface GraphDefinition {
  readonly name: string;
  readonly node: AstNode;
}

/** What one expression mentions directly, and what it depends on through definitions. */
export interface Reach {
  /** States named in the expression itself (indices). */
  readonly directStates: readonly number[];
  /** Definitions named in the expression itself (indices into the definitions, file order). */
  readonly directDefinitions: readonly number[];
  /** Every state the value depends on, sorted. */
  readonly states: ReadonlySet<number>;
  readonly usesTime: boolean;
}

export interface DependencyGraph {
  readonly states: readonly string[];
  readonly definitions: readonly GraphDefinition[];
  /** Reach of each definition, in file order. */
  readonly definitionReach: readonly Reach[];
  /** Reach of any other expression over the same states and definitions. */
  reachOf(node: AstNode): Reach;
}

/** Definitions must be in file order, each using only earlier ones (checked by the caller). */
export function dependencyGraph(states: readonly string[], definitions: readonly GraphDefinition[]): DependencyGraph {
  const stateIndex = new Map(states.map((s, i) => [s, i] as const));
  const definitionIndex = new Map(definitions.map((d, i) => [d.name, i] as const));
  const definitionReach: Reach[] = [];
  const reachOf = (node: AstNode): Reach => {
    const directStates: number[] = [];
    const directDefinitions: number[] = [];
    let usesTime = false;
    const reached = new Set<number>();
    for (const symbol of symbolsOf(node)) {
      if (symbol === 't') usesTime = true;
      const s = stateIndex.get(symbol);
      if (s !== undefined) {
        directStates.push(s);
        reached.add(s);
      }
      const d = definitionIndex.get(symbol);
      if (d !== undefined) {
        const inner = definitionReach[d];
        // A definition not yet reached (used before it is defined) is the caller's error to report.
        if (!inner) continue;
        directDefinitions.push(d);
        for (const j of inner.states) reached.add(j);
        usesTime ||= inner.usesTime;
      }
    }
    directStates.sort((a, b) => a - b);
    directDefinitions.sort((a, b) => a - b);
    return { directStates, directDefinitions, states: new Set([...reached].sort((a, b) => a - b)), usesTime };
  };
  for (const d of definitions) definitionReach.push(reachOf(d.node));
  return { states, definitions, definitionReach, reachOf };
}
