// Marks objects made by defineProblem / defineMethod. Symbol.for, not a module-local symbol, so the
// mark survives when a user's module gets its own copy of this package (bundled or not).
export const PROBLEM_BRAND: unique symbol = Symbol.for('stepgauge.defineProblem') as never;
export const METHOD_BRAND: unique symbol = Symbol.for('stepgauge.defineMethod') as never;

export function brand<T extends object>(value: T, mark: symbol): T {
  Object.defineProperty(value, mark, { value: true, enumerable: false });
  return Object.freeze(value);
}

export function hasBrand(value: unknown, mark: symbol): boolean {
  return typeof value === 'object' && value !== null && (value as Record<symbol, unknown>)[mark] === true;
}
