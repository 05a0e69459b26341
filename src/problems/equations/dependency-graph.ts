// Which states (and whether t) each definition and equation depends on, through the definitions
// it uses, computed once per definition in file order. Walking the graph instead of inlining
// definitions keeps this linear in the model: a chain where each definition uses the previous one
// twice would double in size with every link if inlined. Reached states are kept as bit sets
// (n / 8 bytes per definition), so a long chain over many states stays small.
import { symbolsOf, type AstNode } from '../expression/emit.js';

export interface GraphDefinition {
  readonly name: string;
  readonly node: AstNode;
}

/** What one expression mentions directly, and what it depends on through definitions. */
export interface Reach {
  /** States named in the expression itself (indices, ascending). */
  readonly directStates: readonly number[];
  /** Definitions named in the expression itself (indices into the definitions, ascending). */
  readonly directDefinitions: readonly number[];
  /** Bit j set when the value depends on state j. */
  readonly stateBits: Uint32Array;
  /** Number of states the value depends on. */
  readonly stateCount: number;
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

/** The states a reach covers, ascending. */
export function reachedStates(reach: Reach): number[] {
  const out: number[] = [];
  const bits = reach.stateBits;
  for (let w = 0; w < bits.length; w++) {
    let word = bits[w]!;
    while (word !== 0) {
      const low = word & -word;
      out.push(w * 32 + 31 - Math.clz32(low));
      word ^= low;
    }
  }
  return out;
}

function popCount(bits: Uint32Array): number {
  let count = 0;
  for (let w = 0; w < bits.length; w++) {
    let v = bits[w]!;
    v -= (v >>> 1) & 0x55555555;
    v = (v & 0x33333333) + ((v >>> 2) & 0x33333333);
    count += (((v + (v >>> 4)) & 0x0f0f0f0f) * 0x01010101) >>> 24;
  }
  return count;
}

/** Definitions must be in file order, each using only earlier ones (checked by the caller). */
export function dependencyGraph(states: readonly string[], definitions: readonly GraphDefinition[]): DependencyGraph {
  const stateIndex = new Map(states.map((s, i) => [s, i] as const));
  const definitionIndex = new Map(definitions.map((d, i) => [d.name, i] as const));
  const words = Math.ceil(states.length / 32);
  const definitionReach: Reach[] = [];
  const reachOf = (node: AstNode): Reach => {
    const directStates: number[] = [];
    const directDefinitions: number[] = [];
    let usesTime = false;
    const stateBits = new Uint32Array(words);
    for (const symbol of symbolsOf(node)) {
      if (symbol === 't') usesTime = true;
      const s = stateIndex.get(symbol);
      if (s !== undefined) {
        directStates.push(s);
        stateBits[s >>> 5]! |= 1 << (s & 31);
      }
      const d = definitionIndex.get(symbol);
      // A definition not reached yet (used before it is defined) is the caller's error to report.
      const inner = d === undefined ? undefined : definitionReach[d];
      if (inner) {
        directDefinitions.push(d!);
        for (let w = 0; w < words; w++) stateBits[w]! |= inner.stateBits[w]!;
        usesTime ||= inner.usesTime;
      }
    }
    directStates.sort((a, b) => a - b);
    directDefinitions.sort((a, b) => a - b);
    return { directStates, directDefinitions, stateBits, stateCount: popCount(stateBits), usesTime };
  };
  for (const d of definitions) definitionReach.push(reachOf(d.node));
  return { states, definitions, definitionReach, reachOf };
}
