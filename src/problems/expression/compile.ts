// Builds a JavaScript function from source produced by emit.ts (and only from that source).
// Strict mode, no closure over anything but globals and the given bindings; the body can reach
// only Math, the declared parameters and those bindings because emit.ts writes nothing else.

/**
 * Bindings are functions the body may call by name (table lookups); their names are chosen by
 * stepgauge (`tab0`, `tab0_slope`, ...), never taken from a file.
 */
export type Bindings = ReadonlyMap<string, (x: number) => number>;

export function compileFunction<F>(params: readonly string[], body: string, bindings?: Bindings): F {
  const names = bindings ? [...bindings.keys()] : [];
  // eslint-disable-next-line @typescript-eslint/no-implied-eval
  const factory = new Function(...names, `"use strict";\nreturn function (${params.join(', ')}) {\n${body}\n};`) as (...b: unknown[]) => F;
  return factory(...(bindings ? [...bindings.values()] : []));
}
