// Numbers given as numbers or as expressions of parameters (initial values, span, check times,
// input coefficients), computed once at load time with the same compiler as the equations.
import { ExpressionRejected, emitExpression, symbolsOf as symbolsIn, type EmitScope } from '../expression/emit.js';
import { parseExpression } from '../expression/parse.js';
import { fail, type Site } from '../file/fail.js';
import type { FieldPath } from '../file/read-structured.js';
import { compileConstant } from './codegen.js';
import { makeScope } from './names.js';

/** Parses and emits; whitelist violations become InputError naming the file and field. */
export function emitField(site: Site, path: FieldPath, value: string | number, scope: EmitScope): { js: string; node: ReturnType<typeof parseExpression> } {
  try {
    const node = parseExpression(value);
    return { js: emitExpression(node, scope), node };
  } catch (e) {
    if (e instanceof ExpressionRejected) fail(site, path, e.message);
    throw e;
  }
}

export function constantValue(site: Site, path: FieldPath, value: string | number, parameters: ReadonlyMap<string, number>): number {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) fail(site, path, `must be a finite number, got ${value}`);
    return value;
  }
  const { js } = emitField(site, path, value, makeScope({ parameters }));
  const v = compileConstant(js)();
  if (!Number.isFinite(v)) fail(site, path, `\`${value}\` evaluates to ${v}; a finite number is needed`);
  return v;
}

/** Parameters in file order; each may use earlier ones only. */
export function evaluateParameters(site: Site, specs: Record<string, string | number> | undefined, checkName: (path: FieldPath, name: string) => void): Map<string, number> {
  const values = new Map<string, number>();
  const names = Object.keys(specs ?? {});
  const position = new Map(names.map((name, k) => [name, k] as const));
  for (const name of names) {
    const path = ['parameters', name];
    checkName(path, name);
    const spec = specs![name]!;
    if (typeof spec === 'string') {
      try {
        const node = parseExpression(spec);
        const later = [...symbolsIn(node)].find((s) => (position.get(s) ?? -1) >= position.get(name)!);
        if (later) fail(site, path, later === name ? `parameter '${name}' uses itself` : `parameter '${name}' uses '${later}', which is defined after it; parameters may use only earlier ones`);
      } catch (e) {
        if (e instanceof ExpressionRejected) fail(site, path, e.message);
        throw e;
      }
    }
    values.set(name, constantValue(site, path, spec, values));
  }
  return values;
}
