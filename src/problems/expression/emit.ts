// Turns a mathjs expression tree into JavaScript source, accepting only whitelisted node kinds.
// This walk is the security boundary for users' files: the emitted text is assembled solely from
// numeric literals, local variable names chosen by the caller, fixed operators and the function
// table, so no text from the file (names, strings) ever reaches `new Function`.
import { USER_FUNCTIONS, type FunctionRule } from './functions.js';

/** The parts of a mathjs node this walk reads; typed loosely so any node kind can be inspected. */
export interface AstNode {
  readonly type: string;
  readonly [key: string]: unknown;
}

export interface EmitScope {
  /** JavaScript for a symbol (a local name or a literal), or undefined when the name is unknown. */
  resolve(name: string): string | undefined;
  /** Names shown when a symbol is unknown. */
  readonly knownNames: () => readonly string[];
  readonly functions?: ReadonlyMap<string, FunctionRule>;
}

/** Raised for a construct outside the whitelist; callers add file and field. */
export class ExpressionRejected extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ExpressionRejected';
  }
}

const BINARY: Record<string, string> = { add: '+', subtract: '-', multiply: '*', divide: '/' };
const COMPARE: Record<string, string> = {
  smaller: '<', larger: '>', smallerEq: '<=', largerEq: '>=', equal: '===', unequal: '!==',
};
/** RelationalNode (chained comparisons, `a < b < c`) names its comparisons by function name. */
const RELATIONAL_OPS: Record<string, string> = COMPARE;

const CONSTRUCT_NAMES: Record<string, string> = {
  AccessorNode: 'property access or indexing',
  IndexNode: 'indexing',
  AssignmentNode: 'assignment',
  FunctionAssignmentNode: 'function definition',
  ArrayNode: 'array or matrix',
  ObjectNode: 'object',
  RangeNode: 'range',
  BlockNode: 'several statements',
};

/** JavaScript literal that reads back as exactly v (String gives the shortest round trip). */
export function numberLiteral(v: number): string {
  if (Number.isNaN(v)) return '(0 / 0)';
  if (v === Infinity) return '(1 / 0)';
  if (v === -Infinity) return '(-1 / 0)';
  if (Object.is(v, -0)) return '(-0)';
  return `(${String(v)})`;
}

function shown(node: AstNode): string {
  let text: string;
  try {
    text = String((node as { toString(): string }).toString());
  } catch {
    text = node.type;
  }
  return text.length > 60 ? `${text.slice(0, 57)}...` : text;
}

function args(node: AstNode): AstNode[] {
  return (node['args'] as AstNode[] | undefined) ?? [];
}

export function emitExpression(node: AstNode, scope: EmitScope): string {
  const functions = scope.functions ?? USER_FUNCTIONS;
  const walk = (n: AstNode): string => {
    switch (n.type) {
      case 'ConstantNode': {
        const value = n['value'];
        if (typeof value !== 'number') {
          throw new ExpressionRejected(`${typeof value === 'string' ? 'text' : String(typeof value)} constant \`${shown(n)}\` is not allowed (only numbers)`);
        }
        return numberLiteral(value);
      }
      case 'SymbolNode': {
        const name = n['name'] as string;
        const js = scope.resolve(name);
        if (js === undefined) {
          const known = scope.knownNames();
          throw new ExpressionRejected(`unknown symbol '${name}'${known.length ? ` (known here: ${known.join(', ')})` : ''}`);
        }
        return js;
      }
      case 'ParenthesisNode':
        return `(${walk(n['content'] as AstNode)})`;
      case 'ConditionalNode':
        return `(${walk(n['condition'] as AstNode)} ? ${walk(n['trueExpr'] as AstNode)} : ${walk(n['falseExpr'] as AstNode)})`;
      case 'RelationalNode': {
        const ops = n['conditionals'] as string[];
        const params = (n['params'] as AstNode[]).map(walk);
        const parts = ops.map((op, k) => {
          const js = RELATIONAL_OPS[op];
          if (!js) throw new ExpressionRejected(`comparison '${op}' is not allowed in \`${shown(n)}\``);
          return `(${params[k]} ${js} ${params[k + 1]})`;
        });
        return `(${parts.join(' && ')} ? 1 : 0)`;
      }
      case 'OperatorNode':
        return operator(n, walk);
      case 'FunctionNode': {
        const fn = n['fn'] as AstNode;
        if (fn.type !== 'SymbolNode') {
          throw new ExpressionRejected(`calling \`${shown(fn)}\` is not allowed (only named functions: ${[...USER_FUNCTIONS.keys()].join(' ')})`);
        }
        const name = fn['name'] as string;
        const rule = functions.get(name);
        if (!rule) {
          throw new ExpressionRejected(`function '${name}' is not allowed (allowed: ${[...USER_FUNCTIONS.keys()].join(' ')})`);
        }
        const a = args(n);
        if (a.length < rule.minArgs || a.length > rule.maxArgs) {
          const want = rule.minArgs === rule.maxArgs ? `${rule.minArgs}` : rule.maxArgs === Infinity ? `at least ${rule.minArgs}` : `${rule.minArgs} to ${rule.maxArgs}`;
          throw new ExpressionRejected(`function '${name}' takes ${want} argument(s), got ${a.length} in \`${shown(n)}\``);
        }
        return rule.emit(a.map(walk));
      }
      default: {
        const what = CONSTRUCT_NAMES[n.type] ?? `expression kind ${n.type}`;
        throw new ExpressionRejected(`${what} \`${shown(n)}\` is not allowed`);
      }
    }
  };
  return walk(node);
}

function operator(n: AstNode, walk: (n: AstNode) => string): string {
  const fn = n['fn'] as string;
  const a = args(n).map(walk);
  const binary = BINARY[fn];
  if (binary && a.length >= 2) return `(${a.join(` ${binary} `)})`;
  if (fn === 'pow' && a.length === 2) return `Math.pow(${a[0]}, ${a[1]})`;
  if (fn === 'unaryMinus' && a.length === 1) return `(-${a[0]})`;
  if (fn === 'unaryPlus' && a.length === 1) return `(+${a[0]})`;
  const cmp = COMPARE[fn];
  // Comparisons yield 1 or 0 so they can be used in arithmetic, as mathjs allows.
  if (cmp && a.length === 2) return `(${a[0]} ${cmp} ${a[1]} ? 1 : 0)`;
  if (fn === 'and' && a.length === 2) return `(${a[0]} && ${a[1]} ? 1 : 0)`;
  if (fn === 'or' && a.length === 2) return `(${a[0]} || ${a[1]} ? 1 : 0)`;
  if (fn === 'not' && a.length === 1) return `(${a[0]} ? 0 : 1)`;
  throw new ExpressionRejected(`operator '${String(n['op'])}' (${fn}) is not allowed in \`${shown(n)}\``);
}

/** Every symbol name the tree mentions, excluding names in function position. */
export function symbolsOf(node: AstNode): Set<string> {
  const out = new Set<string>();
  const visit = (n: AstNode): void => {
    if (n.type === 'SymbolNode') {
      out.add(n['name'] as string);
      return;
    }
    if (n.type === 'FunctionNode') {
      for (const a of args(n)) visit(a);
      const fn = n['fn'] as AstNode;
      if (fn.type !== 'SymbolNode') visit(fn);
      return;
    }
    for (const key of ['content', 'condition', 'trueExpr', 'falseExpr', 'object', 'index', 'value', 'expr']) {
      const child = n[key];
      if (child && typeof child === 'object' && 'type' in (child as object)) visit(child as AstNode);
    }
    for (const key of ['args', 'params', 'items', 'dimensions', 'blocks']) {
      const list = n[key];
      if (Array.isArray(list)) for (const c of list) if (c && typeof c === 'object' && 'type' in c) visit(c as AstNode);
    }
  };
  visit(node);
  return out;
}
