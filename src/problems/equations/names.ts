// Names users give to states, parameters, definitions, outputs and invariants, and the scope that
// maps each name to the JavaScript standing for it in generated code.
import { RESERVED_NAMES, type FunctionRule } from '../expression/functions.js';
import { numberLiteral, type EmitScope } from '../expression/emit.js';
import { fail, type Site } from '../file/fail.js';
import type { FieldPath } from '../file/read-structured.js';
import { PROTOTYPE_NAMES } from '../file/prototype-keys.js';

const IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * Most states a problem file may have. Implicit methods factor a dense n x n matrix and a linear
 * model's exact reference exponentiates one, so a larger file model would take minutes per run;
 * larger models belong in a problem module, whose cost is its author's choice.
 */
export const MAX_FILE_STATES = 2000;

export function checkName(site: Site, path: FieldPath, name: string, taken: Map<string, string>, kind: string): void {
  if (!IDENTIFIER.test(name)) fail(site, path, `${kind} name '${name}' must be a letter or _ followed by letters, digits or _`);
  if (PROTOTYPE_NAMES.has(name)) fail(site, path, `${kind} name '${name}' cannot be used (it is special to JavaScript objects)`);
  if (RESERVED_NAMES.has(name)) fail(site, path, `${kind} name '${name}' is reserved (t, pi, e and function names cannot be used)`);
  const other = taken.get(name);
  if (other) fail(site, path, `${kind} name '${name}' is already used as a ${other}`);
  taken.set(name, kind);
}

/** What an expression may refer to. Parameters are folded in as literals. */
export interface ScopeParts {
  readonly time?: boolean;
  readonly states?: readonly string[];
  readonly parameters?: ReadonlyMap<string, number>;
  /** Definition names visible here, mapped to their index (local variable d<index>). */
  readonly definitions?: ReadonlyMap<string, number>;
  readonly functions?: ReadonlyMap<string, FunctionRule>;
}

export function makeScope(parts: ScopeParts): EmitScope {
  const stateIndex = new Map((parts.states ?? []).map((s, i) => [s, i] as const));
  return {
    functions: parts.functions,
    resolve(name) {
      if (name === 't' && parts.time) return 't';
      if (name === 'pi') return numberLiteral(Math.PI);
      if (name === 'e') return numberLiteral(Math.E);
      const s = stateIndex.get(name);
      if (s !== undefined) return `s${s}`;
      const p = parts.parameters?.get(name);
      if (p !== undefined) return numberLiteral(p);
      const d = parts.definitions?.get(name);
      if (d !== undefined) return `d${d}`;
      return undefined;
    },
    knownNames: () => [
      ...(parts.time ? ['t'] : []),
      ...(parts.states ?? []),
      ...(parts.parameters?.keys() ?? []),
      ...(parts.definitions?.keys() ?? []),
      'pi',
      'e',
    ],
  };
}
