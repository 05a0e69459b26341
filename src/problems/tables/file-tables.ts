// Tables in equation files: `tables: { rho: { x: [...], y: [...], interpolation: log-linear } }`
// (or `csv: file.csv`, two columns x, y, beside the problem file), callable in any expression as
// rho(h). Before compilation every call is made its own definition (rho_at_1 = rho(h), ...) so
// that the symbolic Jacobian can take the interpolant's exact slope there (jacobian.ts) and the
// chain rule through the definitions does the rest. Tables reach generated code as bound
// functions named by stepgauge (tab0, tab0_slope), never by the file.
import { parse } from 'mathjs';
import type { Bindings } from '../expression/compile.js';
import { ExpressionRejected, type AstNode } from '../expression/emit.js';
import type { FunctionRule } from '../expression/functions.js';
import { parseExpression } from '../expression/parse.js';
import { fail } from '../file/fail.js';
import type { FieldPath, StructuredFile } from '../file/read-structured.js';
import type { EquationFile } from '../file/schema.js';
import { readCsvRows } from '../linear/matrix.js';
import { makeTable, tableProblem, type Interpolation, type Table } from './interpolant.js';

type Expr = string | number;

export interface FileTables {
  readonly tables: ReadonlyMap<string, Table>;
  /** Rules for calling each table in expressions (its value). */
  readonly valueRules: ReadonlyMap<string, FunctionRule>;
  /** Rules for each table's slope, for the Jacobian. */
  readonly slopeRules: ReadonlyMap<string, FunctionRule>;
  readonly bindings: Bindings;
  /** Breakpoints of tables marked nonSmoothTimes (tables of t), for check times. */
  readonly nonSmoothTimes: readonly number[];
  /** Values as read (CSV included), for the problem's definition hash. */
  readonly canonical: Record<string, { x: number[]; y: number[]; interpolation: Interpolation }>;
}

const unary = (js: string): FunctionRule => ({ minArgs: 1, maxArgs: 1, emit: (a) => `${js}(${a[0]})` });

export async function readTables(site: StructuredFile, spec: EquationFile, problemFile: string): Promise<FileTables | undefined> {
  const given = spec.tables;
  if (!given || Object.keys(given).length === 0) return undefined;
  const tables = new Map<string, Table>();
  const valueRules = new Map<string, FunctionRule>();
  const slopeRules = new Map<string, FunctionRule>();
  const bindings = new Map<string, (x: number) => number>();
  const nonSmooth: number[] = [];
  const canonical: FileTables['canonical'] = {};
  let k = 0;
  for (const [name, t] of Object.entries(given)) {
    const path: FieldPath = ['tables', name];
    const kind = t.interpolation ?? 'linear';
    let x: number[];
    let y: number[];
    if (t.csv !== undefined) {
      if (t.x || t.y) fail(site, path, 'give either csv or x and y, not both');
      const rows = await readCsvRows(site, [...path, 'csv'], t.csv, problemFile);
      if (rows[0]?.length !== 2) fail(site, [...path, 'csv'], `${t.csv} must have two columns, x and y`);
      x = rows.map((r) => r[0]!);
      y = rows.map((r) => r[1]!);
    } else {
      if (!t.x || !t.y) fail(site, path, 'needs x and y lists, or csv');
      x = t.x;
      y = t.y;
    }
    const why = tableProblem(x, y, kind);
    if (why) fail(site, path, why);
    const table = makeTable(x, y, kind);
    tables.set(name, table);
    const value = `tab${k}`;
    const slope = `tab${k}_slope`;
    bindings.set(value, table.value);
    bindings.set(slope, table.slope);
    valueRules.set(name, unary(value));
    slopeRules.set(name, unary(slope));
    if (t.nonSmoothTimes) nonSmooth.push(...x);
    canonical[name] = { x, y, interpolation: kind };
    k++;
  }
  return { tables, valueRules, slopeRules, bindings, nonSmoothTimes: nonSmooth, canonical };
}

/** Name of the definition holding the k-th call of a table. */
function callName(table: string, k: number): string {
  return `${table}_at_${k}`;
}

/**
 * The file with every table call in definitions, equations, invariants and outputs moved into a
 * definition of its own, placed before the first definition that uses it.
 */
export function isolateTableCalls(site: StructuredFile, spec: EquationFile, tables: ReadonlySet<string>): EquationFile {
  if (tables.size === 0) return spec;
  const counts = new Map<string, number>();
  const definitions: Record<string, Expr> = {};
  const rewrite = (path: FieldPath, text: Expr): string => {
    let node: AstNode;
    try {
      node = parseExpression(text);
    } catch (e) {
      if (e instanceof ExpressionRejected) fail(site, path, e.message);
      throw e;
    }
    return String(replaceCalls(node as unknown as MathNodeLike).toString());
  };
  const replaceCalls = (node: MathNodeLike): MathNodeLike =>
    node.transform((n: MathNodeLike) => {
      if (n.type !== 'FunctionNode' || n.fn?.type !== 'SymbolNode' || !tables.has(n.fn.name!)) return n;
      const table = n.fn.name!;
      const args = (n.args ?? []).map((a) => replaceCalls(a).toString());
      const k = (counts.get(table) ?? 0) + 1;
      counts.set(table, k);
      const name = callName(table, k);
      definitions[name] = `${table}(${args.join(', ')})`;
      return parse(name) as unknown as MathNodeLike;
    });
  for (const [name, text] of Object.entries(spec.definitions ?? {})) {
    const out = rewrite(['definitions', name], text);
    definitions[name] = out;
  }
  const field = (f: 'equations' | 'invariants' | 'outputs'): Record<string, Expr> | undefined => {
    const given = spec[f];
    if (!given) return undefined;
    return Object.fromEntries(Object.entries(given).map(([k, text]) => [k, rewrite([f, k], text)]));
  };
  const equations = field('equations')!;
  const invariants = field('invariants');
  const outputs = field('outputs');
  const events = spec.events
    ? Object.fromEntries(Object.entries(spec.events).map(([k, ev]) => [k, { ...ev, expression: rewrite(['events', k, 'expression'], ev.expression) }]))
    : undefined;
  return {
    ...spec,
    ...(Object.keys(definitions).length ? { definitions } : {}),
    equations,
    ...(invariants ? { invariants } : {}),
    ...(outputs ? { outputs } : {}),
    ...(events ? { events } : {}),
  };
}

/** The parts of a mathjs node this pass uses. */
interface MathNodeLike {
  readonly type: string;
  readonly fn?: { type: string; name?: string };
  readonly name?: string;
  readonly args?: MathNodeLike[];
  transform(callback: (n: MathNodeLike) => MathNodeLike): MathNodeLike;
  toString(): string;
}
