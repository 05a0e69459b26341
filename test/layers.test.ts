// The layer check that `npm test` runs on the real tree (npm run depcruise, .dependency-cruiser.cjs)
// must fail on what it exists to stop. Here it runs on a small tree of its own, laid out like
// src/, with one wrong import of each kind; the real tree passing is `npm test`'s own step.
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const repo = resolve(import.meta.dirname, '..');
const tree = mkdtempSync(join(tmpdir(), 'stepgauge-layers-'));
afterAll(() => rmSync(tree, { recursive: true, force: true }));

function file(path: string, text: string): void {
  mkdirSync(dirname(join(tree, path)), { recursive: true });
  writeFileSync(join(tree, path), text);
}

/** The checker's verdict on the tree as it stands: exit code and its report. */
function cruise(): { code: number; output: string } {
  copyFileSync(join(repo, 'tsconfig.json'), join(tree, 'tsconfig.json'));
  const bin = join(repo, 'node_modules', 'dependency-cruiser', 'bin', 'dependency-cruise.mjs');
  try {
    const output = execFileSync(process.execPath, [bin, 'src', 'problems', '--config', join(repo, '.dependency-cruiser.cjs')], {
      cwd: tree,
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    return { code: 0, output };
  } catch (e) {
    const err = e as { status: number; stdout: string; stderr: string };
    return { code: err.status, output: err.stdout + err.stderr };
  }
}

describe('the layer check', () => {
  it('passes imports that point down (cli -> sweep -> measure -> methods -> core, results from measure)', () => {
    file('src/core/types.ts', 'export type Id = string;\n');
    file('src/results/contract.ts', "import type { Id } from '../core/types.js';\nexport interface Row { id: Id }\n");
    file('src/methods/m.ts', "import type { Id } from '../core/types.js';\nexport const m: Id = 'm';\n");
    file('src/measure/run.ts', "import { m } from '../methods/m.js';\nimport type { Row } from '../results/contract.js';\nexport const r: Row = { id: m };\n");
    file('src/sweep/sweep.ts', "import { r } from '../measure/run.js';\nexport const s = [r];\n");
    file('src/cli/main.ts', "import { s } from '../sweep/sweep.js';\nexport const n = s.length;\n");
    file('problems/p.ts', "import type { Id } from '../src/core/types.js';\nexport const p: Id = 'p';\n");
    const { code, output } = cruise();
    expect(output).toContain('no dependency violations');
    expect(code).toBe(0);
  });

  it('fails an upward type import (core -> results), a sideways one (report -> gate), methods -> problems and a cycle', () => {
    file('src/core/defaults.ts', "import type { Row } from '../results/contract.js';\nexport type D = Row;\n");
    file('src/gate/junit.ts', "export const junit = 1;\n");
    file('src/report/read.ts', "import { junit } from '../gate/junit.js';\nexport const x = junit;\n");
    file('src/problems/brand.ts', "export const brand = 1;\n");
    file('src/methods/define.ts', "import { brand } from '../problems/brand.js';\nexport const d = brand;\n");
    file('src/sweep/pool.ts', "import { run } from './run.js';\nexport const pool = () => run;\n");
    file('src/sweep/run.ts', "import { pool } from './pool.js';\nexport const run = () => pool;\n");
    const { code, output } = cruise();
    expect(code).not.toBe(0);
    expect(output).toMatch(/layer-src-core: src\/core\/defaults\.ts → src\/results\/contract\.ts/);
    expect(output).toMatch(/layer-src-report: src\/report\/read\.ts → src\/gate\/junit\.ts/);
    expect(output).toMatch(/layer-src-methods: src\/methods\/define\.ts → src\/problems\/brand\.ts/);
    expect(output).toMatch(/no-circular: src\/sweep\/(pool|run)\.ts →/);
  });
});
