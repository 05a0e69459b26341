// A catalogue problem's sha256 comes from its source (issue 23, issue 24 item 8): the files a
// problem's definition names are checked against esbuild's own import graph, an edited
// right-hand side in a shared physics file changes the hash of exactly the problems that import
// it (and the gate says so), and the build and the packed package compute the same hashes from
// any folder.
import { execFileSync } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, rmSync, symlinkSync, unlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { build } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';
import { catalogue } from '../problems/index.js';
import { problemSources, sourceDefinition, valueImports } from '../problems/from-source.js';
import { sha256 } from '../src/core/hash.js';
import { compareResults } from '../src/gate/compare.js';
import { BASELINE_FORMAT, BASELINE_VERSION, type Baseline } from '../src/gate/baseline.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const posixPath = (p: string) => p.split(sep).join('/');

/** The problem file and builder arguments a catalogue definition names. */
function origin(definition: string): { file: string; args?: Record<string, unknown> } {
  const file = /^ {2}[0-9a-f]{64} {2}(\S+)$/m.exec(definition)![1]!;
  const args = /^built with: (.*)$/m.exec(definition)?.[1];
  return args ? { file, args: JSON.parse(args) as Record<string, unknown> } : { file };
}

/**
 * esbuild's view of a problem file's imports (outside check): the catalogue files it bundles,
 * stopping at stepgauge's own modules (src/) and at problems/from-source.ts, which are external.
 */
async function esbuildGraph(file: string): Promise<{ catalogue: string[]; stepgauge: string[] }> {
  const external = new Set<string>();
  const result = await build({
    entryPoints: [join(ROOT, file)],
    bundle: true,
    write: false,
    metafile: true,
    format: 'esm',
    platform: 'node',
    logLevel: 'silent',
    plugins: [
      {
        name: 'stop-outside-the-catalogue',
        setup(b) {
          b.onResolve({ filter: /^\.{1,2}\// }, (args) => {
            const target = posixPath(relative(ROOT, resolve(args.resolveDir, args.path))).replace(/\.js$/, '.ts');
            if (target.startsWith('problems/') && target !== 'problems/from-source.ts') return { path: join(ROOT, target) };
            if (target !== 'problems/from-source.ts') external.add(target);
            return { path: target, external: true };
          });
        },
      },
    ],
  });
  const inputs = Object.keys(result.metafile.inputs).map((p) => posixPath(relative(ROOT, resolve(p))));
  return { catalogue: inputs.sort(), stepgauge: [...external].sort() };
}

describe('what a catalogue problem hashes', () => {
  it.each(catalogue.map((p) => [p.id, p] as const))('%s: its own file and the catalogue files it imports, as esbuild bundles them', async (_id, p) => {
    const { file } = origin(p.definition);
    const sources = problemSources({ root: ROOT, file });
    const graph = await esbuildGraph(file);
    expect(sources.files[0]!.path).toBe(file);
    expect(sources.files.map((f) => f.path).sort()).toEqual(graph.catalogue);
    expect([...sources.stepgaugeModules]).toEqual(graph.stepgauge);
    // Each file's line carries the SHA-256 of its text (node:crypto through sha256).
    for (const f of sources.files) expect(p.definition).toContain(`${sha256(readFileSync(join(ROOT, f.path), 'utf8'))}  ${f.path}`);
    // The description is the file's header comment, and it states the equations ("'" marks a derivative).
    expect(p.description).toBe(readFileSync(join(ROOT, file), 'utf8').split('\n').filter((l, i, all) => all.slice(0, i + 1).every((x) => x.startsWith('//'))).map((l) => l.replace(/^\/\/ ?/, '')).join('\n'));
    expect(p.description).toMatch(/'/);
    expect(p.definition.endsWith(p.description!)).toBe(true);
  });

  it('type-only imports carry no values and are left out; multi-line and re-exports are read', () => {
    const text = [
      "import type { Problem } from '../src/core/types.js';",
      "import {",
      "  a,",
      "  b,",
      "} from './physics/a.js';",
      "export { c } from './physics/c.js';",
      "export type { D } from './physics/d.js';",
      "import './side-effect.js';",
      "import { x } from 'node:fs';",
      "const s = 'import { y } from \"./not-an-import.js\"';",
    ].join('\n');
    expect(valueImports(text)).toEqual(['./physics/a.js', './physics/c.js', './side-effect.js']);
  });
});

describe('editing a right-hand side', () => {
  const copy = mkdtempSync(join(tmpdir(), 'stepgauge-catalogue-source-'));
  afterAll(() => rmSync(copy, { recursive: true, force: true }));
  cpSync(join(ROOT, 'problems'), join(copy, 'problems'), { recursive: true });
  const twoBody = join(copy, 'problems/physics/two-body.ts');
  const original = readFileSync(twoBody, 'utf8');
  const rhs = 'const k = -mu / (r2 * Math.sqrt(r2));';
  writeFileSync(twoBody, original.replace(rhs, 'const k = (-1.001 * mu) / (r2 * Math.sqrt(r2));'));

  const definitionAt = (root: string, p: (typeof catalogue)[number]) => {
    const { file, args } = origin(p.definition);
    return sourceDefinition(p.id, problemSources({ root, file }, (r, f) => readFileSync(join(r, f), 'utf8')), args);
  };

  it('changes the sha256 of every problem importing problems/physics/two-body.ts and of no other', async () => {
    expect(original).toContain(rhs);
    // The importers, by esbuild's graph (the two Kepler problems and the eclipse orbit, by reading their imports).
    const importers: string[] = [];
    for (const p of catalogue) if ((await esbuildGraph(origin(p.definition).file)).catalogue.includes('problems/physics/two-body.ts')) importers.push(p.id);
    expect(importers.sort()).toEqual(['eclipse-circular-orbit', 'kepler-circular', 'kepler-eccentric']);
    const changed = catalogue.filter((p) => sha256(definitionAt(copy, p)) !== sha256(p.definition)).map((p) => p.id);
    expect(changed.sort()).toEqual(importers);
    // The same text as the catalogue's own for the untouched ones: the root folder is not part of it.
    for (const p of catalogue) if (!importers.includes(p.id)) expect(definitionAt(copy, p)).toBe(p.definition);
  });

  it("makes the gate warn 'definition changed' for exactly those problems", () => {
    const baseline = (sha: (p: (typeof catalogue)[number]) => string): Baseline => ({
      format: BASELINE_FORMAT,
      version: BASELINE_VERSION,
      source: { createdAt: '2026-01-01T00:00:00.000Z', stepgauge: '0.1.0' },
      problems: catalogue.map((p) => ({ id: p.id, sha256: sha(p) })),
      runs: [],
    });
    const before = baseline((p) => sha256(p.definition));
    const after = baseline((p) => sha256(definitionAt(copy, p)));
    const warned = compareResults(before, after).warnings.filter((w) => /definition changed since the baseline/.test(w));
    expect(warned.map((w) => /^problem (\S+):/.exec(w)![1]).sort()).toEqual(['eclipse-circular-orbit', 'kepler-circular', 'kepler-eccentric']);
  });
});

describe('the built package', () => {
  /** Each catalogue problem's definition, as the package at `packageRoot` computes it, run from another folder. */
  const definitionsOf = (packageRoot: string): unknown => {
    const index = pathToFileURL(join(packageRoot, 'dist/problems/index.js')).href;
    const script = `import(${JSON.stringify(index)}).then((m) => process.stdout.write(JSON.stringify(m.catalogue.map((p) => [p.id, p.definition]))))`;
    return JSON.parse(execFileSync(process.execPath, ['--input-type=module', '-e', script], { cwd: tmpdir(), encoding: 'utf8' }));
  };
  const expected = catalogue.map((p) => [p.id, p.definition]);

  it('computes the same definitions from dist/, run from another folder', () => {
    expect(definitionsOf(ROOT)).toEqual(expected);
  });

  it('computes them from the packed package too, unpacked where an install would put it', () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-packed-'));
    try {
      const packed = JSON.parse(execFileSync('npm', ['pack', '--json', '--ignore-scripts', '--pack-destination', dir], { cwd: ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] })) as { filename: string; files: { path: string }[] }[];
      const named = new Set(catalogue.flatMap((p) => [...p.definition.matchAll(/^ {2}[0-9a-f]{64} {2}(\S+)$/gm)].map((m) => m[1]!)));
      expect(named.size).toBeGreaterThan(catalogue.length);
      const files = new Set(packed[0]!.files.map((f) => f.path));
      for (const path of named) expect(files.has(path), path).toBe(true);
      execFileSync('tar', ['-xzf', join(dir, packed[0]!.filename), '-C', dir]);
      // An install has its dependencies beside it; this checkout's serve.
      const link = join(dir, 'package', 'node_modules');
      symlinkSync(join(ROOT, 'node_modules'), link, 'dir');
      try {
        expect(definitionsOf(join(dir, 'package'))).toEqual(expected);
      } finally {
        unlinkSync(link); // the link only, before the folder goes
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);
});
