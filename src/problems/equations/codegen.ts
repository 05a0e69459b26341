// Assembles function bodies from emitted expression code: state reads, the definitions an
// expression needs (in file order), then the writes. Buffers come from the caller; nothing here
// allocates at run time.
import { compileFunction, type Bindings } from '../expression/compile.js';

export interface DefinitionCode {
  readonly index: number;
  readonly name: string;
  readonly js: string;
  /** Symbols the definition mentions directly. */
  readonly uses: ReadonlySet<string>;
}

/**
 * Definitions reachable from the given symbols, in file order. Each definition uses only earlier
 * ones, so one backward pass finds them all without recursion.
 */
export function neededDefinitions(symbols: Iterable<string>, definitions: readonly DefinitionCode[]): DefinitionCode[] {
  const position = new Map(definitions.map((d, k) => [d.name, k] as const));
  const needed = new Array<boolean>(definitions.length).fill(false);
  const mark = (name: string): void => {
    const k = position.get(name);
    if (k !== undefined) needed[k] = true;
  };
  for (const s of symbols) mark(s);
  for (let k = definitions.length - 1; k >= 0; k--) if (needed[k]) for (const u of definitions[k]!.uses) mark(u);
  return definitions.filter((_, k) => needed[k]);
}

function prologue(n: number, defs: readonly DefinitionCode[]): string {
  const lines: string[] = [];
  for (let i = 0; i < n; i++) lines.push(`const s${i} = y[${i}];`);
  for (const d of defs) lines.push(`const d${d.index} = ${d.js};`);
  return lines.join('\n');
}

/** function (t, y, out) { out[k] = expr_k } */
export function compileVectorFunction(
  n: number,
  exprs: readonly string[],
  defs: readonly DefinitionCode[],
  bindings?: Bindings,
): (t: number, y: Float64Array, out: Float64Array) => void {
  const writes = exprs.map((js, k) => `out[${k}] = ${js};`).join('\n');
  return compileFunction(['t', 'y', 'out'], `${prologue(n, defs)}\n${writes}`, bindings);
}

/** function (t, y) { return expr } */
export function compileScalarFunction(n: number, expr: string, defs: readonly DefinitionCode[], bindings?: Bindings): (t: number, y: Float64Array) => number {
  return compileFunction(['t', 'y'], `${prologue(n, defs)}\nreturn ${expr};`, bindings);
}

/**
 * function (t, y, jac) writing a dense row-major n x n matrix from its nonzero entries, after the
 * definition values and the temporaries (chain-rule partials) the entries use.
 */
export function compileJacobian(
  n: number,
  entries: readonly { row: number; col: number; js: string }[],
  defs: readonly DefinitionCode[] = [],
  temporaries: readonly string[] = [],
  bindings?: Bindings,
): (t: number, y: Float64Array, jac: Float64Array) => void {
  const writes = entries.map((e) => `jac[${e.row * n + e.col}] = ${e.js};`).join('\n');
  const temps = temporaries.length ? `${temporaries.join('\n')}\n` : '';
  return compileFunction(['t', 'y', 'jac'], `${prologue(n, defs)}\n${temps}jac.fill(0);\n${writes}`, bindings);
}

/** function (t, out) { out[k] = expr_k(t) } for exact solutions. */
export function compileTimeFunction(exprs: readonly string[]): (t: number, out: Float64Array) => void {
  return compileFunction(['t', 'out'], exprs.map((js, k) => `out[${k}] = ${js};`).join('\n'));
}

/** A constant: function () { return expr }. */
export function compileConstant(expr: string): () => number {
  return compileFunction([], `return ${expr};`);
}
