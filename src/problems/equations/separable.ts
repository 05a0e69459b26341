// Finds a split of the states into positions and velocities with q' = g(p), p' = h(t, q), from
// which states each derivative mentions (structurally: `0 * v` still counts as depending on v),
// or explains why none exists. A split is a 2-colouring of the dependency graph in which no
// equation depends on its own state and time-dependent equations are velocities.
import type { SeparableSplit } from '../../core/types.js';

export interface Dependencies {
  readonly names: readonly string[];
  /** deps[i] = indices of the states the derivative of state i mentions. */
  readonly deps: readonly ReadonlySet<number>[];
  /** usesTime[i]: the derivative of state i mentions t. */
  readonly usesTime: readonly boolean[];
}

export type SplitResult = { readonly split: SeparableSplit } | { readonly reason: string };

export function findSeparableSplit(d: Dependencies): SplitResult {
  const n = d.names.length;
  for (let i = 0; i < n; i++) {
    if (d.deps[i]!.has(i)) {
      return { reason: `the derivative of ${d.names[i]} depends on ${d.names[i]} itself (damping or self-coupling), so it can be neither a position nor a velocity` };
    }
  }
  const neighbours: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
  for (let i = 0; i < n; i++) {
    for (const j of d.deps[i]!) {
      neighbours[i]!.add(j);
      neighbours[j]!.add(i);
    }
  }
  // colour 0 = position, 1 = velocity
  const colour = new Array<number>(n).fill(-1);
  const parent = new Array<number>(n).fill(-1);
  for (let start = 0; start < n; start++) {
    if (colour[start] !== -1) continue;
    const component: number[] = [];
    colour[start] = 0;
    const queue = [start];
    while (queue.length) {
      const i = queue.shift()!;
      component.push(i);
      for (const j of neighbours[i]!) {
        if (colour[j] === -1) {
          colour[j] = 1 - colour[i]!;
          parent[j] = i;
          queue.push(j);
        } else if (colour[j] === colour[i]) {
          return { reason: `the states ${oddCycle(i, j, parent, d.names)} are coupled in an odd cycle, so they cannot alternate between positions and velocities` };
        }
      }
    }
    const timed = component.filter((i) => d.usesTime[i]);
    if (timed.length) {
      const want = colour[timed[0]!]!;
      const clash = timed.find((i) => colour[i] !== want);
      if (clash !== undefined) {
        return { reason: `the derivatives of ${d.names[timed[0]!]} and ${d.names[clash]} both depend on t, but the coupling forces one of them to be a position, whose derivative may depend only on velocities` };
      }
      // Time-dependent equations must be velocities; flip the component if needed.
      if (want === 0) for (const i of component) colour[i] = 1 - colour[i]!;
    } else if (component.length === 1) {
      // An uncoupled state with a constant derivative fits either side; call it a position.
      colour[start] = 0;
    }
  }
  const positions = colour.flatMap((c, i) => (c === 0 ? [i] : []));
  const velocities = colour.flatMap((c, i) => (c === 1 ? [i] : []));
  if (!positions.length || !velocities.length) {
    return { reason: `no state pairs up: every derivative ${velocities.length ? 'depends on t or on positions only' : 'is free of the other states'}, so there are no ${positions.length ? 'velocities' : 'positions'}` };
  }
  return { split: { positions, velocities } };
}

function oddCycle(i: number, j: number, parent: readonly number[], names: readonly string[]): string {
  const pathUp = (k: number): number[] => {
    const out = [k];
    while (parent[out[out.length - 1]!]! >= 0) out.push(parent[out[out.length - 1]!]!);
    return out;
  };
  const a = pathUp(i);
  const b = pathUp(j);
  const common = a.find((k) => b.includes(k))!;
  const loop = [...a.slice(0, a.indexOf(common) + 1), ...b.slice(0, b.indexOf(common)).reverse()];
  return loop.map((k) => names[k]).join(', ');
}

/** Checks a split named in a file; returns what breaks it, or undefined when it holds. */
export function checkSeparableSplit(d: Dependencies, split: SeparableSplit): string | undefined {
  const isPosition = new Set(split.positions);
  const isVelocity = new Set(split.velocities);
  for (const i of split.positions) {
    if (d.usesTime[i]) return `the derivative of position ${d.names[i]} depends on t; positions' derivatives may depend only on velocities`;
    for (const j of d.deps[i]!) {
      if (!isVelocity.has(j)) return `the derivative of position ${d.names[i]} depends on ${d.names[j]}, which is not a velocity; positions' derivatives may depend only on velocities`;
    }
  }
  for (const i of split.velocities) {
    for (const j of d.deps[i]!) {
      if (!isPosition.has(j)) return `the derivative of velocity ${d.names[i]} depends on ${d.names[j]}, which is not a position; velocities' derivatives may depend only on positions and t`;
    }
  }
  return undefined;
}

/**
 * The split in second-order form when every position's equation is just one velocity's name
 * (q' = v, each velocity once): velocities re-ordered to pair with positions, secondOrder set.
 * Otherwise the split as it was. `bareState[i]` is the state equation i names alone, or null.
 */
export function secondOrderForm(split: SeparableSplit, bareState: readonly (number | null)[]): SeparableSplit {
  const paired = split.positions.map((p) => bareState[p] ?? null);
  const velocities = new Set(split.velocities);
  const complete = paired.length === split.velocities.length && paired.every((v) => v !== null && velocities.has(v)) && new Set(paired).size === paired.length;
  return complete ? { positions: split.positions, velocities: paired as number[], secondOrder: true } : split;
}
