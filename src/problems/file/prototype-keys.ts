// Names that mean something to JavaScript objects themselves. As a key in a problem file they
// would be dropped or reach an object's prototype somewhere between the parser and the builders,
// so they are refused wherever a name or key can appear, with the field named.
import type { FieldPath } from './read-structured.js';

export const PROTOTYPE_NAMES: ReadonlySet<string> = new Set(['__proto__', 'constructor', 'prototype']);

/** Path of the first key anywhere in data that is a prototype name, found without recursion. */
export function prototypeKeyPath(data: unknown): FieldPath | undefined {
  const stack: [unknown, FieldPath][] = [[data, []]];
  while (stack.length > 0) {
    const [value, path] = stack.pop()!;
    if (value === null || typeof value !== 'object') continue;
    if (Array.isArray(value)) {
      for (let k = value.length - 1; k >= 0; k--) stack.push([value[k], [...path, k]]);
      continue;
    }
    const keys = Object.keys(value);
    const bad = keys.find((k) => PROTOTYPE_NAMES.has(k));
    if (bad !== undefined) return [...path, bad];
    for (let k = keys.length - 1; k >= 0; k--) stack.push([(value as Record<string, unknown>)[keys[k]!], [...path, keys[k]!]]);
  }
  return undefined;
}
