// A catalogue problem's identity is its source: its definition text (what results hash as the
// problem's sha256) is derived from the TypeScript file that defines it and every file of the
// catalogue that file imports (problems/physics/..., a reference table), so editing a
// right-hand side, a constant or a reference value changes the hash. Its description is that
// file's header comment, where the equations are written in words once.
// The .ts sources ship beside dist/ and are read at load time from this module's own location
// (never the working directory): under vitest this file runs as problems/from-source.ts, built
// as dist/problems/from-source.js; both read <package>/problems/*.ts, so they agree.
// Modules of stepgauge itself that a problem uses (src/...: the table interpolant, the matrix
// exponential) are named in the text but not hashed: the stepgauge version and commit in every
// results file identify them, as they do for users' problem files and modules.
import { readFileSync } from 'node:fs';
import { dirname, join, posix, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Problem } from '../src/core/types.js';
import { sha256, sourcesSha256, type SourceText } from '../src/core/hash.js';

/** What a catalogue file writes: a problem without the two fields derived from its source. */
export type CatalogueEntry = Omit<Problem, 'definition' | 'description'>;

/** The package's root folder and a problem file in it, named relative to the root ('problems/x.ts'). */
export interface SourceLocation {
  readonly root: string;
  readonly file: string;
}

/** What a problem's definition is made of. */
export interface ProblemSources {
  /** The problem's own file first, then the catalogue files it imports (directly or not), by path. */
  readonly files: readonly SourceText[];
  /** stepgauge modules it imports for their values (named, not hashed). */
  readonly stepgaugeModules: readonly string[];
}

const HERE = fileURLToPath(import.meta.url);
/** problems/from-source.ts under vitest, dist/problems/from-source.js when built. */
const BUILT = HERE.endsWith('.js');
const PACKAGE_ROOT = join(dirname(HERE), BUILT ? '../..' : '..');
const CODE_ROOT = BUILT ? join(PACKAGE_ROOT, 'dist') : PACKAGE_ROOT;
const CATALOGUE_FOLDER = 'problems/';
/** This module: how definitions are made, not what a problem is, so in no problem's hash. */
const THIS_FILE = 'problems/from-source.ts';

/** The .ts source of a catalogue module, from its own import.meta.url (built or not). */
export function sourceLocation(moduleUrl: string): SourceLocation {
  const rel = relative(CODE_ROOT, fileURLToPath(moduleUrl)).split(sep).join('/');
  return { root: PACKAGE_ROOT, file: rel.replace(/\.js$/, '.ts') };
}

/**
 * Relative specifiers a file imports for their values: `import ... from`, `export ... from` and
 * bare `import '...'`; `import type` and `export type` carry no values and are left out.
 */
export function valueImports(text: string): string[] {
  const out: string[] = [];
  const statement = /^[ \t]*(?:import|export)\s+(type\s+)?(?:[^'";]*?\sfrom\s*)?['"](\.{1,2}\/[^'"]+)['"]/gm;
  for (const m of text.matchAll(statement)) if (!m[1]) out.push(m[2]!);
  return out;
}

const textCache = new Map<string, string>();

/** A source's text with line endings normalised, so a checkout with CRLF hashes the same. */
function readSource(root: string, file: string): string {
  const key = join(root, file);
  let text = textCache.get(key);
  if (text === undefined) {
    try {
      text = readFileSync(key, 'utf8').replace(/\r\n/g, '\n');
    } catch (e) {
      throw new Error(`stepgauge's catalogue source ${file} cannot be read beside its build (${(e as NodeJS.ErrnoException).code ?? String(e)}); the problems' hashes are taken from these files, so reinstall stepgauge`);
    }
    textCache.set(key, text);
  }
  return text;
}

/** The problem file and, transitively, every catalogue file it imports; stepgauge modules by name. */
export function problemSources(at: SourceLocation, read: (root: string, file: string) => string = readSource): ProblemSources {
  const files = new Map<string, string>();
  const modules = new Set<string>();
  const visit = (file: string): void => {
    if (files.has(file)) return;
    const text = read(at.root, file);
    files.set(file, text);
    for (const spec of valueImports(text)) {
      const target = posix.normalize(posix.join(posix.dirname(file), spec)).replace(/\.js$/, '.ts');
      if (target === THIS_FILE) continue;
      if (target.startsWith(CATALOGUE_FOLDER)) visit(target);
      else modules.add(target);
    }
  };
  visit(at.file);
  const [own, ...imported] = [...files].map(([path, text]) => ({ path, text }));
  imported.sort((a, b) => (a.path < b.path ? -1 : 1));
  return { files: [own!, ...imported], stepgaugeModules: [...modules].sort() };
}

/** The leading `//` comment block of a file, markers removed: what the file says it is. */
export function headerComment(text: string): string {
  const lines: string[] = [];
  for (const line of text.split('\n')) {
    const m = /^\/\/ ?(.*)$/.exec(line);
    if (!m) break;
    lines.push(m[1]!);
  }
  return lines.join('\n');
}

/**
 * The canonical definition text of a catalogue problem: its id, the arguments of the function
 * that built it (for problems made by a function), the SHA-256 of its sources together and of
 * each, the stepgauge modules it uses, and its file's header comment.
 */
export function sourceDefinition(id: string, sources: ProblemSources, args?: Readonly<Record<string, unknown>>): string {
  const lines = [`catalogue problem: ${id}`];
  if (args) lines.push(`built with: ${JSON.stringify(args)}`);
  lines.push(`sources-sha256: ${sourcesSha256(sources.files)}`);
  for (const f of sources.files) lines.push(`  ${sha256(f.text)}  ${f.path}`);
  if (sources.stepgaugeModules.length > 0) {
    lines.push(`stepgauge modules used (identified by the stepgauge version, not hashed here): ${sources.stepgaugeModules.join(', ')}`);
  }
  lines.push('', headerComment(sources.files[0]!.text));
  return lines.join('\n');
}

/**
 * A catalogue problem from its entry and the file that defines it (pass `import.meta.url`):
 * `definition` and `description` are derived from the source. `args`: the arguments of a
 * function that builds variants of the problem from one file.
 */
export function catalogueProblem<T extends CatalogueEntry>(moduleUrl: string, entry: T, args?: Readonly<Record<string, unknown>>): NoInfer<T> & Pick<Problem, 'definition' | 'description'> {
  const sources = problemSources(sourceLocation(moduleUrl));
  return { ...entry, description: headerComment(sources.files[0]!.text), definition: sourceDefinition(entry.id, sources, args) };
}
