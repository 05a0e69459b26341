// Loads a user's problem or method module (.ts, .js, .mjs). esbuild bundles the module with its
// relative imports (TypeScript is transpiled on the way), leaving only `stepgauge` outside, which
// is pointed at this very package so the module and the host share one copy. The bundle is
// written to a fresh temporary folder, imported, and the folder removed.
import { existsSync, readFileSync } from 'node:fs';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { build, type Plugin } from 'esbuild';
import type { Method, Problem } from '../core/types.js';
import { InputError, messageOf } from '../core/errors.js';
import { sourcesSha256 } from '../core/hash.js';
import { hasBrand, METHOD_BRAND, PROBLEM_BRAND } from './brand.js';

const MODULE_EXTENSIONS = ['.ts', '.mts', '.js', '.mjs'];

export interface LoadedModule {
  readonly path: string;
  readonly problem?: Problem;
  readonly method?: Method;
  /** SHA-256 over the module's source files (entry and relative imports), for the audit trail. */
  readonly sourceHash: string;
}

/**
 * The file `import ... from 'stepgauge'` resolves to. The public index when it offers the
 * authoring functions; otherwise the small module-api entry, so modules work in a tree whose
 * index is still being written. Runs as .js from dist/ and as .ts under vitest.
 */
function stepgaugeEntry(): string {
  const ext = import.meta.url.endsWith('.ts') ? '.ts' : '.js';
  const index = fileURLToPath(new URL(`../index${ext}`, import.meta.url));
  if (existsSync(index)) {
    const text = readFileSync(index, 'utf8');
    if (text.includes('defineProblem') && text.includes('defineMethod')) return index;
  }
  return fileURLToPath(new URL(`./module-api${ext}`, import.meta.url));
}

function stepgaugeAlias(entry: string): Plugin {
  return {
    name: 'stepgauge-self',
    setup(b) {
      b.onResolve({ filter: /^stepgauge$/ }, () => ({ path: pathToFileURL(entry).href, external: true }));
    },
  };
}

async function bundle(file: string): Promise<{ code: string; sourceHash: string }> {
  const dir = dirname(file);
  let result;
  try {
    result = await build({
      entryPoints: [file],
      absWorkingDir: dir,
      bundle: true,
      format: 'esm',
      platform: 'node',
      target: 'node20',
      write: false,
      metafile: true,
      logLevel: 'silent',
      plugins: [stepgaugeAlias(stepgaugeEntry())],
    });
  } catch (e) {
    const first = (e as { errors?: { text: string; location?: { file: string; line: number; column: number } | null }[] }).errors?.[0];
    if (first) {
      const loc = first.location ? `${resolve(dir, first.location.file)}:${first.location.line}:${first.location.column + 1}` : file;
      throw new InputError(`cannot build module: ${first.text}`, loc);
    }
    throw new InputError(`cannot build module: ${messageOf(e)}`, file);
  }
  const inputs = Object.keys(result.metafile!.inputs).sort();
  const files = await Promise.all(inputs.map(async (p) => ({ path: p, text: await readFile(resolve(dir, p), 'utf8') })));
  return { code: result.outputFiles![0]!.text, sourceHash: sourcesSha256(files) };
}

export async function loadModule(path: string): Promise<LoadedModule> {
  const file = resolve(path);
  if (!MODULE_EXTENSIONS.includes(extname(file).toLowerCase())) {
    throw new InputError(`a module must end in ${MODULE_EXTENSIONS.join(', ')}`, path);
  }
  if (!existsSync(file)) throw new InputError('module file not found', path);
  const { code, sourceHash } = await bundle(file);
  const tmp = await mkdtemp(join(tmpdir(), 'stepgauge-module-'));
  let exports: Record<string, unknown>;
  try {
    const out = join(tmp, `${basename(file, extname(file))}.mjs`);
    await writeFile(out, code);
    exports = (await import(pathToFileURL(out).href)) as Record<string, unknown>;
  } catch (e) {
    throw new InputError(`module failed while loading: ${messageOf(e)}`, path);
  } finally {
    await rm(tmp, { recursive: true, force: true });
  }
  const problem = pick(exports, 'problem', PROBLEM_BRAND, path, 'defineProblem');
  const method = pick(exports, 'method', METHOD_BRAND, path, 'defineMethod');
  if (!problem && !method) {
    throw new InputError(
      'exports neither a problem nor a method: expected `export default defineProblem({...})` (or `export const problem = defineProblem({...})`), ' +
        "or `export default defineMethod({...})` (or `export const method = ...`), with both functions imported from 'stepgauge'",
      path,
    );
  }
  return {
    path: file,
    sourceHash,
    ...(problem ? { problem: withSourceHash(problem as Problem, sourceHash) } : {}),
    ...(method ? { method: method as Method } : {}),
  };
}

/** The default export if it carries the brand, else the named export, which then must carry it. */
function pick(exports: Record<string, unknown>, name: string, mark: symbol, path: string, maker: string): unknown {
  if (hasBrand(exports['default'], mark)) return exports['default'];
  const named = exports[name];
  if (named === undefined) return undefined;
  if (!hasBrand(named, mark)) throw new InputError(`the export \`${name}\` was not made with ${maker}(...)`, path);
  return named;
}

function withSourceHash(problem: Problem, hash: string): Problem {
  return Object.freeze({ ...problem, definition: `${problem.definition}\nmodule-sources-sha256: ${hash}` });
}

export async function loadProblemModule(path: string): Promise<Problem> {
  const m = await loadModule(path);
  if (!m.problem) throw new InputError('exports a method, not a problem (expected defineProblem(...) as default or `problem` export)', path);
  return m.problem;
}

export async function loadMethodModule(path: string): Promise<Method> {
  const m = await loadModule(path);
  if (!m.method) throw new InputError('exports a problem, not a method (expected defineMethod(...) as default or `method` export)', path);
  return m.method;
}
