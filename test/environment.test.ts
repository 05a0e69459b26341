// The environment fingerprint's commit fields against git itself: `git rev-parse HEAD` names the
// commit, and a tracked file's edit (not a new untracked file) makes the tree dirty.
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { environmentFingerprint } from '../src/measure/environment.js';

const git = (cwd: string, ...args: string[]): string =>
  execFileSync('git', ['-c', 'user.name=t', '-c', 'user.email=t@example.invalid', '-c', 'commit.gpgsign=false', ...args], { cwd, stdio: ['ignore', 'pipe', 'ignore'] }).toString().trim();

describe('environment fingerprint', () => {
  it('names the checked-out commit and whether tracked files changed', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-env-'));
    git(dir, 'init', '-q');
    // No commit yet: nothing to name.
    expect((await environmentFingerprint(dir)).commit).toBeUndefined();
    writeFileSync(join(dir, 'model.yaml'), 'a: 1\n');
    git(dir, 'add', 'model.yaml');
    git(dir, 'commit', '-q', '-m', 'first');
    const clean = await environmentFingerprint(dir);
    expect(clean.commit).toBe(git(dir, 'rev-parse', 'HEAD'));
    expect(clean.commitDirty).toBe(false);
    writeFileSync(join(dir, 'notes.txt'), 'untracked\n');
    expect((await environmentFingerprint(dir)).commitDirty).toBe(false);
    writeFileSync(join(dir, 'model.yaml'), 'a: 2\n');
    expect((await environmentFingerprint(dir)).commitDirty).toBe(true);
  });

  it('leaves the commit out outside a repository', async () => {
    // The temp folder may itself sit inside a repository (a checkout used as TMPDIR); git's
    // ceiling keeps its search from climbing out of the test's own folder.
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-env-none-'));
    const before = process.env.GIT_CEILING_DIRECTORIES;
    process.env.GIT_CEILING_DIRECTORIES = dirname(dir);
    try {
      const env = await environmentFingerprint(dir);
      expect(env.commit).toBeUndefined();
      expect(env.commitDirty).toBeUndefined();
      expect(env.node).toBe(process.version);
    } finally {
      if (before === undefined) delete process.env.GIT_CEILING_DIRECTORIES;
      else process.env.GIT_CEILING_DIRECTORIES = before;
    }
  });
});
