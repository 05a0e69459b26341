// Parsing JSON files users hand us.
import { InputError } from './errors.js';

/**
 * JSON.parse with a message fit for one line: a byte-order mark is accepted, and the parser's
 * message (which can quote the text, newlines and all) is cut to its first line.
 */
export function parseJsonText(text: string, where: string, expected: string): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    return JSON.parse(body);
  } catch (e) {
    const first = ((e as Error).message.split('\n')[0] ?? '').slice(0, 160);
    throw new InputError(`not valid JSON (${first}); expected ${expected}`, where);
  }
}
