// Definitions may use only earlier definitions. When one does not, say whether the offending
// references form a cycle (and which definitions are on it) or are just out of order.

/** uses.get(name) = definition names the definition `name` mentions. Returns a message or undefined. */
export function definitionOrderProblem(order: readonly string[], uses: ReadonlyMap<string, ReadonlySet<string>>): { name: string; message: string } | undefined {
  const position = new Map(order.map((n, i) => [n, i] as const));
  const cycle = findCycle(order, uses);
  if (cycle) {
    return { name: cycle[0]!, message: `definitions form a cycle: ${[...cycle, cycle[0]].join(' -> ')} (each definition may use only earlier ones)` };
  }
  for (const name of order) {
    for (const used of uses.get(name) ?? []) {
      if (used === name) return { name, message: `definition '${name}' uses itself` };
      if (position.get(used)! > position.get(name)!) {
        return { name, message: `definition '${name}' uses '${used}', which is defined after it; move '${used}' above '${name}'` };
      }
    }
  }
  return undefined;
}

function findCycle(order: readonly string[], uses: ReadonlyMap<string, ReadonlySet<string>>): string[] | undefined {
  const state = new Map<string, 'open' | 'done'>();
  const stack: string[] = [];
  const visit = (n: string): string[] | undefined => {
    state.set(n, 'open');
    stack.push(n);
    for (const m of uses.get(n) ?? []) {
      const s = state.get(m);
      if (s === 'open') return stack.slice(stack.indexOf(m));
      if (s === undefined) {
        const found = visit(m);
        if (found) return found;
      }
    }
    stack.pop();
    state.set(n, 'done');
    return undefined;
  };
  for (const n of order) {
    if (state.has(n)) continue;
    const found = visit(n);
    if (found) return found;
  }
  return undefined;
}
