// Reads a YAML or JSON problem file into plain data plus a locator that maps a field path back to
// the line and column it came from, so every later message can point into the file.
import { extname } from 'node:path';
import { LineCounter, parseDocument, isMap, isNode, isScalar, visit, type Document } from 'yaml';
import { InputError } from '../../core/errors.js';
import { MAX_PROBLEM_FILE_BYTES, readRegularFile, UnreadableFile } from './read-limited.js';

export type FieldPath = readonly (string | number)[];

export interface StructuredFile {
  readonly file: string;
  readonly data: unknown;
  /** "file:line:col" of the value at path (or of its nearest located ancestor), else "file". */
  locate(path: FieldPath): string;
}

/** "equations.omega", "reference.at[0].t"; "(top level)" for the empty path. */
export function fieldPath(path: FieldPath): string {
  let out = '';
  for (const part of path) out += typeof part === 'number' ? `[${part}]` : out ? `.${part}` : part;
  return out || '(top level)';
}

function lineColumnOf(text: string, offset: number): { line: number; col: number } {
  let line = 1;
  let start = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      start = i + 1;
    }
  }
  return { line, col: offset - start + 1 };
}

function jsonErrorPosition(text: string, message: string): { line: number; col: number } | undefined {
  const lc = /line (\d+) column (\d+)/.exec(message);
  if (lc) return { line: Number(lc[1]), col: Number(lc[2]) };
  const pos = /position (\d+)/.exec(message);
  if (pos) return lineColumnOf(text, Number(pos[1]));
  // "Unexpected end of JSON input" carries no position: the problem is at the end.
  if (/end of JSON/i.test(message)) return lineColumnOf(text, text.length);
  return undefined;
}

function makeLocator(file: string, doc: Document, counter: LineCounter): (path: FieldPath) => string {
  return (path) => {
    for (let k = path.length; k >= 0; k--) {
      const node = k === 0 ? doc.contents : doc.getIn(path.slice(0, k), true);
      if (isNode(node) && node.range) {
        const { line, col } = counter.linePos(node.range[0]);
        return `${file}:${line}:${col}`;
      }
    }
    return file;
  };
}

export function parseStructuredText(file: string, raw: string): StructuredFile {
  // A byte-order mark is valid at the start of a UTF-8 file (editors on Windows write one);
  // JSON.parse refuses it, so drop it before either parser sees the text.
  const text = raw.charCodeAt(0) === 0xfeff ? raw.slice(1) : raw;
  const ext = extname(file).toLowerCase();
  if (ext !== '.yaml' && ext !== '.yml' && ext !== '.json') {
    throw new InputError(`problem files must end in .yaml, .yml or .json (got '${ext || 'no extension'}')`, file);
  }
  const counter = new LineCounter();
  // The yaml library's own duplicate-key check compares every key with every other (minutes for
  // a large file); duplicateKey below does the same check in linear time.
  const doc = parseDocument(text, { lineCounter: counter, prettyErrors: true, uniqueKeys: false });
  let data: unknown;
  if (ext === '.json') {
    try {
      data = JSON.parse(text);
    } catch (e) {
      const message = e instanceof Error ? e.message : String(e);
      const at = jsonErrorPosition(text, message);
      throw new InputError(`JSON syntax error: ${message}`, at ? `${file}:${at.line}:${at.col}` : file);
    }
    // JSON.parse keeps the last of two equal keys silently; a repeated equation is a mistake.
    const duplicate = doc.errors.length === 0 ? duplicateKey(doc) : undefined;
    if (duplicate !== undefined) {
      const { line, col } = counter.linePos(duplicate);
      throw new InputError('a key appears twice in the same object', `${file}:${line}:${col}`);
    }
  } else {
    const first = doc.errors[0];
    const duplicate = first ? undefined : duplicateKey(doc);
    if (duplicate !== undefined) {
      const { line, col } = counter.linePos(duplicate);
      throw new InputError('YAML syntax error: Map keys must be unique', `${file}:${line}:${col}`);
    }
    if (first) {
      const pos = first.linePos?.[0];
      // The location is already in front; drop the library's own " at line L, column C:".
      const reason = (first.message.split('\n')[0] ?? first.message).replace(/ at line \d+, column \d+:?$/, '');
      throw new InputError(`YAML syntax error: ${reason}`, pos ? `${file}:${pos.line}:${pos.col}` : file);
    }
    try {
      data = doc.toJS({ maxAliasCount: 100 });
    } catch (e) {
      // The yaml library refuses alias expansions that would multiply the document ("billion
      // laughs"); that is a property of the file, not a fault of this program.
      throw new InputError(`YAML cannot be expanded: ${e instanceof Error ? e.message : String(e)}`, file);
    }
  }
  // For JSON the YAML parse serves only to find positions; it may fail on exotic JSON, then
  // messages fall back to naming the file and the field.
  const locate = doc.errors.length === 0 ? makeLocator(file, doc, counter) : () => file;
  return { file, data, locate };
}

/** Offset of the first key repeated within one mapping, or undefined. One pass, a set per map. */
function duplicateKey(doc: Document): number | undefined {
  let found: number | undefined;
  visit(doc, {
    Map(_, map) {
      if (!isMap(map)) return undefined;
      const seen = new Set<string>();
      for (const pair of map.items) {
        const key = pair.key;
        // Keys are compared as the object property names they become (1 and '1' are one key).
        const value = isScalar(key) ? String(key.value) : String(key);
        if (seen.has(value)) {
          found = isNode(key) && key.range ? key.range[0] : (map.range?.[0] ?? 0);
          return visit.BREAK;
        }
        seen.add(value);
      }
      return undefined;
    },
  });
  return found;
}

export async function readStructuredFile(file: string): Promise<StructuredFile> {
  let text: string;
  try {
    text = await readRegularFile(file, MAX_PROBLEM_FILE_BYTES);
  } catch (e) {
    if (e instanceof UnreadableFile) throw new InputError(`cannot read problem file: ${e.reason}`, file);
    throw e;
  }
  return parseStructuredText(file, text);
}
