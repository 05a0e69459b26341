// Parses one expression of a user's file with mathjs; syntax errors become ExpressionRejected.
import { parse } from 'mathjs';
import { ExpressionRejected, type AstNode } from './emit.js';

/** Long inputs are legal but a 10 kB formula in a problem file is far more likely an accident. */
const MAX_EXPRESSION_LENGTH = 10_000;

/**
 * Deepest expression tree accepted. Every later pass (code generation, symbol search, the
 * symbolic derivative) walks the tree recursively, so a deeper tree would exhaust the stack; a
 * sum of n terms is n levels deep, so this allows sums of a few hundred terms.
 */
export const MAX_EXPRESSION_DEPTH = 300;

/** The start of a long source text, for messages that quote it. */
function quoted(source: string): string {
  return source.length > 60 ? `${source.slice(0, 57)}...` : source;
}

export interface Walkable {
  forEach(callback: (child: Walkable) => void): void;
}

/** Nodes and depth of a tree, found without recursion so that it cannot itself exhaust the stack. */
export function treeSize(root: Walkable): { nodes: number; depth: number } {
  let deepest = 0;
  let nodes = 0;
  const stack: [Walkable, number][] = [[root, 1]];
  while (stack.length > 0) {
    const [node, depth] = stack.pop()!;
    nodes++;
    if (depth > deepest) deepest = depth;
    node.forEach((child) => stack.push([child, depth + 1]));
  }
  return { nodes, depth: deepest };
}

export function parseExpression(text: string | number): AstNode {
  const source = typeof text === 'number' ? String(text) : text;
  if (source.length > MAX_EXPRESSION_LENGTH) {
    throw new ExpressionRejected(`expression is longer than ${MAX_EXPRESSION_LENGTH} characters`);
  }
  if (source.trim() === '') throw new ExpressionRejected('expression is empty');
  let node: Walkable;
  try {
    node = parse(source) as unknown as Walkable;
  } catch (e) {
    if (e instanceof RangeError) {
      throw new ExpressionRejected(`\`${quoted(source)}\` is nested too deeply to parse; split it into definitions`);
    }
    throw new ExpressionRejected(`cannot parse \`${quoted(source)}\`: ${e instanceof Error ? e.message : String(e)}`);
  }
  const { depth } = treeSize(node);
  if (depth > MAX_EXPRESSION_DEPTH) {
    throw new ExpressionRejected(`\`${quoted(source)}\` is nested ${depth} levels deep (at most ${MAX_EXPRESSION_DEPTH}; a sum of n terms is n levels); split it into definitions`);
  }
  return node as unknown as AstNode;
}
