// Builds a JavaScript function from source produced by emit.ts (and only from that source).
// Strict mode, no closure over anything but globals; the body can reach only Math and the
// declared parameters because emit.ts writes nothing else.

export function compileFunction<F>(params: readonly string[], body: string): F {
  // eslint-disable-next-line @typescript-eslint/no-implied-eval
  const factory = new Function(`"use strict";\nreturn function (${params.join(', ')}) {\n${body}\n};`) as () => F;
  return factory();
}
