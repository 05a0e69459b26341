// Vector expressions in equation files. `vectors: { r: [x, y, z], v: [vx, vy, vz] }` names groups of
// states (or of other scalar names); definitions may then be vector-valued, and an equation may be
// given for a whole group (`r: v`). Expressions may use + and - between vectors of one length,
// scalar * vector, vector * scalar, vector / scalar, unary minus, and the functions norm(u),
// dot(u, w) and cross(u, w) (3-vectors). Before anything else reads the file, every vector is
// expanded into its components: a vector definition `acc` becomes scalar definitions acc_1, acc_2,
// ... and a group equation one equation per state. The scalar pipeline then compiles the same
// allocation-free code it compiles for a file written out by hand, and the symbolic Jacobian
// follows those definitions like any other.
import { ExpressionRejected, type AstNode } from '../expression/emit.js';
import { parseExpression } from '../expression/parse.js';
import { fail } from '../file/fail.js';
import type { FieldPath, StructuredFile } from '../file/read-structured.js';
import type { EquationFile } from '../file/schema.js';

type Expr = string | number;
type Value = { scalar: string } | { parts: string[] };

const VECTOR_FUNCTIONS = new Set(['norm', 'dot', 'cross']);

function args(n: AstNode): AstNode[] {
  return (n['args'] as AstNode[] | undefined) ?? [];
}

function isVector(v: Value): v is { parts: string[] } {
  return 'parts' in v;
}

/** Component names of a vector definition. */
export function componentName(name: string, k: number): string {
  return `${name}_${k + 1}`;
}

interface Context {
  /** Vector-valued names and their component texts. */
  vectors: Map<string, string[]>;
  /** Resolves a definition on first use (so file order does not matter); undefined when not one. */
  definition(name: string): Value | undefined;
}

function mentionsVectors(n: AstNode, ctx: Context): boolean {
  if (n.type === 'SymbolNode') {
    const name = n['name'] as string;
    if (ctx.vectors.has(name)) return true;
    const d = ctx.definition(name);
    return d !== undefined && isVector(d);
  }
  if (n.type === 'FunctionNode') {
    const fn = n['fn'] as AstNode;
    if (fn.type === 'SymbolNode' && VECTOR_FUNCTIONS.has(fn['name'] as string)) return true;
    return args(n).some((a) => mentionsVectors(a, ctx));
  }
  if (n.type === 'ParenthesisNode') return mentionsVectors(n['content'] as AstNode, ctx);
  if (n.type === 'OperatorNode') return args(n).some((a) => mentionsVectors(a, ctx));
  for (const key of ['condition', 'trueExpr', 'falseExpr']) {
    const c = n[key] as AstNode | undefined;
    if (c && mentionsVectors(c, ctx)) return true;
  }
  const params = n['params'] as AstNode[] | undefined;
  return Array.isArray(params) && params.some((p) => mentionsVectors(p, ctx));
}

function scalarOf(v: Value, what: string): string {
  if (isVector(v)) throw new ExpressionRejected(`${what} is a vector where a number is needed (use norm, dot or a component)`);
  return v.scalar;
}

function sameLength(a: { parts: string[] }, b: { parts: string[] }, op: string): void {
  if (a.parts.length !== b.parts.length) throw new ExpressionRejected(`'${op}' between vectors of length ${a.parts.length} and ${b.parts.length}`);
}

function expand(n: AstNode, ctx: Context): Value {
  if (!mentionsVectors(n, ctx)) return { scalar: `(${String((n as { toString(): string }).toString())})` };
  switch (n.type) {
    case 'SymbolNode': {
      const name = n['name'] as string;
      const parts = ctx.vectors.get(name);
      if (parts) return { parts };
      return ctx.definition(name)!;
    }
    case 'ParenthesisNode':
      return expand(n['content'] as AstNode, ctx);
    case 'OperatorNode': {
      const fn = n['fn'] as string;
      const op = String(n['op']);
      const a = args(n).map((x) => expand(x, ctx));
      if (fn === 'unaryMinus' && a.length === 1) {
        const x = a[0]!;
        return isVector(x) ? { parts: x.parts.map((p) => `(-${p})`) } : { scalar: `(-${x.scalar})` };
      }
      if (fn === 'unaryPlus' && a.length === 1) return a[0]!;
      if ((fn === 'add' || fn === 'subtract') && a.length === 2) {
        const [x, y] = a as [Value, Value];
        if (isVector(x) && isVector(y)) {
          sameLength(x, y, op);
          return { parts: x.parts.map((p, k) => `(${p} ${op} ${y.parts[k]})`) };
        }
        if (isVector(x) || isVector(y)) throw new ExpressionRejected(`'${op}' between a vector and a number`);
        return { scalar: `(${x.scalar} ${op} ${y.scalar})` };
      }
      if (fn === 'multiply' && a.length === 2) {
        const [x, y] = a as [Value, Value];
        if (isVector(x) && isVector(y)) throw new ExpressionRejected('vector * vector is ambiguous: use dot(u, w) or cross(u, w)');
        if (isVector(x)) return { parts: x.parts.map((p) => `(${p} * ${(y as { scalar: string }).scalar})`) };
        if (isVector(y)) return { parts: y.parts.map((p) => `(${x.scalar} * ${p})`) };
        return { scalar: `(${x.scalar} * ${y.scalar})` };
      }
      if (fn === 'divide' && a.length === 2) {
        const [x, y] = a as [Value, Value];
        const d = scalarOf(y, 'the divisor');
        return isVector(x) ? { parts: x.parts.map((p) => `(${p} / ${d})`) } : { scalar: `(${x.scalar} / ${d})` };
      }
      // Anything else (powers, comparisons, logic) takes numbers only.
      const s = a.map((x, k) => scalarOf(x, `operand ${k + 1} of '${op}'`));
      if (s.length === 1) return { scalar: `(${op}${s[0]})` };
      return { scalar: `(${s.join(` ${op} `)})` };
    }
    case 'FunctionNode': {
      const name = (n['fn'] as AstNode)['name'] as string;
      const a = args(n).map((x) => expand(x, ctx));
      if (name === 'norm') {
        if (a.length !== 1 || !isVector(a[0]!)) throw new ExpressionRejected('norm takes one vector');
        return { scalar: `sqrt(${a[0].parts.map((p) => `${p}^2`).join(' + ')})` };
      }
      if (name === 'dot') {
        const [x, y] = a;
        if (a.length !== 2 || !x || !y || !isVector(x) || !isVector(y)) throw new ExpressionRejected('dot takes two vectors');
        sameLength(x, y, 'dot');
        return { scalar: `(${x.parts.map((p, k) => `${p} * ${y.parts[k]}`).join(' + ')})` };
      }
      if (name === 'cross') {
        const [x, y] = a;
        if (a.length !== 2 || !x || !y || !isVector(x) || !isVector(y) || x.parts.length !== 3 || y.parts.length !== 3) {
          throw new ExpressionRejected('cross takes two vectors of length 3');
        }
        const [a1, a2, a3] = x.parts as [string, string, string];
        const [b1, b2, b3] = y.parts as [string, string, string];
        return { parts: [`(${a2} * ${b3} - ${a3} * ${b2})`, `(${a3} * ${b1} - ${a1} * ${b3})`, `(${a1} * ${b2} - ${a2} * ${b1})`] };
      }
      return { scalar: `${name}(${a.map((x, k) => scalarOf(x, `argument ${k + 1} of ${name}`)).join(', ')})` };
    }
    case 'ConditionalNode': {
      const c = scalarOf(expand(n['condition'] as AstNode, ctx), 'the condition');
      const a = expand(n['trueExpr'] as AstNode, ctx);
      const b = expand(n['falseExpr'] as AstNode, ctx);
      if (isVector(a) && isVector(b)) {
        sameLength(a, b, '?:');
        return { parts: a.parts.map((p, k) => `(${c} ? ${p} : ${b.parts[k]})`) };
      }
      return { scalar: `(${c} ? ${scalarOf(a, 'the first branch')} : ${scalarOf(b, 'the second branch')})` };
    }
    default:
      throw new ExpressionRejected(`vectors cannot be used inside \`${String((n as { toString(): string }).toString()).slice(0, 60)}\``);
  }
}

/** The file with every vector expanded into scalars (unchanged when it declares no vectors). */
export function expandVectors(site: StructuredFile, spec: EquationFile): EquationFile {
  const groups = spec.vectors;
  if (!groups || Object.keys(groups).length === 0) return spec;
  const vectors = new Map<string, string[]>();
  for (const [name, parts] of Object.entries(groups)) vectors.set(name, parts);

  const defSpecs = spec.definitions ?? {};
  const done = new Map<string, Value>();
  const busy = new Set<string>();
  const parsed = (path: FieldPath, text: Expr): AstNode => {
    try {
      return parseExpression(text);
    } catch (e) {
      if (e instanceof ExpressionRejected) fail(site, path, e.message);
      throw e;
    }
  };
  const ctx: Context = {
    vectors,
    definition(name) {
      if (!(name in defSpecs) || vectors.has(name)) return undefined;
      const have = done.get(name);
      if (have) return have;
      // A cycle is reported by the scalar pipeline; here it reads as a number.
      if (busy.has(name)) return { scalar: name };
      busy.add(name);
      const v = run(['definitions', name], defSpecs[name]!);
      busy.delete(name);
      // A scalar definition stays a name, so the pipeline keeps it as one definition.
      const value: Value = isVector(v) ? { parts: v.parts.map((_, k) => componentName(name, k)) } : { scalar: name };
      done.set(name, value);
      expanded.set(name, v);
      return value;
    },
  };
  const expanded = new Map<string, Value>();
  const run = (path: FieldPath, text: Expr): Value => {
    try {
      return expand(parsed(path, text), ctx);
    } catch (e) {
      if (e instanceof ExpressionRejected) fail(site, path, e.message);
      throw e;
    }
  };

  const definitions: Record<string, Expr> = {};
  for (const name of Object.keys(defSpecs)) {
    ctx.definition(name);
    const v = expanded.get(name)!;
    if (isVector(v)) v.parts.forEach((p, k) => (definitions[componentName(name, k)] = p));
    else definitions[name] = v.scalar;
  }

  const equations: Record<string, Expr> = {};
  for (const [key, text] of Object.entries(spec.equations)) {
    const group = vectors.get(key);
    const v = run(['equations', key], text);
    if (group) {
      if (!isVector(v) || v.parts.length !== group.length) fail(site, ['equations', key], `'${key}' is a vector of ${group.length}; its equation must be a vector of the same length`);
      group.forEach((state, k) => (equations[state] = v.parts[k]!));
    } else {
      if (isVector(v)) fail(site, ['equations', key], `'${key}' is one state; its equation is a vector`);
      equations[key] = v.scalar;
    }
  }

  const scalarField = (field: 'invariants' | 'outputs'): Record<string, Expr> | undefined => {
    const given = spec[field];
    if (!given) return undefined;
    return Object.fromEntries(
      Object.entries(given).map(([k, text]) => {
        const v = run([field, k], text);
        if (isVector(v)) fail(site, [field, k], 'must be a number, not a vector (use norm, dot or a component)');
        return [k, v.scalar];
      }),
    );
  };
  const invariants = scalarField('invariants');
  const outputs = scalarField('outputs');
  const events = spec.events
    ? Object.fromEntries(
        Object.entries(spec.events).map(([k, ev]) => {
          const v = run(['events', k, 'expression'], ev.expression);
          if (isVector(v)) fail(site, ['events', k, 'expression'], 'must be a number, not a vector (use norm, dot or a component)');
          return [k, { ...ev, expression: v.scalar }];
        }),
      )
    : undefined;
  const { vectors: _groups, ...rest } = spec;
  return {
    ...rest,
    ...(Object.keys(definitions).length ? { definitions } : {}),
    equations,
    ...(invariants ? { invariants } : {}),
    ...(outputs ? { outputs } : {}),
    ...(events ? { events } : {}),
  };
}
