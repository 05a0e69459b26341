// Parses one expression of a user's file with mathjs; syntax errors become ExpressionRejected.
import { parse } from 'mathjs';
import { ExpressionRejected, type AstNode } from './emit.js';

/** Long inputs are legal but a 10 kB formula in a problem file is far more likely an accident. */
const MAX_EXPRESSION_LENGTH = 10_000;

export function parseExpression(text: string | number): AstNode {
  const source = typeof text === 'number' ? String(text) : text;
  if (source.length > MAX_EXPRESSION_LENGTH) {
    throw new ExpressionRejected(`expression is longer than ${MAX_EXPRESSION_LENGTH} characters`);
  }
  if (source.trim() === '') throw new ExpressionRejected('expression is empty');
  try {
    return parse(source) as unknown as AstNode;
  } catch (e) {
    throw new ExpressionRejected(`cannot parse \`${source}\`: ${e instanceof Error ? e.message : String(e)}`);
  }
}
